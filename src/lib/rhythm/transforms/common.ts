/** Shared pieces of the renotation transforms (internal). */
import { LIMITS, RhythmError, tempoInRange, type Section } from "../document";
import { Fraction, q, type RationalInput } from "../rational";

/** A rational as a mixed number for messages: 3/2 → "1 1/2". */
export function mixed(x: RationalInput): string {
  const f = q(x);
  const whole = f.s < 0n ? f.ceil() : f.floor();
  const rest = f.sub(whole).abs();
  if (rest.n === 0n) return whole.toFraction();
  if (whole.n === 0n) return f.toFraction();
  return `${whole.toFraction()} ${rest.toFraction()}`;
}

/** A whole number from an exact value, or a RhythmError built by `explain`. */
export function whole(x: Fraction, explain: (x: Fraction) => string): number {
  if (x.d !== 1n) throw new RhythmError(explain(x));
  return Number(x.s * x.n);
}

/** Throws when a tempo falls outside the document limits. */
export function checkBpm(bpm: Fraction, why: string): void {
  if (!tempoInRange(bpm.valueOf()))
    throw new RhythmError(`${why} gives ${mixed(bpm)} bpm, outside ${LIMITS.minBpm}–${LIMITS.maxBpm}`);
}

/** Throws when a bar count exceeds the document limit. */
export function checkBars(bars: number, why: string): void {
  if (bars > LIMITS.maxBars) throw new RhythmError(`${why} gives ${bars} bars, more than ${LIMITS.maxBars}`);
}

/** Sections scaled by a factor of bars; each start and length must stay whole. */
export function scaleSections(sections: Section[], k: Fraction, why: string): Section[] {
  return sections.map((s) => ({
    ...s,
    startBar: whole(k.mul(s.startBar), (x) => `${why} moves section "${s.name}" to start at bar ${mixed(x.add(1))}; sections must start on a barline`),
    bars: whole(k.mul(s.bars), (x) => `${why} makes section "${s.name}" (${s.bars} bar${s.bars === 1 ? "" : "s"}) last ${mixed(x)} bars; sections need whole bars`),
  }));
}

/** Plain words for a rescale factor. */
export function factorWords(k: Fraction): string {
  if (k.equals(2)) return "doubling";
  if (k.equals(new Fraction(1, 2))) return "halving";
  return `rescaling by ${k.toFraction()}`;
}
