/**
 * Swing: where a straight written position is actually played.
 *
 * Swing works on pairs of `swing.unit` notes counted from each barline (eighth swing: pairs of eighths).
 * Inside a pair the map is piecewise linear: the pair's start stays, its middle (the off-beat note) moves
 * to `ratio` of the pair, its end stays. Ratio 0.5 is straight; 2/3 is triplet swing (the off-beat eighth
 * lands on the third triplet eighth, common practice). Positions in an incomplete pair at the end of a bar
 * (eighth swing in 7/8) are played straight. Because the ratio is a float, swung positions are floats.
 */
import { barLength, type Meter, type Swing } from "./document";
import { Fraction, q, type RationalInput } from "./rational";

/**
 * True when swing leaves every position where it is.
 * @example isStraight({ unit: "1/8", ratio: 0.5 }) // true
 */
export function isStraight(swing: Swing): boolean {
  return swing.ratio === 0.5;
}

/**
 * Length of one swing pair in whole notes (twice the swing unit).
 * @example swingPair({ unit: "1/8", ratio: 2 / 3 }).toFraction() // "1/4"
 */
export function swingPair(swing: Swing): Fraction {
  return q(swing.unit).mul(2);
}

/**
 * Swung position of a point inside a bar, in whole notes from the barline (float).
 * @example swingInBar("1/8", { unit: "1/8", ratio: 2 / 3 }, "1") // 0.1666… (2/3 of a quarter)
 */
export function swingInBar(posInBar: RationalInput, swing: Swing, bar: RationalInput): number {
  const p = q(posInBar);
  if (isStraight(swing)) return p.valueOf();
  const pair = swingPair(swing);
  const index = p.div(pair).floor();
  const start = pair.mul(index);
  if (start.add(pair).compare(q(bar)) > 0) return p.valueOf(); // incomplete pair at the end of the bar
  const t = p.sub(start).div(pair).valueOf(); // 0..1 inside the pair
  const r = swing.ratio;
  const warped = t <= 0.5 ? t * 2 * r : r + (t - 0.5) * 2 * (1 - r);
  return start.valueOf() + warped * pair.valueOf();
}

/**
 * Swung position of a written position (whole notes from the start of the groove, float).
 * @example swingPosition("9/8", { unit: "1/8", ratio: 2 / 3 }, { beatsPerBar: 4, beatUnit: 4 }) // 1 + 1/6
 */
export function swingPosition(at: RationalInput, swing: Swing, meter: Meter): number {
  const bar = barLength(meter);
  const a = q(at);
  const barIndex = a.div(bar).floor();
  const start = bar.mul(barIndex);
  return start.valueOf() + swingInBar(a.sub(start), swing, bar);
}

/**
 * True when every swing pair sits wholly inside a bar, so pairs fall at the same places in every bar.
 * @example swingTilesBar({ unit: "1/8", ratio: 2 / 3 }, { beatsPerBar: 7, beatUnit: 8 }) // false
 */
export function swingTilesBar(swing: Swing, meter: Meter): boolean {
  return barLength(meter).div(swingPair(swing)).d === 1n;
}

/**
 * Whether moving the written material by `by` whole notes keeps how it is swung: always when straight,
 * otherwise when `by` is a whole number of bars, or when pairs tile the bar and `by` is a whole number of pairs.
 * @example shiftKeepsSwing({ unit: "1/8", ratio: 2 / 3 }, { beatsPerBar: 4, beatUnit: 4 }, "1/4") // true
 */
export function shiftKeepsSwing(swing: Swing, meter: Meter, by: RationalInput): boolean {
  if (isStraight(swing)) return true;
  const b = q(by);
  if (b.div(barLength(meter)).d === 1n) return true;
  return swingTilesBar(swing, meter) && b.div(swingPair(swing)).d === 1n;
}
