/**
 * Meter helpers: how a bar is grouped, which note value is counted as the beat, and time signatures.
 *
 * `beatGrouping` is the ONE place that decides how a meter without a given grouping is grouped; notation
 * (beams, the metric frame), readability (the metrical hierarchy) and counting (`beatLengths`) all use it.
 * Rules (The Open University, "An introduction to music theory", OpenLearn 2016, section 3.6; E. Gould,
 * "Behind Bars", 2011, from memory): simple meters are grouped by the beat (4/4 → 1+1+1+1); compound meters
 * by dotted beats of three units (6/8 → 3+3, 12/8 → 3+3+3+3); other eighth (or shorter) meters by twos,
 * odd ones with a final three (4/8 → 2+2, 5/8 → 2+3, 7/8 → 2+2+3). A grouping in the document wins.
 *
 * Counting (common practice): compound meters are counted in dotted beats, uneven meters (5/8, 7/8, or any
 * eighth meter with a given grouping) by group, every other meter in its beat unit (4/4 in quarters, 2/2 in
 * halves, 3/8 and 4/8 in eighths).
 */
import { Fraction, type Rational } from "./rational";

/** A meter as far as these helpers need it (the document's `Meter`, or the notation model's `NotationMeter`). */
export interface MeterLike {
  readonly beatsPerBar: number;
  readonly beatUnit: number;
  readonly grouping?: readonly number[] | undefined;
}

/**
 * The beat groups of one bar, in beat units (they add up to beatsPerBar): the document's grouping, else the
 * default for the meter (see the module comment).
 * @example beatGrouping({ beatsPerBar: 7, beatUnit: 8 }) // [2, 2, 3]
 * @example beatGrouping({ beatsPerBar: 4, beatUnit: 4 }) // [1, 1, 1, 1]
 * @example beatGrouping({ beatsPerBar: 7, beatUnit: 8, grouping: [3, 2, 2] }) // [3, 2, 2]
 */
export function beatGrouping(meter: MeterLike): number[] {
  const { beatsPerBar: n, beatUnit: u } = meter;
  if (meter.grouping && meter.grouping.length > 0) return [...meter.grouping];
  if (u < 8) return Array.from({ length: n }, () => 1);
  if (n % 3 === 0) return Array.from({ length: n / 3 }, () => 3);
  if (n % 2 === 0) return Array.from({ length: n / 2 }, () => 2);
  if (n === 1) return [1];
  return [...Array.from({ length: (n - 3) / 2 }, () => 2), 3];
}

/**
 * True for compound meters (upper number a multiple of 3 above 3, lower number 8 or more).
 * @example isCompound({ beatsPerBar: 6, beatUnit: 8 }) // true
 */
export function isCompound(meter: MeterLike): boolean {
  return meter.beatsPerBar > 3 && meter.beatsPerBar % 3 === 0 && meter.beatUnit >= 8;
}

/**
 * The counted beats of one bar, as lengths in whole notes (they add up to the bar): the beat groups of
 * `beatGrouping` where the meter is counted by group (see the module comment), else single beat units.
 * @example beatLengths({ beatsPerBar: 7, beatUnit: 8 }).map((f) => f.toFraction()) // ["1/4", "1/4", "3/8"]
 * @example beatLengths({ beatsPerBar: 3, beatUnit: 8 }).length // 3 (counted in eighths)
 */
export function beatLengths(meter: MeterLike): Fraction[] {
  const unit = new Fraction(1, meter.beatUnit);
  const groups = beatGrouping(meter);
  const byGroup = meter.beatUnit >= 8 && ((meter.grouping !== undefined && meter.grouping.length > 0) || (groups.length > 1 && groups.includes(3)));
  return byGroup ? groups.map((g) => unit.mul(g)) : Array.from({ length: meter.beatsPerBar }, () => unit);
}

/**
 * Start of each counted beat inside the bar, in whole notes from the barline.
 * @example beatStarts({ beatsPerBar: 6, beatUnit: 8 }).map((f) => f.toFraction()) // ["0", "3/8"]
 */
export function beatStarts(meter: MeterLike): Fraction[] {
  const out: Fraction[] = [];
  let at = new Fraction(0);
  for (const len of beatLengths(meter)) {
    out.push(at);
    at = at.add(len);
  }
  return out;
}

/**
 * The note value a tempo marking naturally refers to in this meter: a dotted value in compound meters,
 * the beat unit otherwise.
 * @example naturalBeatNote({ beatsPerBar: 6, beatUnit: 8 }) // "3/8"
 */
export function naturalBeatNote(meter: MeterLike): Rational {
  return new Fraction(isCompound(meter) ? 3 : 1, meter.beatUnit).toFraction();
}

/**
 * The time signature as text.
 * @example timeSignature({ beatsPerBar: 7, beatUnit: 8, grouping: [2, 2, 3] }) // "7/8 (2+2+3)"
 */
export function timeSignature(meter: MeterLike): string {
  const base = `${meter.beatsPerBar}/${meter.beatUnit}`;
  return meter.grouping ? `${base} (${meter.grouping.join("+")})` : base;
}
