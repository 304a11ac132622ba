/**
 * The reading finder: which way of writing this groove reads best?
 *
 * One sounding pattern can be written many ways. From a document, `findReadings` builds candidate readings —
 * tempo factors ½, 1 and 2 (`rescale`), each combined with every displacement on the grid up to half a bar
 * either way (`displace`; a loop rotates, a song form gets a pickup bar; a longer move is one of these plus a
 * whole bar, which only changes the bar the loop starts on), and, where the meter has a common twin of the
 * same bar length (4/4 ↔ 2/2, 3/4 ↔ 6/8), that re-barring too. Candidates whose transform throws are skipped
 * (halving an odd number of bars, a grid that no longer divides the bar, a displacement that breaks swing, …).
 *
 * Each candidate is measured (readability figures) and scored; the best are then PROVEN to sound the same
 * as the input with `compareGrooves` (identical, or identical up to a start offset), in score order, until
 * `limit` readings are collected. A candidate that fails the proof is dropped, never returned.
 *
 * Score (lower reads better), the sum of:
 *   3   × (1 − backbeat share)       snare or cross-stick on every backbeat of a bar (2 and 4 in 4/4), common practice
 *   1.5 × (1 − downbeat-kick share)  a kick on beat 1 of the bars that have a kick, common practice
 *   2 + 2 × |log₂(bpm / nearest bound)| when the written tempo is outside the usual range (60–180 bpm, from memory)
 *   1   × LHL syncopation per onset   (Longuet-Higgins & Lee 1984, summed over hands, feet and keys)
 *   0.5 × WNBD                        (Gómez, Melvin, Rappaport & Toussaint 2005, onset-weighted over the parts)
 *   1   × anticipations per onset     (off-beat notes held over the next beat)
 *   0.5 × (notes + rests + ties) per onset, from the notation spelling (left out when spelling is unavailable)
 * Shares count as perfect when there is nothing to place (no snare, no kick). Sorting is by score, then by
 * simplicity (fewer steps, smaller displacement, later before earlier), then by id: the same input always
 * gives the same list.
 *
 * Cost, in two passes: every candidate is measured without spelling (a loop's rotations even without building
 * the document: the rescaled onsets are rotated in place); then the best `spellTop` (default max(24, 2 × limit))
 * are built, spelled, scored in full and proven, batch after batch only while proofs leave `limit` unfilled.
 * The candidate count is capped (`maxCandidates`, default 256, simplest first) so long songs on fine grids stay
 * bounded: 4/4 on a sixteenth grid gives 112 candidates (½: 32 displacements, 1: 16, 2: 8, each also in 2/2).
 * Measured on a 32-bar 4/4 loop with a sixteenth grid (kit and keys, 2-core machine under load): about
 * 0.7–0.9 s warm, 2–2.6 s on the first call (JIT warm-up); a 2-bar loop about 0.15–0.45 s.
 */
import { barLength, normalizeGroove, type GrooveDocument, type Meter } from "./document";
import { beatGrouping } from "./meter";
import { compareGrooves, type Equivalence } from "./equivalence";
import { Fraction, q, type Rational, type RationalInput } from "./rational";
import {
  figureInput,
  figuresFrom,
  readabilityFigures,
  rotateFigureInput,
  spelledCounts,
  USUAL_TEMPO_RANGE,
  type FigureInput,
  type NotationCounts,
  type ReadabilityFigures,
} from "./readability/figures";
import { displace, rebar, rescale, type DisplaceMode } from "./transforms";
import { valueWords } from "./describe-position";

/** Kept here too for older imports; the words live in describe-position.ts. */
export { valueWords };

/** One renotation step, serialisable (JSON) so a reading can be stored and replayed. */
export type Transform =
  | { op: "rescale"; factor: Rational }
  | { op: "displace"; by: Rational; mode: DisplaceMode }
  | { op: "rebar"; meter: Meter };

export interface ScoreParts {
  backbeat: number;
  kick: number;
  tempo: number;
  lhl: number;
  wnbd: number;
  anticipations: number;
  ink: number;
}

export interface Reading {
  /** Stable id made of the steps ("x2|+1/8", "asis"). */
  id: string;
  /** Plain words: "Double time, displaced by an eighth". */
  label: string;
  steps: Transform[];
  doc: GrooveDocument;
  figures: ReadabilityFigures;
  /** Lower reads better (see the module comment for the weights). */
  score: number;
  scoreParts: ScoreParts;
  /** Short reasons in plain words, compared with the groove as written. */
  reasons: string[];
  /** The proof that this reading sounds like the input. */
  equivalence: Equivalence;
}

export interface FindReadingsOptions {
  /** Tempo factors to try (default ½, 1, 2). */
  factors?: RationalInput[];
  /** How displacement treats the ends: default "rotate" for a loop (at most one section), "pad" for a song form. */
  displaceMode?: DisplaceMode;
  /** Also try the common re-barring of the same bar length (4/4 ↔ 2/2, 3/4 ↔ 6/8). Default true. */
  rebar?: boolean;
  /** At most this many candidates are built, simplest first. Default 256. */
  maxCandidates?: number;
  /** At most this many readings are returned. Default 10. */
  limit?: number;
  /** Count notes, rests and ties with the notation speller. Default true. */
  notation?: boolean;
  /** How many of the best candidates (by the other figures) are spelled, scored in full and proven per batch. Default max(24, 2 × limit). */
  spellTop?: number;
}

const SCORE_WEIGHTS = { backbeat: 3, kick: 1.5, tempo: 2, lhl: 1, wnbd: 0.5, anticipations: 1, ink: 0.5 } as const;

/**
 * Apply renotation steps in order.
 * @example applySteps(doc, [{ op: "rescale", factor: "2" }, { op: "displace", by: "1/8", mode: "rotate" }])
 */
export function applySteps(doc: GrooveDocument, steps: readonly Transform[]): GrooveDocument {
  let d = doc;
  for (const s of steps) {
    if (s.op === "rescale") d = rescale(d, s.factor);
    else if (s.op === "displace") d = displace(d, s.by, s.mode);
    else d = rebar(d, s.meter);
  }
  return d;
}

/**
 * The common re-barring twins of a meter, same bar length (common practice): 4/4 ↔ 2/2, 3/4 ↔ 6/8.
 * @example rebarTwins({ beatsPerBar: 3, beatUnit: 4 }) // [{ beatsPerBar: 6, beatUnit: 8 }]
 */
export function rebarTwins(meter: Meter): Meter[] {
  const sig = `${meter.beatsPerBar}/${meter.beatUnit}`;
  const twins: Record<string, Meter[]> = {
    "4/4": [{ beatsPerBar: 2, beatUnit: 2 }],
    "2/2": [{ beatsPerBar: 4, beatUnit: 4 }],
    "3/4": [{ beatsPerBar: 6, beatUnit: 8 }],
    "6/8": [{ beatsPerBar: 3, beatUnit: 4 }],
  };
  // A grouping of its own (7/8 as 3+2+2, 4/4 as 3+3+2 eighths…) has no common twin; the default one written
  // out (6/8 as 3+3) is the plain meter.
  const own = meter.grouping !== undefined && meter.grouping.join("+") !== beatGrouping({ beatsPerBar: meter.beatsPerBar, beatUnit: meter.beatUnit }).join("+");
  return own ? [] : (twins[sig] ?? []);
}

function factorLabel(k: Fraction): string | null {
  if (k.equals(1)) return null;
  if (k.equals(2)) return "Double time";
  if (k.equals(new Fraction(1, 2))) return "Half time";
  return `Rescaled by ${k.toFraction()}`;
}

function labelOf(k: Fraction, by: Fraction, meter: Meter | null): string {
  const parts: string[] = [];
  const f = factorLabel(k);
  if (f) parts.push(f);
  if (by.n !== 0n) parts.push(`${parts.length ? "displaced" : "Displaced"} ${by.s < 0n ? "back " : ""}by ${valueWords(by)}`);
  if (meter) parts.push(`${parts.length ? "in" : "In"} ${meter.beatsPerBar}/${meter.beatUnit}`);
  return parts.length ? parts.join(", ") : "As written";
}

function idOf(k: Fraction, by: Fraction, meter: Meter | null): string {
  const parts: string[] = [];
  if (!k.equals(1)) parts.push(`x${k.toFraction()}`);
  if (by.n !== 0n) parts.push(`${by.s < 0n ? "-" : "+"}${by.abs().toFraction()}`);
  if (meter) parts.push(`m${meter.beatsPerBar}-${meter.beatUnit}`);
  return parts.length ? parts.join("|") : "asis";
}

function scoreOf(f: ReadabilityFigures): ScoreParts {
  const onsets = Math.max(1, f.overall.onsets);
  const bpm = f.tempo.bpm;
  const { min, max } = USUAL_TEMPO_RANGE;
  const outside = bpm < min ? Math.log2(min / bpm) : bpm > max ? Math.log2(bpm / max) : null;
  return {
    backbeat: SCORE_WEIGHTS.backbeat * (1 - (f.backbeat.share ?? 1)),
    kick: SCORE_WEIGHTS.kick * (1 - (f.downbeatKick.share ?? 1)),
    tempo: outside === null ? 0 : SCORE_WEIGHTS.tempo * (1 + outside),
    lhl: (SCORE_WEIGHTS.lhl * f.overall.lhl) / onsets,
    wnbd: SCORE_WEIGHTS.wnbd * f.overall.wnbd,
    anticipations: (SCORE_WEIGHTS.anticipations * f.overall.anticipations) / onsets,
    ink: f.notation ? (SCORE_WEIGHTS.ink * (f.notation.notes + f.notation.rests + f.notation.ties)) / onsets : 0,
  };
}

const sum = (p: ScoreParts) => p.backbeat + p.kick + p.tempo + p.lhl + p.wnbd + p.anticipations + p.ink;
const fmtBpm = (bpm: number) => (Number.isInteger(bpm) ? String(bpm) : bpm.toFixed(1));

function joinBeats(beats: number[]): string {
  if (beats.length <= 1) return beats.join("");
  return `${beats.slice(0, -1).join(", ")} and ${beats[beats.length - 1]}`;
}

/** Plain-language reasons for a reading, compared with the groove as written. */
function reasonsFor(f: ReadabilityFigures, base: ReadabilityFigures, isBase: boolean): string[] {
  const out: string[] = [];
  const bb = f.backbeat;
  if (bb.share !== null && bb.beats.length > 0) {
    const where = bb.beats.length === 1 ? `beat ${bb.beats[0]}` : joinBeats(bb.beats);
    if (bb.share === 1) out.push(`backbeat lands on ${where}`);
    else if (bb.barsWithBackbeat > 0) out.push(`backbeat on ${where} in ${bb.barsWithBackbeat} of ${bb.barsWithSnare} bars`);
    else out.push(`snare is off the backbeat (${where})`);
  }
  const k = f.downbeatKick;
  if (k.share !== null) {
    if (k.share === 1) out.push(k.barsWithKick === f.bars ? "kick on beat 1 of every bar" : "kick on beat 1 wherever the kick plays");
    else if (k.share === 0) out.push("kick never on beat 1");
    else out.push(`kick on beat 1 in ${k.barsWithKickOnOne} of ${k.barsWithKick} bars`);
  }
  const groups = [
    ["keys", (x: ReadabilityFigures) => x.parts.keys.anticipations],
    ["kit", (x: ReadabilityFigures) => x.parts.hands.anticipations + x.parts.feet.anticipations],
  ] as const;
  for (const [name, count] of groups) {
    const a = count(base);
    const b = count(f);
    if (isBase) {
      if (b > 0) out.push(`${name} anticipate the beat ${b} time${b === 1 ? "" : "s"}`);
    } else if (a !== b) out.push(`${name} anticipations ${b < a ? "drop" : "rise"} from ${a} to ${b}`);
  }
  if (!isBase && base.overall.lhl !== f.overall.lhl)
    out.push(`syncopation (LHL) ${f.overall.lhl < base.overall.lhl ? "drops" : "rises"} from ${base.overall.lhl} to ${f.overall.lhl}`);
  const { min, max } = USUAL_TEMPO_RANGE;
  out.push(
    f.tempo.inUsualRange
      ? `tempo ${fmtBpm(f.tempo.bpm)} is within the usual range (${min}–${max})`
      : `tempo ${fmtBpm(f.tempo.bpm)} is ${f.tempo.bpm < min ? "below" : "above"} the usual range (${min}–${max})`,
  );
  const ink = (n: NotationCounts | null) => (n ? n.notes + n.rests + n.ties : null);
  const a = ink(base.notation);
  const b = ink(f.notation);
  if (!isBase && a !== null && b !== null && a !== b) out.push(`${b < a ? "fewer" : "more"} notes, rests and ties (${a} → ${b})`);
  return out;
}

interface Candidate {
  id: string;
  label: string;
  steps: Transform[];
  /** Sort key for simplicity: steps, |displacement| as a share of the bar, backwards after forwards. */
  simplicity: [number, number, number];
  build: () => GrooveDocument;
  /**
   * Loops only: the figures without building the document (the rescaled material rotated in place, under
   * the header the steps give). Throws when the steps cannot be written, as the transforms would.
   */
  quick?: () => ReadabilityFigures;
}

function candidates(doc: GrooveDocument, o: Required<Omit<FindReadingsOptions, "limit" | "notation" | "spellTop">>): Candidate[] {
  const out: Candidate[] = [];
  const factors = o.factors.map((f) => q(f));
  factors.forEach((k) => {
    let scaled: GrooveDocument;
    try {
      scaled = k.equals(1) ? doc : rescale(doc, k);
    } catch {
      return; // cannot be written at this factor
    }
    const step = q(scaled.grid.step);
    const perBar = Number(barLength(scaled.meter).div(step).n);
    const meters: (Meter | null)[] = [null, ...(o.rebar ? rebarTwins(scaled.meter) : [])];
    // The header alone (no material): the transforms' rules on grids, bars, sections and swing still apply.
    const header: GrooveDocument = { ...scaled, kit: { lanes: [] }, keys: { ...scaled.keys, notes: [] } };
    let input: FigureInput | null = null;
    const scaledInput = () => (input ??= figureInput(scaled));
    // Half a bar either way: any other displacement is one of these plus a whole-bar rotation, which only
    // changes the bar the loop starts on.
    for (let j = -Math.floor((perBar - 1) / 2); j <= Math.floor(perBar / 2); j++) {
      const by = step.mul(j);
      for (const meter of meters) {
        const steps: Transform[] = [];
        if (!k.equals(1)) steps.push({ op: "rescale", factor: k.toFraction() });
        if (j !== 0) steps.push({ op: "displace", by: by.toFraction(), mode: o.displaceMode });
        if (meter) steps.push({ op: "rebar", meter });
        const rest = steps.filter((s) => s.op !== "rescale");
        const quick =
          o.displaceMode === "rotate"
            ? () => {
                const h = applySteps(header, rest);
                const rotated = j === 0 ? scaledInput() : rotateFigureInput(scaledInput(), j);
                return figuresFrom({ ...rotated, meter: h.meter, tempo: h.tempo, bars: h.bars, step: h.grid.step });
              }
            : undefined;
        out.push({
          id: idOf(k, by, meter),
          label: labelOf(k, by, meter),
          steps,
          simplicity: [steps.length, Math.abs(j) / perBar, j < 0 ? 1 : 0],
          build: () => applySteps(scaled, rest),
          quick,
        });
      }
    }
  });
  const bySimplicity = (a: Candidate, b: Candidate) =>
    a.simplicity[0] - b.simplicity[0] || a.simplicity[1] - b.simplicity[1] || a.simplicity[2] - b.simplicity[2] || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0);
  return out.sort(bySimplicity).slice(0, o.maxCandidates);
}

type Scored = Candidate & { doc: GrooveDocument | null; figures: ReadabilityFigures; scoreParts: ScoreParts; score: number };

const EPS = 1e-9;
function byScore(a: Scored, b: Scored): number {
  return (
    (Math.abs(a.score - b.score) > EPS ? a.score - b.score : 0) ||
    a.simplicity[0] - b.simplicity[0] ||
    a.simplicity[1] - b.simplicity[1] ||
    a.simplicity[2] - b.simplicity[2] ||
    (a.id < b.id ? -1 : a.id > b.id ? 1 : 0)
  );
}

function scored(c: Candidate, doc: GrooveDocument | null, figures: ReadabilityFigures): Scored {
  const scoreParts = scoreOf(figures);
  return { ...c, doc, figures, scoreParts, score: sum(scoreParts) };
}

/**
 * Candidate readings of a groove, proven to sound the same, best first.
 *
 * Ranking runs in two passes to keep the cost down: every candidate is measured without spelling it; the best
 * `spellTop` of those are spelled, scored in full and proven, in that order; a further batch is taken only
 * when proofs rejected too many to fill `limit`. The result is sorted by full score, then simplicity, then id.
 * @example findReadings(doc)[0].label // "Double time, displaced by an eighth"
 */
export function findReadings(doc: GrooveDocument, options: FindReadingsOptions = {}): Reading[] {
  const o = {
    factors: options.factors ?? ["1/2", "1", "2"],
    displaceMode: options.displaceMode ?? (doc.sections.length > 1 ? "pad" : "rotate"),
    rebar: options.rebar ?? true,
    maxCandidates: options.maxCandidates ?? 256,
  } satisfies Required<Omit<FindReadingsOptions, "limit" | "notation" | "spellTop">>;
  const limit = options.limit ?? 10;
  const batchSize = Math.max(1, options.spellTop ?? Math.max(24, 2 * limit));
  const notation = options.notation === false ? false : spelledCounts;
  const base = readabilityFigures(doc, { notation });

  // Pass 1: measure every candidate without spelling it (loops: without even building it).
  const rough: Scored[] = [];
  for (const c of candidates(doc, o)) {
    try {
      if (c.quick) rough.push(scored(c, null, c.quick()));
      else {
        const built = c.build();
        rough.push(scored(c, built, readabilityFigures(built, { notation: false })));
      }
    } catch {
      continue; // this step cannot be written (the transform says why)
    }
  }
  rough.sort(byScore);

  // Pass 2: build, spell, score in full and prove the best, batch by batch, until `limit` readings are proven.
  // Periodic grooves give the same document from different steps: only the simplest is returned (equal
  // documents score equally, so the simplest of them comes first).
  const seen = new Set<string>();
  const readings: (Reading & { simplicity: Candidate["simplicity"] })[] = [];
  for (let from = 0; from < rough.length && readings.length < limit; from += batchSize) {
    const batch: Scored[] = [];
    for (const r of rough.slice(from, from + batchSize)) {
      let built: GrooveDocument;
      try {
        built = r.doc ?? r.build();
      } catch {
        continue; // the material itself cannot be moved so (e.g. two notes would collide)
      }
      batch.push(scored(r, built, r.steps.length === 0 ? base : readabilityFigures(built, { notation })));
    }
    batch.sort(byScore);
    for (const s of batch) {
      if (readings.length >= limit) break;
      const built = s.doc!;
      const key = JSON.stringify(normalizeGroove(built));
      if (seen.has(key)) continue;
      seen.add(key);
      const equivalence = compareGrooves(doc, built);
      if (equivalence.verdict !== "identical" && equivalence.verdict !== "offset") continue;
      readings.push({
        id: s.id,
        label: s.label,
        steps: s.steps,
        doc: built,
        figures: s.figures,
        score: s.score,
        scoreParts: s.scoreParts,
        reasons: reasonsFor(s.figures, base, s.steps.length === 0),
        equivalence,
        simplicity: s.simplicity,
      });
    }
  }
  return readings
    .sort((a, b) => byScore(a as unknown as Scored, b as unknown as Scored))
    .map(({ simplicity: _s, ...r }) => r);
}
