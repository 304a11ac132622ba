/**
 * Published syncopation measures, computed on onsets in pulses of a cycle (a loop).
 *
 * - Longuet-Higgins & Lee (1984), "The rhythmic interpretation of monophonic music", Music Perception 1(4):
 *   424–441: a note followed by silence whose strongest position weighs at least as much as the note is a
 *   syncopation of strength (silence weight − note weight).
 * - Gómez, Melvin, Rappaport & Toussaint (2005), "Mathematical measures of syncopation", Proc. BRIDGES:
 *   the weighted note-to-beat distance (WNBD), and Toussaint's off-beatness.
 *
 * Only onsets count: a note lasts until the next onset of the same stream (a tied continuation and a rest
 * are the same to these measures). The cycle wraps: the last note of a loop runs into the first one.
 */
import { gcd, mod } from "../ticks";

/** One note–silence pair that the LHL measure counts. */
export interface LhlSyncopation {
  /** Pulse of the syncopated note. */
  readonly note: number;
  /** Pulse of the strongest silent position after it (the first one when several tie). */
  readonly rest: number;
  readonly noteWeight: number;
  readonly restWeight: number;
  /** restWeight − noteWeight, ≥ 0. */
  readonly strength: number;
}

export interface LhlResult {
  /** Sum of the strengths, or null when no note is syncopated at all (LHL distinguish "none" from 0). */
  readonly total: number | null;
  readonly syncopations: readonly LhlSyncopation[];
}

function sortedUnique(onsets: readonly number[], cycle: number): number[] {
  for (const o of onsets)
    if (!Number.isInteger(o) || o < 0 || o >= cycle) throw new RangeError(`onset ${o} is outside the cycle 0..${cycle - 1}`);
  return [...new Set(onsets)].sort((a, b) => a - b);
}

/**
 * Longuet-Higgins & Lee syncopation of onsets in a cycle, with `weight(pulse)` giving each pulse's metrical
 * weight (see metrical-weights). Each note is paired with the strongest silent pulse before the next onset;
 * when that silence weighs at least as much as the note it is a syncopation of strength (rest − note).
 * The pairing follows H. Honing's published implementation of the measure, which reproduces the paper's
 * figure 9 values.
 * @example lhlSyncopation([0, 1], 4, (p) => [0, -2, -1, -2][p]).total // 1
 */
export function lhlSyncopation(onsets: readonly number[], cycle: number, weight: (pulse: number) => number): LhlResult {
  const on = sortedUnique(onsets, cycle);
  const syncopations: LhlSyncopation[] = [];
  on.forEach((note, i) => {
    const next = i + 1 < on.length ? on[i + 1]! : on[0]! + cycle;
    let rest = -1;
    let restWeight = Number.NEGATIVE_INFINITY;
    for (let p = note + 1; p < next; p++) {
      const w = weight(p % cycle);
      if (w > restWeight) {
        restWeight = w;
        rest = p % cycle;
      }
    }
    if (rest < 0) return; // followed directly by another note
    const noteWeight = weight(note);
    if (restWeight >= noteWeight) syncopations.push({ note, rest, noteWeight, restWeight, strength: restWeight - noteWeight });
  });
  return { total: syncopations.length === 0 ? null : syncopations.reduce((s, x) => s + x.strength, 0), syncopations };
}

/**
 * Weighted note-to-beat distance (Gómez et al. 2005). `beats` are the beat pulses of the cycle (any spacing;
 * with equal beats this is the paper's definition). For an onset off the beat, T is its distance to the
 * nearest beat as a fraction of the beat it sits in; it scores 1/T when the note ends at or before the next
 * beat, 2/T when it ends after it and STRICTLY before the beat after that, else 1/T. Onsets on a beat score 0.
 * The sum is divided by the number of onsets (0 for no onsets).
 * @example wnbd([0, 3, 6, 10, 12], 16, [0, 4, 8, 12]) // 2.8 (son clave)
 */
export function wnbd(onsets: readonly number[], cycle: number, beats: readonly number[]): number {
  const on = sortedUnique(onsets, cycle);
  const bt = sortedUnique(beats, cycle);
  if (on.length === 0) return 0;
  if (bt.length === 0) throw new RangeError("WNBD needs at least one beat");
  const beatSet = new Set(bt);
  // Beats extended over three cycles so "next beat" and "the beat after" always exist.
  const ext = [...bt.map((b) => b - cycle), ...bt, ...bt.map((b) => b + cycle), ...bt.map((b) => b + 2 * cycle)];
  let sum = 0;
  on.forEach((x, i) => {
    if (beatSet.has(x)) return;
    const end = i + 1 < on.length ? on[i + 1]! : on[0]! + cycle;
    const k = upperBound(ext, x); // index of the next beat
    const prev = ext[k - 1]!;
    const next = ext[k]!;
    const after = ext[k + 1]!;
    const t = Math.min(x - prev, next - x) / (next - prev);
    if (end <= next) sum += 1 / t;
    else if (end < after) sum += 2 / t;
    else sum += 1 / t;
  });
  return sum / on.length;
}

/** Index of the first element of a sorted array greater than x. */
function upperBound(sorted: readonly number[], x: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (sorted[mid]! <= x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Toussaint's off-beatness: the number of onsets at pulses coprime to the cycle length (for 16 pulses, the
 * odd ones). Positions are taken modulo `cycle`, so a multi-bar stream can be measured bar by bar.
 * @example offBeatness([0, 3, 6, 10, 12], 16) // 1 (son clave)
 */
export function offBeatness(onsets: readonly number[], cycle: number): number {
  return onsets.filter((o) => gcd(mod(o, cycle), cycle) === 1).length;
}

/**
 * Anticipations: onsets off the beat whose note (lasting to the next onset, cyclically) runs over the next
 * beat without a new onset on it — a pushed note that a reader sees tied across the beat.
 * @example anticipations([3], 8, [0, 2, 4, 6]) // 1
 */
export function anticipations(onsets: readonly number[], cycle: number, beats: readonly number[]): number {
  const on = sortedUnique(onsets, cycle);
  const bt = sortedUnique(beats, cycle);
  if (bt.length === 0) return 0;
  const beatSet = new Set(bt);
  const ext = [...bt, ...bt.map((b) => b + cycle)];
  let count = 0;
  on.forEach((x, i) => {
    if (beatSet.has(x)) return;
    const end = i + 1 < on.length ? on[i + 1]! : on[0]! + cycle;
    const next = ext[upperBound(ext, x)]!;
    if (end > next) count++;
  });
  return count;
}
