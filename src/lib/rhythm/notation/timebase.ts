/**
 * Integer ticks for the spelling code.
 *
 * Spelling a long song touches hundreds of thousands of positions, too many for big-integer fractions.
 * Every position of a valid document is a multiple of its grid step, so one integer tick per
 * 1/D whole note keeps everything exact. D carries spare factors of two so that half-steps, dotted
 * values and tuplet-written positions are whole ticks too. Rationals are rebuilt only for the output
 * (the conversion itself is ../ticks.ts's TickCodec, with a step of 1/D).
 */
import { RhythmError } from "../document";
import { Fraction, q, type Rational } from "../rational";
import { lcm, TickCodec } from "../ticks";

export interface Timebase {
  /** Ticks per whole note. */
  readonly D: number;
  /** Exact ticks of a canonical rational string ("3/16", "2"). Throws if it is not a whole number of ticks. */
  ticks(r: Rational): number;
  /** Canonical rational string of a tick count. */
  rational(ticks: number): Rational;
}

/**
 * The odd part of a positive integer.
 * @example oddPart(24) // 3
 */
export function oddPart(n: number): number {
  while (n % 2 === 0 && n > 0) n /= 2;
  return n;
}

/**
 * Largest power of two strictly below n, 1 for n ≤ 2: the `normal` of an n-tuplet.
 * @example powerOfTwoBelow(5) // 4 (a quintuplet is 5:4)
 */
export function powerOfTwoBelow(n: number): number {
  let p = 1;
  while (p * 2 < n) p *= 2;
  return p;
}

/**
 * True for 1, 2, 4, 8, …: group lengths that are plain note values.
 * @example isPowerOfTwo(3) // false
 */
export function isPowerOfTwo(n: number): boolean {
  return Number.isInteger(n) && n > 0 && (n & (n - 1)) === 0;
}

/**
 * A timebase for a grid step and beat unit.
 * @example makeTimebase("1/16", 4).ticks("3/16") // 3 × D / 16
 */
export function makeTimebase(gridStep: Rational, beatUnit: number): Timebase {
  const g = q(gridStep);
  const dg = Number(g.d);
  // Spare factors of two: tuplet positions are written × P/n with n < P ≤ odd part of the grid denominator,
  // and the rules look at half of the smallest step. 2^(bits of dg + 3) covers both with room to spare.
  const spare = 2 ** (Math.ceil(Math.log2(dg + 1)) + 3);
  const D = lcm(dg, beatUnit) * spare;
  if (!Number.isSafeInteger(D * 4096 * 32)) throw new RhythmError(`grid step ${gridStep} is too fine to notate`);
  const codec = new TickCodec(new Fraction(1, D), `the ${gridStep} grid`);
  return {
    D,
    ticks: (r) => codec.toTicks(r, "position or duration"),
    rational: (t) => codec.fromTicks(t),
  };
}
