/**
 * Groove document → notation model.
 *
 * - Kit: two voices on the percussion staff, hands stems up and feet stems down (PAS, N. Weinberg,
 *   "Guide to Standardized Drumset Notation", 1998). Hits at the same position in a voice form a chord.
 *   Each hit is written as lasting until the next onset of its voice but never past the end of its beat
 *   group (drum notation writes short values, then rests): a quarter at most, or a dotted quarter filling
 *   a compound beat.
 * - Keys: notes at or above `splitPitch` on the treble staff, the others on the bass staff, one voice per
 *   staff. Where notes overlap, the staff is cut at every onset and release: each slice is a chord of what
 *   sounds in it, and a note that sounds on is tied into the next slice. So notes starting together with
 *   different lengths are written as the shortest, with the longer ones tied on (Tactus's rule: one voice,
 *   ties show what is held). Notes are also split and tied at bar lines and wherever the beat must show.
 */
import { type GrooveDocument, RhythmError } from "../document";
import { ARTICULATIONS, DYNAMICS, KIT_PIECE_INDEX, type Articulation, type Dynamic, type KitPieceId } from "../kit";
import { isStraight } from "../swing";
import { beamGroups, stemFor } from "./beams";
import { noteValueOf } from "./durations";
import { kitDisplay, kitVoice, staffIndex } from "./kit-staff";
import { groupIndexAt, makeMetric, type Metric } from "./metric";
import type { Head, KeysHead, KitHead, NotationBar, NotationScore, NoteEvent, RestEvent, VoiceEvent } from "./model";
import { chooseAccidentals, spellMidi, type Accidentals } from "./pitch-spelling";
import { makeTimebase, type Timebase } from "./timebase";
import { spellVoice, type Piece, type Written } from "./voice";

interface Hit {
  readonly t: number;
  readonly head: KitHead;
}

interface KeyNote {
  readonly s: number;
  readonly e: number;
  readonly midi: number;
  readonly velocity: number;
}

interface Prepared {
  readonly tb: Timebase;
  readonly metric: Metric;
  /** Kit hits per bar, per voice, sorted by position. */
  readonly up: Hit[][];
  readonly down: Hit[][];
  readonly treble: KeyNote[];
  readonly bass: KeyNote[];
  readonly accidentals: Accidentals;
}

const prepared = new WeakMap<GrooveDocument, Prepared>();

const TREBLE_MIDDLE = staffIndex("B", 4);
const BASS_MIDDLE = staffIndex("D", 3);

function prepare(doc: GrooveDocument): Prepared {
  const hit = prepared.get(doc);
  if (hit) return hit;
  const tb = makeTimebase(doc.grid.step, doc.meter.beatUnit);
  const metric = makeMetric(doc.meter, tb.D);
  const barTicks = metric.barTicks;
  const up: Hit[][] = Array.from({ length: doc.bars }, () => []);
  const down: Hit[][] = Array.from({ length: doc.bars }, () => []);
  const headCache = new Map<number, KitHead>();
  for (const lane of doc.kit.lanes) {
    const buckets = kitVoice(lane.piece) === "up" ? up : down;
    for (const h of lane.hits) {
      const t = tb.ticks(h.at);
      const bar = Math.floor(t / barTicks);
      if (bar < 0 || bar >= doc.bars) throw new RhythmError(`kit hit at ${h.at} is outside the groove`);
      buckets[bar]!.push({ t: t - bar * barTicks, head: kitHead(headCache, lane.piece, h.dynamic, h.articulation) });
    }
  }
  const byT = (a: Hit, b: Hit) => a.t - b.t || staffIndex(a.head.display.step, a.head.display.octave) - staffIndex(b.head.display.step, b.head.display.octave);
  for (const b of up) if (b.length > 1) b.sort(byT);
  for (const b of down) if (b.length > 1) b.sort(byT);

  const treble: KeyNote[] = [];
  const bass: KeyNote[] = [];
  for (const n of doc.keys.notes) {
    const s = tb.ticks(n.at);
    const note = { s, e: s + tb.ticks(n.duration), midi: n.pitch, velocity: n.velocity };
    (n.pitch >= doc.keys.splitPitch ? treble : bass).push(note);
  }
  const byS = (a: KeyNote, b: KeyNote) => a.s - b.s || a.midi - b.midi;
  treble.sort(byS);
  bass.sort(byS);
  const p: Prepared = { tb, metric, up, down, treble, bass, accidentals: chooseAccidentals(doc.keys.notes.map((n) => n.pitch)) };
  prepared.set(doc, p);
  return p;
}

function kitHead(cache: Map<number, KitHead>, piece: KitPieceId, dynamic: Dynamic, articulation?: Articulation): KitHead {
  const key = (KIT_PIECE_INDEX.get(piece)! * 4 + DYNAMICS.indexOf(dynamic)) * 4 + (articulation ? ARTICULATIONS.indexOf(articulation) + 1 : 0);
  let h = cache.get(key);
  if (!h) {
    h = {
      kind: "kit",
      piece,
      dynamic,
      ...(articulation ? { articulation } : {}),
      display: kitDisplay(piece, dynamic, articulation),
      tieStart: false,
      tieStop: false,
    };
    cache.set(key, h);
  }
  return h;
}

/**
 * Spell the whole groove. Documents are treated as immutable: the parsed positions are cached per document
 * object (a WeakMap), so `spellBars` on the same object after the first call only spells its bars.
 * Throws a RhythmError only for documents that would fail validation (positions off the grid).
 * @example spellGroove(assertGroove(json)).bars[0].kit.up // the hands' notes and rests of bar 1
 */
export function spellGroove(doc: GrooveDocument): NotationScore {
  const p = prepare(doc);
  const hasKeys = doc.keys.notes.length > 0;
  return {
    meter: { beatsPerBar: doc.meter.beatsPerBar, beatUnit: doc.meter.beatUnit, grouping: p.metric.groups.map((g) => g.units) },
    tempo: { bpm: doc.tempo.bpm, beatNote: doc.tempo.beatNote, beatNoteValue: noteValueOf(doc.tempo.beatNote) },
    swing: isStraight(doc.swing) ? null : { unit: doc.swing.unit, ratio: doc.swing.ratio },
    bars: spellBars(doc, 0, doc.bars),
    sections: doc.sections.map((s) => ({ name: s.name, startBar: s.startBar, bars: s.bars, repeats: s.repeats })),
    hasKeys,
    hasKit: doc.kit.lanes.length > 0,
  };
}

/**
 * Spell bars `fromBar` (inclusive) to `toBar` (exclusive), for incremental rendering. The result is the same
 * as the matching slice of `spellGroove(doc).bars` (ties into and out of the range included).
 * @example spellBars(doc, 4, 8).length // 4
 */
export function spellBars(doc: GrooveDocument, fromBar: number, toBar: number): NotationBar[] {
  const from = Math.max(0, Math.floor(fromBar));
  const to = Math.min(doc.bars, Math.floor(toBar));
  if (to <= from) return [];
  const p = prepare(doc);
  const { tb, metric } = p;
  const barTicks = metric.barTicks;
  const lengthR = tb.rational(barTicks);
  const hasKeys = doc.keys.notes.length > 0;
  const treble = hasKeys ? keysSlices(p.treble, from * barTicks, to * barTicks, barTicks) : [];
  const bass = hasKeys ? keysSlices(p.bass, from * barTicks, to * barTicks, barTicks) : [];
  const bars: NotationBar[] = [];
  let ti = 0;
  let bi = 0;
  for (let b = from; b < to; b++) {
    const start = b * barTicks;
    const upHits = p.up[b]!;
    const downHits = p.down[b]!;
    let up = kitEvents(p, upHits, "up");
    let down = kitEvents(p, downHits, "down");
    // An empty kit voice is hidden while the other voice plays; an empty bar shows one whole-bar rest.
    if (downHits.length === 0) down = down.map(hide);
    if (upHits.length === 0 && downHits.length > 0) up = up.map(hide);
    let keys: NotationBar["keys"] = null;
    if (hasKeys) {
      const tr: Slice[] = [];
      while (ti < treble.length && treble[ti]!.s < start + barTicks) tr.push(treble[ti++]!);
      const bs: Slice[] = [];
      while (bi < bass.length && bass[bi]!.s < start + barTicks) bs.push(bass[bi++]!);
      keys = { treble: keysEvents(p, tr, start, TREBLE_MIDDLE), bass: keysEvents(p, bs, start, BASS_MIDDLE) };
    }
    bars.push({ index: b, start: tb.rational(start), length: lengthR, kit: { up, down }, keys });
  }
  return bars;
}

type KitChord = readonly KitHead[];

const KIT = { kit: true } as const;
const KEYS = { kit: false } as const;

const hide = (e: VoiceEvent): VoiceEvent => (e.kind === "rest" ? { ...e, hidden: true } : e);

/** Kit voice of one bar: each chord lasts to the next onset or the end of its beat group. */
function kitEvents(p: Prepared, hits: readonly Hit[], voice: "up" | "down"): VoiceEvent[] {
  const { metric } = p;
  const pieces: Piece<KitChord>[] = [];
  let cur = 0;
  for (let i = 0; i < hits.length; ) {
    const t = hits[i]!.t;
    const heads: KitHead[] = [];
    while (i < hits.length && hits[i]!.t === t) heads.push(hits[i++]!.head);
    const next = i < hits.length ? hits[i]!.t : metric.barTicks;
    const end = Math.min(next, metric.groups[groupIndexAt(metric, t)]!.end);
    if (t > cur) pieces.push({ s: cur, e: t, note: null });
    pieces.push({ s: t, e: end, note: heads });
    cur = end;
  }
  if (cur < metric.barTicks) pieces.push({ s: cur, e: metric.barTicks, note: null });
  const written = spellVoice(pieces, metric, p.tb.D, KIT);
  const beams = beamGroups(written, metric.beamUnits);
  return written.map((w, i) => toEvent(p, w, w.note, voice, beams[i]));
}

/** One slice of a keys staff: what sounds in [s, e), with tie flags per pitch. */
interface Slice {
  readonly s: number;
  readonly e: number;
  readonly heads: readonly { midi: number; velocity: number; tieStop: boolean; tieStart: boolean }[];
}

/**
 * Cut a staff's notes at every onset, release and bar line inside [r0, r1).
 * A pitch is tied out of a slice when it still sounds at the next cut and is not struck again there.
 */
function keysSlices(notes: readonly KeyNote[], r0: number, r1: number, barTicks: number): Slice[] {
  const relevant: KeyNote[] = [];
  const struckAtEnd = new Set<number>();
  for (const n of notes) {
    if (n.s > r1) break;
    if (n.s === r1) struckAtEnd.add(n.midi);
    else if (n.e > r0) relevant.push(n);
  }
  const cuts = new Set<number>();
  for (let t = r0; t <= r1; t += barTicks) cuts.add(t);
  for (const n of relevant) {
    cuts.add(Math.max(n.s, r0));
    cuts.add(Math.min(n.e, r1));
  }
  const pts = [...cuts].sort((a, b) => a - b);
  const raw: { s: number; e: number; heads: Map<number, { velocity: number; onset: boolean }> }[] = [];
  const active: KeyNote[] = [];
  let k = 0;
  for (let i = 0; i + 1 < pts.length; i++) {
    const t = pts[i]!;
    while (k < relevant.length && Math.max(relevant[k]!.s, r0) <= t) active.push(relevant[k++]!);
    let kept = 0;
    for (const n of active) if (n.e > t) active[kept++] = n;
    active.length = kept;
    const heads = new Map<number, { velocity: number; onset: boolean }>();
    for (const n of active) {
      const onset = n.s === t;
      const h = heads.get(n.midi);
      if (!h || onset) heads.set(n.midi, { velocity: n.velocity, onset: onset || (h?.onset ?? false) });
    }
    raw.push({ s: t, e: pts[i + 1]!, heads });
  }
  // Held past the range and not struck again right at its end (as the whole-groove spelling would see it).
  const beyond = new Set(relevant.filter((n) => n.e > r1 && !struckAtEnd.has(n.midi)).map((n) => n.midi));
  return raw.map((sl, i) => {
    const next = raw[i + 1];
    const heads = [...sl.heads.entries()]
      .sort((a, b) => a[0] - b[0])
      .map(([midi, h]) => {
        const after = next ? next.heads.get(midi) : undefined;
        const tieStart = next ? after !== undefined && !after.onset : beyond.has(midi);
        return { midi, velocity: h.velocity, tieStop: !h.onset, tieStart };
      });
    return { s: sl.s, e: sl.e, heads };
  });
}

/** Keys staff of one bar from its slices (absolute ticks). */
function keysEvents(p: Prepared, slices: readonly Slice[], barStart: number, middle: number): VoiceEvent[] {
  const { metric, tb } = p;
  const pieces: Piece<Slice>[] = slices.map((sl) => ({
    s: sl.s - barStart,
    e: sl.e - barStart,
    note: sl.heads.length > 0 ? sl : null,
  }));
  const written = spellVoice(pieces, metric, tb.D, KEYS);
  const beams = beamGroups(written, metric.beamUnits);
  // Ties: consecutive events of one piece are tied; the first and last take the slice's own flags.
  const accState = new Map<number, number>();
  const heads: (KeysHead[] | null)[] = written.map((w, i) => {
    const sl = w.note;
    if (!sl) return null;
    const first = i === 0 || written[i - 1]!.piece !== w.piece;
    const last = i === written.length - 1 || written[i + 1]!.piece !== w.piece;
    return sl.heads.map((h) => {
      const sp = spellMidi(h.midi, p.accidentals);
      const tieStop = first ? h.tieStop : true;
      const tieStart = last ? h.tieStart : true;
      const key = staffIndex(sp.step, sp.octave);
      let accidental: KeysHead["accidental"];
      // Accidentals last to the bar line; a note tied over from before keeps its accidental unprinted.
      if (!tieStop) {
        const current = accState.get(key) ?? 0;
        if (sp.alter !== current) accidental = sp.alter === 1 ? "sharp" : sp.alter === -1 ? "flat" : "natural";
        accState.set(key, sp.alter);
      }
      const head: { -readonly [K in keyof KeysHead]: KeysHead[K] } = {
        kind: "pitch",
        midi: h.midi,
        step: sp.step,
        alter: sp.alter,
        octave: sp.octave,
        velocity: h.velocity,
        tieStart,
        tieStop,
      };
      if (accidental) head.accidental = accidental;
      return head;
    });
  });
  // Stems: a beamed group shares one direction, decided by its note farthest from the middle line.
  const stems: ("up" | "down")[] = heads.map((hs) => (hs ? stemFor(hs.map(headIndex), middle) : "up"));
  const byBeam = new Map<number, number[]>();
  for (let i = 0; i < beams.length; i++) {
    const id = beams[i];
    if (id === undefined) continue;
    const members = byBeam.get(id);
    if (members) members.push(i);
    else byBeam.set(id, [i]);
  }
  for (const members of byBeam.values()) {
    const all = members.flatMap((i) => (heads[i] ?? []).map(headIndex));
    const dir = stemFor(all, middle);
    for (const i of members) stems[i] = dir;
  }
  return written.map((w, i) => toEvent(p, w, heads[i] ?? null, stems[i]!, beams[i]));
}

const headIndex = (h: KeysHead) => staffIndex(h.step, h.octave);

function toEvent<T>(p: Prepared, w: Written<T>, heads: readonly Head[] | null, stem: "up" | "down", beam: number | undefined): VoiceEvent {
  const { tb } = p;
  // Built field by field: object spreads are the slowest part of spelling a long song.
  if (heads === null || w.note === null) {
    const rest: { -readonly [K in keyof RestEvent]: RestEvent[K] } = { kind: "rest", at: tb.rational(w.s), duration: tb.rational(w.len), value: w.value };
    if (w.tuplet) rest.tuplet = w.tuplet;
    if (w.measure) rest.measure = true;
    return rest;
  }
  const note: { -readonly [K in keyof NoteEvent]: NoteEvent[K] } = {
    kind: "note",
    at: tb.rational(w.s),
    duration: tb.rational(w.len),
    value: w.value,
    heads,
    stem,
  };
  if (w.tuplet) note.tuplet = w.tuplet;
  if (beam !== undefined) note.beam = beam;
  return note;
}
