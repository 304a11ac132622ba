/**
 * Integer "ticks" for hot loops: every position and duration of a valid groove is a whole number of grid
 * steps, so transforms, the schedule compiler, the notation speller and the readability figures work on
 * integers and only format rationals at the edge. This is the one place that turns rational strings into
 * ticks and back; values that would overflow a safe JavaScript integer fall back to exact fraction.js.
 *
 * Internal to the rhythm core (not re-exported from the index).
 */
import { RhythmError } from "./document";
import { Fraction, q, type Rational, type RationalInput } from "./rational";

/**
 * Greatest common divisor of two integers (0 when both are 0).
 * @example gcd(12, -18) // 6
 */
export function gcd(a: number, b: number): number {
  a = Math.abs(a);
  b = Math.abs(b);
  while (b) [a, b] = [b, a % b];
  return a;
}

/**
 * Least common multiple of two positive integers.
 * @example lcm(4, 6) // 12
 */
export function lcm(a: number, b: number): number {
  return (a / gcd(a, b)) * b;
}

/**
 * Non-negative remainder (a loop position wrapped into [0, m)).
 * @example mod(-1, 16) // 15
 */
export function mod(a: number, m: number): number {
  const r = a % m;
  return r < 0 ? r + m : r + 0;
}

// Result of the last `parseRational` (module scratch: no array per call on ~100,000 positions).
let parsedN = 0;
let parsedD = 1;

/**
 * Read "n", "-n" or "n/d" into parsedN/parsedD by hand (no substrings: long songs have ~100,000 positions).
 * False when the text is not such a rational or a part is not a safe integer.
 */
function parseRational(s: string): boolean {
  let i = 0;
  let sign = 1;
  if (s.charCodeAt(0) === 45) {
    sign = -1;
    i = 1;
  }
  let n = 0;
  let d = 0;
  let inDen = false;
  let digits = 0;
  for (; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c === 47 && !inDen && digits > 0) {
      inDen = true;
      digits = 0;
    } else if (c >= 48 && c <= 57) {
      if (inDen) d = d * 10 + (c - 48);
      else n = n * 10 + (c - 48);
      digits++;
    } else return false;
  }
  if (digits === 0) return false;
  if (!inDen) d = 1;
  if (d === 0 || !Number.isSafeInteger(n) || !Number.isSafeInteger(d)) return false;
  parsedN = sign * n;
  parsedD = d;
  return true;
}

/** Formatted tick values kept per codec; enough for a long song, bounded for a long-lived one. */
const CACHE_LIMIT = 100_000;

/**
 * Converts rationals to whole numbers of a step and back. Formatting is cached, so equal positions share
 * one string in the documents it builds.
 * @example new TickCodec("1/16").toTicks("3/8") // 6
 * @example new TickCodec("1/16").fromTicks(6) // "3/8"
 */
export class TickCodec {
  readonly step: Fraction;
  /** Names the step in messages: "the 1/16 grid" by default. */
  private readonly stepName: string;
  private readonly sn: number;
  private readonly sd: number;
  private readonly fromCache = new Map<number, Rational>();

  constructor(step: RationalInput, stepName?: string) {
    this.step = q(step);
    if (this.step.s < 0n || this.step.n === 0n) throw new RhythmError(`the grid step must be positive, got ${this.step.toFraction()}`);
    this.stepName = stepName ?? `the ${this.step.toFraction()} grid`;
    this.sn = Number(this.step.n);
    this.sd = Number(this.step.d);
  }

  /** Whole steps in `s`; throws a RhythmError naming `what` when `s` is not a rational or not on the step. */
  toTicks(s: Rational, what = "position"): number {
    if (parseRational(s) && Number.isSafeInteger(this.sn) && Number.isSafeInteger(this.sd)) {
      const num = parsedN * this.sd;
      const den = parsedD * this.sn;
      if (Number.isSafeInteger(num) && Number.isSafeInteger(den)) {
        if (num % den !== 0) throw new RhythmError(`${what} ${s} is not on ${this.stepName}`);
        return num / den + 0; // no negative zero
      }
    }
    let f: Fraction;
    try {
      f = q(s).div(this.step);
    } catch {
      throw new RhythmError(`${what} "${s}" is not a rational number such as 3/16`);
    }
    if (f.d !== 1n) throw new RhythmError(`${what} ${s} is not on ${this.stepName}`);
    const t = Number(f.s * f.n);
    if (!Number.isSafeInteger(t)) throw new RhythmError(`${what} ${s} is too large`);
    return t + 0;
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
    if (this.fromCache.size < CACHE_LIMIT) this.fromCache.set(ticks, out);
    return out;
  }
}

/**
 * Whole steps in an exact value that must be a multiple of the step (bar lengths, shifts).
 * @example ticksOf("3/4", "1/16", "bar length") // 12
 */
export function ticksOf(x: RationalInput, step: RationalInput, what: string): number {
  const f = q(x).div(q(step));
  if (f.d !== 1n) throw new RhythmError(`${what} (${q(x).toFraction()}) is not a whole number of ${q(step).toFraction()} grid steps`);
  return Number(f.s * f.n);
}
