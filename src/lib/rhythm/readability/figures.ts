/**
 * Readability figures of a groove document: what a reader has to take in.
 *
 * Per part (kit hands, kit feet, keys) and overall: Longuet-Higgins & Lee syncopation, WNBD, off-beatness and
 * anticipations (see syncopation.ts), computed on onsets over the written bars played as a loop. Then the
 * common-practice landmarks: the backbeat (snare or cross-stick on the weak beats of each bar, 2 and 4 in 4/4),
 * the kick on the downbeat, the tempo inside the usual range, and how busy the page is (notes, rests and ties
 * of the notation spelling, events per bar).
 */
import { barLength, type GrooveDocument, type Meter, type Tempo } from "../document";
import { KIT_PIECES, type KitPieceId } from "../kit";
import type { NotationScore } from "../notation/model";
import { spellGroove } from "../notation/spell";
import { q, toNumber, type Rational } from "../rational";
import { mod, TickCodec, ticksOf } from "../ticks";
import { metricalHierarchy, type MetricalHierarchy } from "./metrical-weights";
import { anticipations, lhlSyncopation, offBeatness, wnbd } from "./syncopation";

/**
 * The tempo range a reader finds comfortable for the written beat, in bpm. Common practice, from memory:
 * most charts are written with the beat between about 60 and 180 bpm; slower or faster, readers tend to
 * prefer the double- or half-time reading.
 */
export const USUAL_TEMPO_RANGE = { min: 60, max: 180 } as const;

/** The kit pieces that play a backbeat (common practice: snare, or cross-stick in quieter grooves). */
const BACKBEAT_PIECES: readonly KitPieceId[] = ["snare", "cross-stick"];

const PART_NAMES = ["hands", "feet", "keys"] as const;
export type PartName = (typeof PART_NAMES)[number];

export interface SyncopationFigures {
  /** Distinct onset positions. */
  onsets: number;
  /** Longuet-Higgins & Lee total (0 when nothing is syncopated). */
  lhl: number;
  /** How many notes LHL counts as syncopated. */
  lhlSyncopations: number;
  /** Weighted note-to-beat distance (mean per onset). */
  wnbd: number;
  /** Toussaint's off-beatness, summed over bars. */
  offBeatness: number;
  /** Off-beat notes held over the next beat. */
  anticipations: number;
}

export interface NotationCounts {
  notes: number;
  rests: number;
  ties: number;
}

export interface ReadabilityFigures {
  meter: string;
  bars: number;
  tempo: { bpm: number; beatNote: string; inUsualRange: boolean; range: typeof USUAL_TEMPO_RANGE };
  /** From the notation spelling; null when no speller was given or it could not spell the document. */
  notation: NotationCounts | null;
  parts: Record<PartName, SyncopationFigures>;
  /** Sums over the parts; WNBD is the onset-weighted mean. */
  overall: SyncopationFigures;
  backbeat: {
    /** 1-based numbers of the felt beats that carry the backbeat ([2, 4] in 4/4). */
    beats: number[];
    /** Bars with a snare or cross-stick on every backbeat. */
    barsWithBackbeat: number;
    /** Bars with any snare or cross-stick hit. */
    barsWithSnare: number;
    /** barsWithBackbeat / barsWithSnare, or null without snare or backbeat positions. */
    share: number | null;
  };
  downbeatKick: { barsWithKickOnOne: number; barsWithKick: number; share: number | null };
  density: { events: number; perBar: number };
}

export interface FiguresOptions {
  /**
   * How to count notes, rests and ties: by default the document is spelled with `spellGroove`; pass another
   * counter, or `false` to skip spelling (faster; `notation` is then null).
   */
  notation?: ((doc: GrooveDocument) => NotationCounts | null) | false;
}

/**
 * Notes, rests and ties of a document as `spellGroove` writes it.
 * @example spelledCounts(doc) // { notes: 46, rests: 18, ties: 0 }
 */
export function spelledCounts(doc: GrooveDocument): NotationCounts {
  return countNotation(spellGroove(doc));
}

/**
 * Count what a reader sees in a spelled score: note events (a chord is one), rests (hidden rests of an empty
 * second voice excluded; a whole-bar rest is one) and ties (per notehead, counted where they start).
 * @example countNotation(spellGroove(doc)) // { notes: 24, rests: 6, ties: 2 }
 */
export function countNotation(score: NotationScore): NotationCounts {
  let notes = 0;
  let rests = 0;
  let ties = 0;
  for (const bar of score.bars) {
    const voices = [bar.kit.up, bar.kit.down, ...(bar.keys ? [bar.keys.treble, bar.keys.bass] : [])];
    for (const voice of voices)
      for (const e of voice) {
        if (e.kind === "rest") {
          if (!e.hidden) rests++;
          continue;
        }
        notes++;
        for (const head of e.heads) if (head.tieStart) ties++;
      }
  }
  return { notes, rests, ties };
}

/**
 * What the figures are computed from: the document's header and its onsets as whole numbers of grid steps
 * from the start. Separate from the document so a rotation can be measured without rebuilding it.
 */
export interface FigureInput {
  meter: Meter;
  tempo: Tempo;
  step: Rational;
  bars: number;
  /** Onset positions in grid steps, per part, sorted, each once (chords and simultaneous hits count once). */
  onsets: Record<PartName, number[]>;
  /** Positions of snare and cross-stick hits (the backbeat pieces), in grid steps. */
  backbeat: number[];
  /** Positions of kick hits, in grid steps. */
  kick: number[];
  /** Kit hits plus keys notes that start a sound. */
  events: number;
}

/** Keys notes that start a sound: a note marked as continuing from the end of the loop (written by a rotation) does not. */
function onsetNotes(doc: GrooveDocument) {
  return doc.keys.notes.filter((n) => n.tiedFromEnd !== true);
}

const sortedUnique = (xs: Iterable<number>) => [...new Set(xs)].sort((a, b) => a - b);

/**
 * Extract what the figures need from a document.
 * @example figureInput(toggleHit(emptyGroove(), "snare", "1/4")).onsets // { hands: [4], feet: [], keys: [] }
 */
export function figureInput(doc: GrooveDocument): FigureInput {
  const codec = new TickCodec(doc.grid.step);
  const toStep = (at: Rational) => codec.toTicks(at);
  const hands: number[] = [];
  const feet: number[] = [];
  const backbeat: number[] = [];
  const kick: number[] = [];
  let events = 0;
  for (const lane of doc.kit.lanes) {
    const part = KIT_PIECES[lane.piece].limb === "foot" ? feet : hands;
    const landmark = BACKBEAT_PIECES.includes(lane.piece) ? backbeat : lane.piece === "kick" ? kick : null;
    for (const hit of lane.hits) {
      const p = toStep(hit.at);
      part.push(p);
      landmark?.push(p);
    }
    events += lane.hits.length;
  }
  const notes = onsetNotes(doc);
  events += notes.length;
  return {
    meter: doc.meter,
    tempo: doc.tempo,
    step: doc.grid.step,
    bars: doc.bars,
    onsets: { hands: sortedUnique(hands), feet: sortedUnique(feet), keys: sortedUnique(notes.map((n) => toStep(n.at))) },
    backbeat,
    kick,
    events,
  };
}

/**
 * The input of the same material rotated by `steps` grid steps inside the loop (positive = later), as
 * `displace(doc, steps × step, "rotate")` would place it.
 * @example rotateFigureInput(figureInput(doc), 2)
 */
export function rotateFigureInput(input: FigureInput, steps: number): FigureInput {
  const total = ticksOf(barLength(input.meter).mul(input.bars), input.step, "groove length");
  const rot = (xs: number[]) => xs.map((x) => mod(x + steps, total));
  return {
    ...input,
    onsets: { hands: sortedUnique(rot(input.onsets.hands)), feet: sortedUnique(rot(input.onsets.feet)), keys: sortedUnique(rot(input.onsets.keys)) },
    backbeat: rot(input.backbeat),
    kick: rot(input.kick),
  };
}

function measure(onsets: number[], h: MetricalHierarchy, bars: number, beats: number[]): SyncopationFigures {
  const cycle = h.pulsesPerBar * bars;
  const l = lhlSyncopation(onsets, cycle, (p) => h.weights[p % h.pulsesPerBar]!);
  return {
    onsets: onsets.length,
    lhl: l.total ?? 0,
    lhlSyncopations: l.syncopations.length,
    wnbd: wnbd(onsets, cycle, beats),
    offBeatness: offBeatness(onsets, h.pulsesPerBar),
    anticipations: anticipations(onsets, cycle, beats),
  };
}

/**
 * The figures of an extracted input (see `figureInput`), with notation counts when known.
 * @example figuresFrom(rotateFigureInput(figureInput(doc), 2), null).backbeat.share
 */
export function figuresFrom(input: FigureInput, notation: NotationCounts | null = null): ReadabilityFigures {
  const h = metricalHierarchy(input.meter, input.step, input.tempo.beatNote);
  const k = Number(q(input.step).div(h.pulse).n); // pulses per grid step
  const toPulses = (xs: number[]) => xs.map((x) => x * k);
  const beats: number[] = [];
  for (let b = 0; b < input.bars; b++) for (const p of h.beats) beats.push(b * h.pulsesPerBar + p);
  const parts = {
    hands: measure(toPulses(input.onsets.hands), h, input.bars, beats),
    feet: measure(toPulses(input.onsets.feet), h, input.bars, beats),
    keys: measure(toPulses(input.onsets.keys), h, input.bars, beats),
  };
  const all = Object.values(parts);
  const totalOnsets = all.reduce((s, p) => s + p.onsets, 0);
  const overall: SyncopationFigures = {
    onsets: totalOnsets,
    lhl: all.reduce((s, p) => s + p.lhl, 0),
    lhlSyncopations: all.reduce((s, p) => s + p.lhlSyncopations, 0),
    wnbd: totalOnsets === 0 ? 0 : all.reduce((s, p) => s + p.wnbd * p.onsets, 0) / totalOnsets,
    offBeatness: all.reduce((s, p) => s + p.offBeatness, 0),
    anticipations: all.reduce((s, p) => s + p.anticipations, 0),
  };

  // Bar-by-bar landmarks, on pulse positions within each bar.
  const byBar = (xs: number[]) => {
    const bars = new Map<number, Set<number>>();
    for (const x of xs) {
      const p = x * k;
      const bar = Math.floor(p / h.pulsesPerBar);
      if (!bars.has(bar)) bars.set(bar, new Set());
      bars.get(bar)!.add(p % h.pulsesPerBar);
    }
    return bars;
  };
  const snareBars = byBar(input.backbeat);
  const kickBars = byBar(input.kick);
  let barsWithBackbeat = 0;
  if (h.weakBeats.length > 0)
    for (const set of snareBars.values()) if (h.weakBeats.every((p) => set.has(p))) barsWithBackbeat++;
  let barsWithKickOnOne = 0;
  for (const set of kickBars.values()) if (set.has(0)) barsWithKickOnOne++;

  const bpm = toNumber(input.tempo.bpm);
  return {
    meter: `${input.meter.beatsPerBar}/${input.meter.beatUnit}`,
    bars: input.bars,
    tempo: {
      bpm,
      beatNote: input.tempo.beatNote,
      inUsualRange: bpm >= USUAL_TEMPO_RANGE.min && bpm <= USUAL_TEMPO_RANGE.max,
      range: USUAL_TEMPO_RANGE,
    },
    notation,
    parts,
    overall,
    backbeat: {
      beats: h.weakBeats.map((p) => h.beats.indexOf(p) + 1),
      barsWithBackbeat,
      barsWithSnare: snareBars.size,
      share: snareBars.size === 0 || h.weakBeats.length === 0 ? null : barsWithBackbeat / snareBars.size,
    },
    downbeatKick: { barsWithKickOnOne, barsWithKick: kickBars.size, share: kickBars.size === 0 ? null : barsWithKickOnOne / kickBars.size },
    density: { events: input.events, perBar: input.events / input.bars },
  };
}

/**
 * All readability figures of a document.
 * @example readabilityFigures(doc).parts.keys.anticipations // 6
 */
export function readabilityFigures(doc: GrooveDocument, options: FiguresOptions = {}): ReadabilityFigures {
  let notation: NotationCounts | null = null;
  const count = options.notation ?? spelledCounts;
  if (count) {
    try {
      notation = count(doc);
    } catch {
      notation = null; // a document the speller cannot write is still measured
    }
  }
  return figuresFrom(figureInput(doc), notation);
}
