/**
 * Written note values: their length in whole notes, and the value (if any) that has a given length.
 * A value is a type (whole … 1024th) with 0–2 dots; each dot adds half of the previous part
 * (common practice: a dotted quarter is 1/4 + 1/8 = 3/8, a double-dotted quarter 7/16).
 */
import { Fraction, q, type RationalInput } from "../rational";
import { NOTE_TYPES, type NoteType, type NoteValue, type TupletRef } from "./model";

/** Whole notes in an undotted value of this type (whole = 1, half = 1/2, …). */
function typeLength(type: NoteType): Fraction {
  return new Fraction(1, 2 ** NOTE_TYPES.indexOf(type));
}

/**
 * Whole notes in a written value, with a tuplet's ratio applied when given.
 * @example fmt(valueLength({ type: "quarter", dots: 1 })) // "3/8"
 * @example fmt(valueLength({ type: "eighth", dots: 0 }, { actual: 3, normal: 2 })) // "1/12"
 */
export function valueLength(value: NoteValue, tuplet?: Pick<TupletRef, "actual" | "normal">): Fraction {
  const base = typeLength(value.type);
  // dots d: base × (2 − 2^−d)
  let len = base.mul(new Fraction(2 ** (value.dots + 1) - 1, 2 ** value.dots));
  if (tuplet) len = len.mul(new Fraction(tuplet.normal, tuplet.actual));
  return len;
}

/**
 * The plain or dotted value of exactly this length, or null (double dots are only returned when `maxDots` is 2).
 * @example noteValueOf("3/16") // { type: "eighth", dots: 1 }
 */
export function noteValueOf(length: RationalInput, maxDots: 0 | 1 | 2 = 1): NoteValue | null {
  const len = q(length);
  for (let dots = 0 as 0 | 1 | 2; dots <= maxDots; dots = (dots + 1) as 0 | 1 | 2) {
    // undotted part = len × 2^d / (2^(d+1) − 1)
    const base = len.mul(new Fraction(2 ** dots, 2 ** (dots + 1) - 1));
    if (base.n !== 1n) continue;
    const d = Number(base.d);
    const index = Math.log2(d);
    if (Number.isInteger(index) && index < NOTE_TYPES.length) return { type: NOTE_TYPES[index]!, dots };
  }
  return null;
}

/** A value, in ticks of a timebase with D ticks per whole note. */
export interface TickValue {
  readonly ticks: number;
  readonly value: NoteValue;
}

/**
 * Plain and dotted values that are whole numbers of ticks, longest first (dotted whole down to the shortest type).
 * @example tickValues(64)[0] // { ticks: 96, value: { type: "whole", dots: 1 } }
 */
export function tickValues(D: number): TickValue[] {
  const out: TickValue[] = [];
  NOTE_TYPES.forEach((type, j) => {
    const plain = D / 2 ** j;
    const dotted = (3 * D) / 2 ** (j + 1);
    if (Number.isInteger(dotted)) out.push({ ticks: dotted, value: { type, dots: 1 } });
    if (Number.isInteger(plain)) out.push({ ticks: plain, value: { type, dots: 0 } });
  });
  return out.sort((a, b) => b.ticks - a.ticks);
}
