/**
 * Integer "ticks" for hot loops: every position and duration of a valid groove is a whole number of grid
 * steps, so transforms and the schedule compiler work on integers and only format rationals at the edge.
 * Values that would overflow a safe JavaScript integer fall back to exact fraction.js arithmetic.
 *
 * Internal to the rhythm core (not re-exported from the index).
 */
import { RhythmError } from "./document";
import { Fraction, q, type Rational, type RationalInput } from "./rational";

function gcd(a: number, b: number): number {
  a = Math.abs(a);
  b = Math.abs(b);
  while (b) [a, b] = [b, a % b];
  return a;
}

/** Numerator and denominator of a rational string as numbers, or null when they are not safe integers. */
function parts(s: Rational): [number, number] | null {
  const slash = s.indexOf("/");
  const n = Number(slash < 0 ? s : s.slice(0, slash));
  const d = slash < 0 ? 1 : Number(s.slice(slash + 1));
  return Number.isSafeInteger(n) && Number.isSafeInteger(d) && d > 0 ? [n, d] : null;
}

/**
 * Converts rationals to whole numbers of a step and back. Formatting is cached, so equal positions share
 * one string in the documents it builds.
 * @example new TickCodec("1/16").toTicks("3/8") // 6
 */
export class TickCodec {
  readonly step: Fraction;
  private readonly sn: number;
  private readonly sd: number;
  private readonly fromCache = new Map<number, Rational>();

  constructor(step: RationalInput) {
    this.step = q(step);
    this.sn = Number(this.step.n);
    this.sd = Number(this.step.d);
    if (this.step.s < 0n || this.step.n === 0n) throw new RhythmError(`step must be positive, got ${this.step.toFraction()}`);
  }

  /** Whole steps in `s`; throws a RhythmError naming `what` when `s` is not a multiple of the step. */
  toTicks(s: Rational, what = "position"): number {
    let t: number | null = null;
    const p = parts(s);
    if (p && Number.isSafeInteger(this.sn) && Number.isSafeInteger(this.sd)) {
      const num = p[0] * this.sd;
      const den = p[1] * this.sn;
      if (Number.isSafeInteger(num) && Number.isSafeInteger(den)) {
        if (num % den !== 0) throw new RhythmError(`${what} ${s} is not a whole number of ${this.step.toFraction()} steps`);
        t = num / den;
      }
    }
    if (t === null) {
      const f = q(s).div(this.step);
      if (f.d !== 1n) throw new RhythmError(`${what} ${s} is not a whole number of ${this.step.toFraction()} steps`);
      t = Number(f.s * f.n);
      if (!Number.isSafeInteger(t)) throw new RhythmError(`${what} ${s} is too large`);
    }
    return t + 0; // no negative zero
  }

  /** The rational `ticks × step` in canonical form. */
  fromTicks(ticks: number): Rational {
    const hit = this.fromCache.get(ticks);
    if (hit !== undefined) return hit;
    let out: Rational;
    const num = ticks * this.sn;
    if (Number.isSafeInteger(num) && Number.isSafeInteger(this.sd)) {
      const g = gcd(num, this.sd) || 1;
      const n = num / g + 0;
      const d = this.sd / g;
      out = d === 1 ? `${n}` : `${n}/${d}`;
    } else out = this.step.mul(ticks).toFraction();
    this.fromCache.set(ticks, out);
    return out;
  }
}

/** Whole steps in an exact value that must be a multiple of the step (bar lengths, shifts). */
export function ticksOf(x: RationalInput, step: RationalInput, what: string): number {
  const f = q(x).div(q(step));
  if (f.d !== 1n) throw new RhythmError(`${what} (${q(x).toFraction()}) is not a whole number of ${q(step).toFraction()} grid steps`);
  return Number(f.s * f.n);
}

/** Non-negative remainder. */
export function mod(a: number, m: number): number {
  const r = a % m;
  return r < 0 ? r + m : r + 0;
}
