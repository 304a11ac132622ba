/**
 * Integer ticks for the spelling code.
 *
 * Spelling a long song touches hundreds of thousands of positions, too many for big-integer fractions.
 * Every position of a valid document is a multiple of its grid step, so one integer tick per
 * 1/D whole note keeps everything exact. D carries spare factors of two so that half-steps, dotted
 * values and tuplet-written positions are whole ticks too. Rationals are rebuilt only for the output.
 */
import { RhythmError } from "../document";
import { q, type Rational } from "../rational";

export interface Timebase {
  /** Ticks per whole note. */
  readonly D: number;
  /** Exact ticks of a canonical rational string ("3/16", "2"). Throws if it is not a whole number of ticks. */
  ticks(r: Rational): number;
  /** Canonical rational string of a tick count. */
  rational(ticks: number): Rational;
}

export function gcd(a: number, b: number): number {
  a = Math.abs(a);
  b = Math.abs(b);
  while (b) [a, b] = [b, a % b];
  return a;
}

export function lcm(a: number, b: number): number {
  return (a / gcd(a, b)) * b;
}

/** The odd part of a positive integer (24 → 3). */
export function oddPart(n: number): number {
  while (n % 2 === 0 && n > 0) n /= 2;
  return n;
}

/** Largest power of two strictly below n (3 → 2, 5 → 4), 1 for n ≤ 2. */
export function powerOfTwoBelow(n: number): number {
  let p = 1;
  while (p * 2 < n) p *= 2;
  return p;
}

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
  const cache = new Map<number, Rational>();
  return {
    D,
    ticks(r: Rational): number {
      // Hand-rolled parse of "n", "-n" or "n/d" (no substrings: a long song has ~100,000 positions).
      let i = 0;
      let sign = 1;
      if (r.charCodeAt(0) === 45) {
        sign = -1;
        i = 1;
      }
      let n = 0;
      let d = 0;
      let inDen = false;
      let digits = 0;
      for (; i < r.length; i++) {
        const c = r.charCodeAt(i);
        if (c === 47 && !inDen && digits > 0) {
          inDen = true;
          digits = 0;
        } else if (c >= 48 && c <= 57) {
          if (inDen) d = d * 10 + (c - 48);
          else n = n * 10 + (c - 48);
          digits++;
        } else {
          digits = -1;
          break;
        }
      }
      if (!inDen) d = 1;
      if (digits <= 0 || d <= 0 || D % d !== 0) throw new RhythmError(`position or duration ${r} is not on the ${gridStep} grid`);
      return sign * n * (D / d);
    },
    rational(t: number): Rational {
      let s = cache.get(t);
      if (s === undefined) {
        const c = gcd(t, D);
        s = D / c === 1 ? String(t / c) : `${t / c}/${D / c}`;
        if (cache.size < 100_000) cache.set(t, s);
      }
      return s;
    },
  };
}
