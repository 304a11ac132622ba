/**
 * Metrical weights in the manner of Longuet-Higgins & Lee (1984), "The rhythmic interpretation of
 * monophonic music", Music Perception 1(4): 424–441.
 *
 * A meter is a hierarchy of levels: the bar, then each level dividing the one above (half bars, beats,
 * eighths, …). A position's weight is 0 at the bar line and one lower for each level further down where
 * the position first appears: 4/4 on an eighth grid reads 0 −3 −2 −3 −1 −3 −2 −3.
 *
 * Positions inside the hierarchy are counted in PULSES: the finest unit that both the grid step and the
 * beat are whole multiples of (normally the grid step itself).
 */
import { barLength } from "../document";
import { beatGrouping, type MeterLike } from "../meter";
import { Fraction, q, type RationalInput } from "../rational";

/**
 * Weights of a bar divided by a list of factors, top down: LHL's own notation of a meter.
 * (2 2 2) is 4/4 counted in eighths, (3 2) is 3/4 in eighths, (2 3) is 6/8 in eighths.
 * @example weightsFromDivisions([2, 2, 2]) // [0, -3, -2, -3, -1, -3, -2, -3]
 */
export function weightsFromDivisions(divisions: readonly number[]): number[] {
  for (const d of divisions) if (!Number.isInteger(d) || d < 1) throw new RangeError(`division ${d} must be a whole number ≥ 1`);
  const length = divisions.reduce((a, b) => a * b, 1);
  const weights = new Array<number>(length).fill(Number.NaN);
  weights[0] = 0;
  let interval = length;
  divisions.forEach((d, i) => {
    interval /= d;
    for (let p = 0; p < length; p += interval) if (Number.isNaN(weights[p])) weights[p] = -(i + 1);
  });
  return weights;
}

export interface MetricalHierarchy {
  /** The pulse, in whole notes: the finest unit of the hierarchy. */
  readonly pulse: Fraction;
  readonly pulsesPerBar: number;
  /** Weight of each pulse of one bar: 0 at the bar line, −1, −2, … further down. */
  readonly weights: readonly number[];
  /** Pulse positions of each level, top down; level 0 is [0] (the bar line). */
  readonly levels: readonly (readonly number[])[];
  /** Index of the level that carries the felt beat (the tempo's beat note). */
  readonly beatLevel: number;
  /** Pulse positions of the felt beats in one bar. */
  readonly beats: readonly number[];
  /** Felt beats that are not on a higher level: the backbeat positions (2 and 4 in 4/4). */
  readonly weakBeats: readonly number[];
}

/** Prime factors, odd ones first (a triplet level sits above its binary subdivision: 1/24 = (3 2) per quarter). */
function factorise(n: number): number[] {
  const out: number[] = [];
  let twos = 0;
  while (n % 2 === 0 && n > 1) {
    n /= 2;
    twos++;
  }
  for (let f = 3; f * f <= n; f += 2)
    while (n % f === 0) {
      out.push(f);
      n /= f;
    }
  if (n > 1) out.push(n);
  for (let i = 0; i < twos; i++) out.push(2);
  return out;
}

function sameSet(a: readonly number[], b: readonly number[]): boolean {
  return a.length === b.length && a.every((x, i) => x === b[i]);
}

/**
 * The metrical hierarchy of a meter on a grid.
 *
 * Levels, top down: the bar; pairs of equal beat groups while their number is even (4/4 → half bars,
 * 12/8 → half bars); the beat groups (dotted quarters in 6/8, the given grouping in 7/8); the beats; then the
 * beat divided down to the pulse (odd factors first). This reproduces LHL's meters: 4/4 = (2 2 2 …),
 * 3/4 = (3 2 …), 6/8 = (2 3 …), 12/8 = (2 2 3 …), 3/2 = (3 2 2 …).
 *
 * The felt beat is the level whose positions are the multiples of `beatNote` (the tempo's beat note); when no
 * level matches, the beat groups when they are longer than one beat, else the meter's beats.
 * @example metricalHierarchy({ beatsPerBar: 4, beatUnit: 4 }, "1/8").weights // [0, -3, -2, -3, -1, -3, -2, -3]
 */
export function metricalHierarchy(meter: MeterLike, step: RationalInput, beatNote?: RationalInput): MetricalHierarchy {
  const beat = new Fraction(1, meter.beatUnit);
  const bar = barLength(meter);
  const pulse = beat.gcd(q(step));
  const pulsesPerBar = Number(bar.div(pulse).n);
  const beatPulses = Number(beat.div(pulse).n);

  const groups = beatGrouping(meter);
  const groupStarts: number[] = [];
  let acc = 0;
  for (const g of groups) {
    groupStarts.push(acc * beatPulses);
    acc += g;
  }

  // Levels above the groups: pair equal units while their count is even and above two.
  const above: number[][] = [];
  let units = groupStarts;
  const equal = groups.every((g) => g === groups[0]);
  while (equal && units.length > 2 && units.length % 2 === 0) {
    units = units.filter((_, i) => i % 2 === 0);
    above.unshift(units);
  }

  const candidates: number[][] = [[0], ...above, groupStarts, Array.from({ length: meter.beatsPerBar }, (_, i) => i * beatPulses)];
  let unit = beatPulses;
  for (const f of factorise(beatPulses)) {
    unit /= f;
    const level: number[] = [];
    for (let p = 0; p < pulsesPerBar; p += unit) level.push(p);
    candidates.push(level);
  }
  const levels: number[][] = [];
  for (const c of candidates) if (levels.length === 0 || !sameSet(levels[levels.length - 1]!, c)) levels.push(c);

  const weights = new Array<number>(pulsesPerBar).fill(Number.NaN);
  levels.forEach((level, i) => {
    for (const p of level) if (Number.isNaN(weights[p])) weights[p] = i === 0 ? 0 : -i;
  });

  let beatLevel = -1;
  if (beatNote !== undefined) {
    const bn = q(beatNote);
    if (bar.div(bn).d === 1n && bn.div(pulse).d === 1n) {
      const n = Number(bn.div(pulse).n);
      const wanted = Array.from({ length: pulsesPerBar / n }, (_, i) => i * n);
      beatLevel = levels.findIndex((l) => sameSet(l, wanted));
    }
  }
  if (beatLevel < 0) {
    const groupLevel = levels.findIndex((l) => sameSet(l, groupStarts));
    const beatsLevel = levels.findIndex((l) => l.length === meter.beatsPerBar && l.every((p, i) => p === i * beatPulses));
    beatLevel = groups.some((g) => g > 1) ? groupLevel : beatsLevel;
  }
  const beats = levels[beatLevel]!;
  // In a one-beat bar the downbeat is the only beat: no backbeat to speak of.
  const weakBeats = beatLevel === 0 ? [] : beats.filter((p) => weights[p] === -beatLevel);
  return { pulse, pulsesPerBar, weights, levels, beatLevel, beats, weakBeats };
}
