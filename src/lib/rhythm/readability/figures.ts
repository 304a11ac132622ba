/**
 * Readability figures of a groove document: what a reader has to take in.
 *
 * Per part (kit hands, kit feet, keys) and overall: Longuet-Higgins & Lee syncopation, WNBD, off-beatness and
 * anticipations (see syncopation.ts), computed on onsets over the written bars played as a loop. Then the
 * common-practice landmarks: the backbeat (snare or cross-stick on the weak beats of each bar, 2 and 4 in 4/4),
 * the kick on the downbeat, the tempo inside the usual range, and how busy the page is (notes, rests, ties
 * from the notation spelling when a speller is given, events per bar).
 */
import type { GrooveDocument } from "../document";
import { KIT_PIECES, type KitPieceId } from "../kit";
import type { NotationScore } from "../notation/model";
import { q, toNumber } from "../rational";
import { metricalHierarchy, type MetricalHierarchy } from "./metrical-weights";
import { anticipations, lhlSyncopation, offBeatness, wnbd } from "./syncopation";

/**
 * The tempo range a reader finds comfortable for the written beat, in bpm. Common practice, from memory:
 * most charts are written with the beat between about 60 and 180 bpm; slower or faster, readers tend to
 * prefer the double- or half-time reading.
 */
export const USUAL_TEMPO_RANGE = { min: 60, max: 180 } as const;

/** The kit pieces that play a backbeat (common practice: snare, or cross-stick in quieter grooves). */
export const BACKBEAT_PIECES: readonly KitPieceId[] = ["snare", "cross-stick"];

export const PART_NAMES = ["hands", "feet", "keys"] as const;
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
  /** Spells the document and counts its notes, rests and ties (pass the notation module's counter). */
  notation?: (doc: GrooveDocument) => NotationCounts | null;
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

/** The hierarchy a document is measured on. */
export function documentHierarchy(doc: GrooveDocument): MetricalHierarchy {
  return metricalHierarchy(doc.meter, doc.grid.step, doc.tempo.beatNote);
}

/** Keys notes that start a sound: a note marked as continuing from the end of the loop (written by a rotation) does not. */
function onsetNotes(doc: GrooveDocument) {
  return doc.keys.notes.filter((n) => (n as { tiedFromEnd?: boolean }).tiedFromEnd !== true);
}

/** Onset pulses of each part (chords and simultaneous kit hits count once; the written bars are a loop). */
export function partOnsets(doc: GrooveDocument, h: MetricalHierarchy = documentHierarchy(doc)): Record<PartName, number[]> {
  const toPulse = (at: string) => Number(q(at).div(h.pulse).n);
  const sets: Record<PartName, Set<number>> = { hands: new Set(), feet: new Set(), keys: new Set() };
  for (const lane of doc.kit.lanes) {
    const set = KIT_PIECES[lane.piece].limb === "foot" ? sets.feet : sets.hands;
    for (const hit of lane.hits) set.add(toPulse(hit.at));
  }
  for (const n of onsetNotes(doc)) sets.keys.add(toPulse(n.at));
  const sorted = (s: Set<number>) => [...s].sort((a, b) => a - b);
  return { hands: sorted(sets.hands), feet: sorted(sets.feet), keys: sorted(sets.keys) };
}

function measure(onsets: number[], h: MetricalHierarchy, bars: number): SyncopationFigures {
  const cycle = h.pulsesPerBar * bars;
  const beats: number[] = [];
  for (let b = 0; b < bars; b++) for (const p of h.beats) beats.push(b * h.pulsesPerBar + p);
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
 * All readability figures of a document.
 * @example readabilityFigures(doc).parts.keys.anticipations // 6
 */
export function readabilityFigures(doc: GrooveDocument, options: FiguresOptions = {}): ReadabilityFigures {
  const h = documentHierarchy(doc);
  const onsets = partOnsets(doc, h);
  const parts = {
    hands: measure(onsets.hands, h, doc.bars),
    feet: measure(onsets.feet, h, doc.bars),
    keys: measure(onsets.keys, h, doc.bars),
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
  const barOf = (pulse: number) => Math.floor(pulse / h.pulsesPerBar);
  const toPulse = (at: string) => Number(q(at).div(h.pulse).n);
  const snareBars = new Map<number, Set<number>>();
  const kickBars = new Map<number, Set<number>>();
  for (const lane of doc.kit.lanes) {
    const target = BACKBEAT_PIECES.includes(lane.piece) ? snareBars : lane.piece === "kick" ? kickBars : null;
    if (!target) continue;
    for (const hit of lane.hits) {
      const p = toPulse(hit.at);
      const bar = barOf(p);
      if (!target.has(bar)) target.set(bar, new Set());
      target.get(bar)!.add(p % h.pulsesPerBar);
    }
  }
  let barsWithBackbeat = 0;
  if (h.weakBeats.length > 0)
    for (const set of snareBars.values()) if (h.weakBeats.every((p) => set.has(p))) barsWithBackbeat++;
  let barsWithKickOnOne = 0;
  for (const set of kickBars.values()) if (set.has(0)) barsWithKickOnOne++;

  const bpm = toNumber(doc.tempo.bpm);
  const events = doc.kit.lanes.reduce((s, l) => s + l.hits.length, 0) + onsetNotes(doc).length;
  let notation: NotationCounts | null = null;
  if (options.notation) {
    try {
      notation = options.notation(doc);
    } catch {
      notation = null;
    }
  }
  return {
    meter: `${doc.meter.beatsPerBar}/${doc.meter.beatUnit}`,
    bars: doc.bars,
    tempo: {
      bpm,
      beatNote: doc.tempo.beatNote,
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
    density: { events, perBar: events / doc.bars },
  };
}
