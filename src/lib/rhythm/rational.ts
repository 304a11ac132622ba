/**
 * Exact rational numbers for musical time.
 *
 * Every position and duration in Tactus is a rational number of whole notes, never a float:
 * a sixteenth-note triplet is exactly 1/24, and doubling then halving gives back the same value.
 * On the wire and in the database a rational is a canonical string ("3/16", "2", "-1/8");
 * inside computations it is a fraction.js `Fraction`.
 */
import Fraction from "fraction.js";

/** A rational in canonical string form: "n/d" in lowest terms, or "n" when the denominator is 1. */
export type Rational = string;

/** Anything the core accepts where it needs an exact number. */
export type RationalInput = Rational | number | Fraction;

export { Fraction };

/** Matches the canonical string form (also accepts non-reduced fractions, which `q` reduces). */
export const RATIONAL_PATTERN = /^-?\d{1,12}(\/[1-9]\d{0,11})?$/;

/**
 * Parse to an exact fraction.
 * @example q("3/16").mul(2).toFraction() // "3/8"
 */
export function q(x: RationalInput): Fraction {
  return new Fraction(x as never);
}

/**
 * Canonical string of an exact value.
 * @example fmt(q("2/32")) // "1/16"
 */
export function fmt(x: RationalInput): Rational {
  return q(x).toFraction();
}

/**
 * Float value, for seconds and display only.
 * @example toNumber("3/8") // 0.375
 */
export function toNumber(x: RationalInput): number {
  return q(x).valueOf();
}

/**
 * Compare two rationals: negative, zero or positive.
 * @example compare("1/4", "3/16") // 1
 */
export function compare(a: RationalInput, b: RationalInput): number {
  return q(a).compare(q(b));
}
