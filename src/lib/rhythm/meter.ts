/**
 * Meter helpers: which note value is counted as the beat, how beats are grouped, and time signatures.
 *
 * Conventions (common practice): 6/8, 9/8, 12/8 (and 6/16…) are compound meters counted in dotted beats;
 * eighth- or sixteenth-based meters with a given grouping (5/8 as 3+2, 7/8 as 2+2+3) are counted by group;
 * every other meter is counted in its beat unit (4/4 in quarters, 2/2 in halves, 3/8 in eighths).
 */
import type { Meter } from "./document";
import { Fraction, type Rational } from "./rational";

/**
 * True for compound meters (upper number a multiple of 3 above 3, lower number 8 or more).
 * @example isCompound({ beatsPerBar: 6, beatUnit: 8 }) // true
 */
export function isCompound(meter: Meter): boolean {
  return meter.beatsPerBar > 3 && meter.beatsPerBar % 3 === 0 && meter.beatUnit >= 8;
}

/**
 * The counted beats of one bar, as lengths in whole notes (they add up to the bar).
 * @example beatLengths({ beatsPerBar: 7, beatUnit: 8, grouping: [2, 2, 3] }).map(String) // ["1/4", "1/4", "3/8"]
 */
export function beatLengths(meter: Meter): Fraction[] {
  const unit = new Fraction(1, meter.beatUnit);
  let groups: number[];
  if (meter.grouping && meter.beatUnit >= 8) groups = meter.grouping;
  else if (isCompound(meter)) groups = Array.from({ length: meter.beatsPerBar / 3 }, () => 3);
  else groups = Array.from({ length: meter.beatsPerBar }, () => 1);
  return groups.map((g) => unit.mul(g));
}

/**
 * Start of each counted beat inside the bar, in whole notes from the barline.
 * @example beatStarts({ beatsPerBar: 6, beatUnit: 8 }).map(String) // ["0", "3/8"]
 */
export function beatStarts(meter: Meter): Fraction[] {
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
export function naturalBeatNote(meter: Meter): Rational {
  return new Fraction(isCompound(meter) ? 3 : 1, meter.beatUnit).toFraction();
}

/**
 * The time signature as text.
 * @example timeSignature({ beatsPerBar: 7, beatUnit: 8, grouping: [2, 2, 3] }) // "7/8 (2+2+3)"
 */
export function timeSignature(meter: Meter): string {
  const base = `${meter.beatsPerBar}/${meter.beatUnit}`;
  return meter.grouping ? `${base} (${meter.grouping.join("+")})` : base;
}
