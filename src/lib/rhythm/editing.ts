/**
 * Pure edit operations on the groove document: the editor's verbs.
 *
 * Every function takes a document and returns a new one (unchanged parts are shared, so a UI can tell
 * what changed by identity). Nothing here drops material silently: operations that can lose hits or notes
 * (meter, grid, bar deletion, pasting into a shorter bar) return `{ doc, dropped }`, listing each lost item
 * with where it was and why, and `adjusted` for notes that were kept but shortened or snapped.
 *
 * Positions are rational whole-note strings, as in the document. Bars are 0-based here; labels for people
 * (see `describeAt`) are 1-based.
 */
import { DYNAMICS, KIT_PIECES, KIT_ROW_ORDER, type Articulation, type Dynamic, type KitPieceId } from "./kit";
import {
  DEFAULT_KEY_VELOCITY,
  LIMITS,
  RhythmError,
  barLength,
  grooveLength,
  parseGroove,
  tempoInRange,
  type GrooveDocument,
  type KeyNote,
  type KitHit,
  type KitLane,
  type Meter,
  type Section,
  type Swing,
  type Tempo,
} from "./document";
import { describePosition } from "./describe-position";
import { Fraction, fmt, q, type Rational, type RationalInput } from "./rational";

/** A kit hit that an edit could not keep. */
export interface DroppedHit {
  kind: "hit";
  piece: KitPieceId;
  /** Position in the document BEFORE the edit. */
  at: Rational;
  dynamic: Dynamic;
  articulation?: Articulation;
  /** Where it was, for people: "bar 2, beat 4". */
  where: string;
  reason: string;
}

/** A keys note that an edit could not keep. */
export interface DroppedNote {
  kind: "note";
  pitch: number;
  at: Rational;
  duration: Rational;
  where: string;
  reason: string;
}

export type DroppedItem = DroppedHit | DroppedNote;

/** A keys note kept with a changed duration. */
export interface AdjustedNote {
  pitch: number;
  /** Position in the document AFTER the edit. */
  at: Rational;
  from: Rational;
  to: Rational;
  reason: string;
}

export interface EditResult {
  doc: GrooveDocument;
  dropped: DroppedItem[];
  adjusted: AdjustedNote[];
}

/** A copied range of bars, positions relative to the range start. Independent of the source document. */
export interface BarClip {
  meter: Meter;
  /** Grid step of the source, for information. */
  step: Rational;
  bars: number;
  lanes: { piece: KitPieceId; hits: KitHit[] }[];
  notes: KeyNote[];
}

// ---------------------------------------------------------------------------------------------------------------
// Positions

const byAt = (a: { at: Rational }, b: { at: Rational }) => q(a.at).compare(q(b.at));
/** A note moved away from 0 no longer continues a note held over the loop's seam. */
const untie = (n: KeyNote): KeyNote => {
  if (!n.tiedFromEnd || n.at === "0") return n;
  const { tiedFromEnd: _t, ...rest } = n;
  return rest;
};
const sortNotes = (notes: KeyNote[]) => notes.map(untie).sort((a, b) => byAt(a, b) || a.pitch - b.pitch);

/**
 * Step count of the grid: how many grid steps the groove has.
 * @example stepCount({ ...emptyGroove(), bars: 2 }) // 32 (two 4/4 bars of sixteenths)
 */
export function stepCount(doc: Pick<GrooveDocument, "meter" | "bars" | "grid">): number {
  return Number(grooveLength(doc).div(q(doc.grid.step)).valueOf());
}

/**
 * Position of grid column `col` (0-based) as a rational string.
 * @example atOfStep({ grid: { step: "1/16" } }, 5) // "5/16"
 */
export function atOfStep(doc: Pick<GrooveDocument, "grid">, col: number): Rational {
  return fmt(q(doc.grid.step).mul(col));
}

/**
 * Where a position is, for people: the core's counting words ("bar 2, beat 3 and").
 * @example describeAt(emptyGroove(), "1/4") // "bar 1, beat 2"
 */
export function describeAt(doc: Pick<GrooveDocument, "meter">, at: RationalInput): string {
  return describePosition(doc, at).text;
}

function requireOnGrid(doc: GrooveDocument, at: RationalInput): Rational {
  const pos = q(at);
  if (pos.compare(0) < 0 || pos.compare(grooveLength(doc)) >= 0)
    throw new RhythmError(`position ${fmt(pos)} is outside the groove (0 up to ${fmt(grooveLength(doc))} whole notes)`);
  if (pos.div(q(doc.grid.step)).d !== 1n) throw new RhythmError(`position ${fmt(pos)} is not on the ${doc.grid.step} grid`);
  return fmt(pos);
}

// ---------------------------------------------------------------------------------------------------------------
// Kit hits

/**
 * The hit of `piece` at `at`, if any.
 * @example hitAt(toggleHit(doc, "snare", "1/4"), "snare", "1/4") // { at: "1/4", dynamic: "normal" }
 */
export function hitAt(doc: GrooveDocument, piece: KitPieceId, at: RationalInput): KitHit | undefined {
  const key = fmt(at);
  return doc.kit.lanes.find((l) => l.piece === piece)?.hits.find((h) => h.at === key);
}

/** Replace one lane (adding it in row order when missing) through `fn`; other lanes keep their identity. */
function withLane(doc: GrooveDocument, piece: KitPieceId, fn: (hits: KitHit[]) => KitHit[]): GrooveDocument {
  const idx = doc.kit.lanes.findIndex((l) => l.piece === piece);
  if (idx === -1) {
    const added = addLane(doc, piece);
    return withLane(added, piece, fn);
  }
  const lane = doc.kit.lanes[idx]!;
  const hits = fn(lane.hits);
  if (hits === lane.hits) return doc;
  const lanes = doc.kit.lanes.slice();
  lanes[idx] = { ...lane, hits };
  return { ...doc, kit: { ...doc.kit, lanes } };
}

/** Put (or replace) a hit, keeping the lane sorted. */
function putHit(hits: KitHit[], hit: KitHit): KitHit[] {
  const i = hits.findIndex((h) => h.at === hit.at);
  if (i >= 0) {
    const next = hits.slice();
    next[i] = hit;
    return next;
  }
  const pos = q(hit.at);
  let j = hits.length;
  while (j > 0 && q(hits[j - 1]!.at).compare(pos) > 0) j--;
  return [...hits.slice(0, j), hit, ...hits.slice(j)];
}

/**
 * Add a hit where there is none, remove it where there is one.
 * @example toggleHit(doc, "snare", "1/4") // snare on beat 2
 */
export function toggleHit(doc: GrooveDocument, piece: KitPieceId, at: RationalInput, dynamic: Dynamic = "normal"): GrooveDocument {
  const key = requireOnGrid(doc, at);
  return withLane(doc, piece, (hits) =>
    hits.some((h) => h.at === key) ? hits.filter((h) => h.at !== key) : putHit(hits, { at: key, dynamic }),
  );
}

/** The dynamic after `d` in the cycle ghost → normal → accent → ghost. */
function nextDynamic(d: Dynamic): Dynamic {
  return DYNAMICS[(DYNAMICS.indexOf(d) + 1) % DYNAMICS.length]!;
}

/**
 * Step a hit's dynamic along ghost → normal → accent → ghost. An empty step gets a normal hit.
 * @example cycleDynamic(doc, "snare", "1/4") // normal → accent
 */
export function cycleDynamic(doc: GrooveDocument, piece: KitPieceId, at: RationalInput): GrooveDocument {
  const key = requireOnGrid(doc, at);
  return withLane(doc, piece, (hits) => {
    const hit = hits.find((h) => h.at === key);
    return putHit(hits, hit ? { ...hit, dynamic: nextDynamic(hit.dynamic) } : { at: key, dynamic: "normal" });
  });
}

/**
 * Set a hit's dynamic (adding the hit when the step is empty).
 * @example setDynamic(doc, "snare", "5/16", "ghost") // a ghost note on the "e" of beat 2
 */
export function setDynamic(doc: GrooveDocument, piece: KitPieceId, at: RationalInput, dynamic: Dynamic): GrooveDocument {
  const key = requireOnGrid(doc, at);
  return withLane(doc, piece, (hits) => {
    const hit = hits.find((h) => h.at === key);
    return putHit(hits, { ...(hit ?? { at: key }), dynamic });
  });
}

/**
 * Set or clear (null) a hit's articulation; an empty step gets a normal hit carrying it.
 * @example setArticulation(doc, "hihat-closed", "1/8", "open")
 */
export function setArticulation(
  doc: GrooveDocument,
  piece: KitPieceId,
  at: RationalInput,
  articulation: Articulation | null,
): GrooveDocument {
  const key = requireOnGrid(doc, at);
  return withLane(doc, piece, (hits) => {
    const hit = hits.find((h) => h.at === key);
    if (!hit && articulation === null) return hits;
    const { articulation: _old, ...rest } = hit ?? { at: key, dynamic: "normal" as Dynamic };
    return putHit(hits, articulation ? { ...rest, articulation } : rest);
  });
}

/**
 * Fill ("on") or clear ("off") every grid step from `from` to `to`, both included, in either order.
 * Painting over an existing hit keeps its dynamic and articulation.
 * @example paintRun(doc, "hihat-closed", "0", "7/8", "on") // eighth… every step of the first bar
 */
export function paintRun(
  doc: GrooveDocument,
  piece: KitPieceId,
  from: RationalInput,
  to: RationalInput,
  mode: "on" | "off",
  dynamic: Dynamic = "normal",
): GrooveDocument {
  let a = q(requireOnGrid(doc, from));
  let b = q(requireOnGrid(doc, to));
  if (a.compare(b) > 0) [a, b] = [b, a];
  const step = q(doc.grid.step);
  return withLane(doc, piece, (hits) => {
    const inRun = (h: KitHit) => q(h.at).compare(a) >= 0 && q(h.at).compare(b) <= 0;
    if (mode === "off") {
      const kept = hits.filter((h) => !inRun(h));
      return kept.length === hits.length ? hits : kept;
    }
    const have = new Map(hits.map((h) => [h.at, h] as const));
    const added: KitHit[] = [];
    for (let p = a; p.compare(b) <= 0; p = p.add(step)) {
      const key = fmt(p);
      if (!have.has(key)) added.push({ at: key, dynamic });
    }
    return added.length === 0 ? hits : [...hits, ...added].sort(byAt);
  });
}

// ---------------------------------------------------------------------------------------------------------------
// Lanes

/**
 * Add an empty row for a kit piece, in the editor's row order. No change when it is there already.
 * @example addLane(doc, "ride")
 */
export function addLane(doc: GrooveDocument, piece: KitPieceId): GrooveDocument {
  if (!(piece in KIT_PIECES)) throw new RhythmError(`unknown kit piece "${piece}"`);
  if (doc.kit.lanes.some((l) => l.piece === piece)) return doc;
  const rank = (p: KitPieceId) => KIT_ROW_ORDER.indexOf(p);
  const lanes = [...doc.kit.lanes];
  let i = lanes.findIndex((l) => rank(l.piece) > rank(piece));
  if (i === -1) i = lanes.length;
  lanes.splice(i, 0, { piece, hits: [] });
  return { ...doc, kit: { ...doc.kit, lanes } };
}

/**
 * Remove a kit row; its hits are reported in `dropped`.
 * @example removeLane(doc, "snare").dropped.map((d) => d.where) // ["bar 1, beat 2", …]
 */
export function removeLane(doc: GrooveDocument, piece: KitPieceId): EditResult {
  const lane = doc.kit.lanes.find((l) => l.piece === piece);
  if (!lane) return { doc, dropped: [], adjusted: [] };
  const name = KIT_PIECES[piece].name;
  return {
    doc: { ...doc, kit: { ...doc.kit, lanes: doc.kit.lanes.filter((l) => l !== lane) } },
    dropped: lane.hits.map((h) => dropHit(doc, piece, h, `the ${name} row was removed`)),
    adjusted: [],
  };
}

function dropHit(doc: GrooveDocument, piece: KitPieceId, h: KitHit, reason: string): DroppedHit {
  return {
    kind: "hit",
    piece,
    at: h.at,
    dynamic: h.dynamic,
    ...(h.articulation ? { articulation: h.articulation } : {}),
    where: describeAt(doc, h.at),
    reason,
  };
}

function dropNote(doc: GrooveDocument, n: KeyNote, reason: string): DroppedNote {
  return { kind: "note", pitch: n.pitch, at: n.at, duration: n.duration, where: describeAt(doc, n.at), reason };
}

// ---------------------------------------------------------------------------------------------------------------
// Keys notes

/**
 * The note of `pitch` sounding at `at` (started there or held through it), if any.
 * @example keyNoteAt(doc, 60, "1/4") // the middle C struck at 0 and held for a half note
 */
export function keyNoteAt(doc: GrooveDocument, pitch: number, at: RationalInput): KeyNote | undefined {
  const pos = q(at);
  return doc.keys.notes.find(
    (n) => n.pitch === pitch && q(n.at).compare(pos) <= 0 && q(n.at).add(q(n.duration)).compare(pos) > 0,
  );
}

/** Where the next note of the same pitch starts after `at`, or the groove's end. */
function nextStartOrEnd(doc: GrooveDocument, pitch: number, at: Fraction, ignore?: KeyNote): Fraction {
  let limit = grooveLength(doc);
  for (const n of doc.keys.notes) {
    if (n === ignore || n.pitch !== pitch) continue;
    const s = q(n.at);
    if (s.compare(at) > 0 && s.compare(limit) < 0) limit = s;
  }
  return limit;
}

function snapDuration(doc: GrooveDocument, duration: Fraction, max: Fraction): Fraction {
  const step = q(doc.grid.step);
  let steps = duration.div(step).floor();
  if (steps.compare(1) < 0) steps = new Fraction(1);
  const maxSteps = max.div(step).floor();
  if (steps.compare(maxSteps) > 0) steps = maxSteps;
  return step.mul(steps);
}

/**
 * Add a keys note. Chords stack: other pitches at the same step are kept. A same-pitch note still
 * sounding at `at` is shortened to end there; the new note stops before the next same-pitch note.
 * @example addKeyNote(doc, { at: "0", pitch: 60, duration: "1/4" })
 */
export function addKeyNote(
  doc: GrooveDocument,
  note: { at: RationalInput; pitch: number; duration?: RationalInput; velocity?: number },
): GrooveDocument {
  const at = q(requireOnGrid(doc, note.at));
  const atKey = fmt(at);
  if (!Number.isInteger(note.pitch) || note.pitch < 0 || note.pitch > 127)
    throw new RhythmError(`pitch ${note.pitch} is not a MIDI note number (0–127)`);
  const kept: KeyNote[] = [];
  for (const n of doc.keys.notes) {
    if (n.pitch !== note.pitch) kept.push(n);
    else if (n.at === atKey) continue; // replaced
    else {
      const s = q(n.at);
      const e = s.add(q(n.duration));
      kept.push(s.compare(at) < 0 && e.compare(at) > 0 ? { ...n, duration: fmt(at.sub(s)) } : n);
    }
  }
  const base = { ...doc, keys: { ...doc.keys, notes: kept } };
  const limit = nextStartOrEnd(base, note.pitch, at).sub(at);
  const duration = snapDuration(doc, q(note.duration ?? doc.grid.step), limit);
  const added: KeyNote = { at: atKey, duration: fmt(duration), pitch: note.pitch, velocity: note.velocity ?? DEFAULT_KEY_VELOCITY };
  return { ...doc, keys: { ...doc.keys, notes: sortNotes([...kept, added]) } };
}

/**
 * Change a note's length (snapped to the grid, at least one step, never past the next same-pitch note
 * or the groove's end).
 * @example resizeKeyNote(doc, "0", 60, "3/8")
 */
export function resizeKeyNote(doc: GrooveDocument, at: RationalInput, pitch: number, duration: RationalInput): GrooveDocument {
  const key = fmt(at);
  const i = doc.keys.notes.findIndex((n) => n.at === key && n.pitch === pitch);
  if (i === -1) throw new RhythmError(`no note of pitch ${pitch} starts at ${key}`);
  const note = doc.keys.notes[i]!;
  const start = q(key);
  const d = fmt(snapDuration(doc, q(duration), nextStartOrEnd(doc, pitch, start, note).sub(start)));
  if (d === note.duration) return doc;
  const notes = doc.keys.notes.slice();
  notes[i] = { ...note, duration: d };
  return { ...doc, keys: { ...doc.keys, notes } };
}

/**
 * Set the velocity (1–127, MIDI note-on velocity) of the note of `pitch` that starts at `at`.
 * @example setKeyNoteVelocity(doc, "0", 60, 40) // a soft middle C
 */
export function setKeyNoteVelocity(doc: GrooveDocument, at: RationalInput, pitch: number, velocity: number): GrooveDocument {
  if (!Number.isInteger(velocity) || velocity < 1 || velocity > 127) throw new RhythmError(`velocity ${velocity} is not from 1 to 127`);
  const key = fmt(at);
  const i = doc.keys.notes.findIndex((n) => n.at === key && n.pitch === pitch);
  if (i === -1) throw new RhythmError(`no note of pitch ${pitch} starts at ${key}`);
  if (doc.keys.notes[i]!.velocity === velocity) return doc;
  const notes = doc.keys.notes.slice();
  notes[i] = { ...notes[i]!, velocity };
  return { ...doc, keys: { ...doc.keys, notes } };
}

/**
 * Remove the note of `pitch` that starts at `at` (no change when there is none).
 * @example removeKeyNote(doc, "0", 60)
 */
export function removeKeyNote(doc: GrooveDocument, at: RationalInput, pitch: number): GrooveDocument {
  const key = fmt(at);
  const notes = doc.keys.notes.filter((n) => !(n.at === key && n.pitch === pitch));
  return notes.length === doc.keys.notes.length ? doc : { ...doc, keys: { ...doc.keys, notes } };
}

// ---------------------------------------------------------------------------------------------------------------
// Bars

function requireBarRange(doc: GrooveDocument, start: number, count: number): void {
  if (!Number.isInteger(start) || !Number.isInteger(count) || count < 1 || start < 0 || start + count > doc.bars)
    throw new RhythmError(`bars ${start + 1}–${start + count} are not inside a ${doc.bars}-bar groove`);
}

function requireBarLimit(bars: number): void {
  if (bars > LIMITS.maxBars) throw new RhythmError(`a groove has at most ${LIMITS.maxBars} bars`);
}

/** Sections after inserting `count` bars before bar `index`: the section holding the point grows. */
function sectionsAfterInsert(doc: GrooveDocument, index: number, count: number): Section[] {
  if (doc.sections.length === 0) return doc.sections;
  const last = doc.sections.length - 1;
  return doc.sections.map((s, i) => {
    if (index < s.startBar) return { ...s, startBar: s.startBar + count };
    if (index < s.startBar + s.bars || (i === last && index === s.startBar + s.bars)) return { ...s, bars: s.bars + count };
    return s;
  });
}

/** Sections after deleting bars [start, start+count): sections shrink, empty ones disappear. */
function sectionsAfterDelete(doc: GrooveDocument, start: number, count: number): Section[] {
  if (doc.sections.length === 0) return doc.sections;
  const end = start + count;
  const out: Section[] = [];
  let next = 0;
  for (const s of doc.sections) {
    const overlap = Math.max(0, Math.min(end, s.startBar + s.bars) - Math.max(start, s.startBar));
    const bars = s.bars - overlap;
    if (bars > 0) {
      out.push({ ...s, startBar: next, bars });
      next += bars;
    }
  }
  return out;
}

/**
 * Insert `count` empty bars before bar `index` (0-based; `index` = bars appends). Later material moves
 * later; a note held across the insertion point keeps its length.
 * @example insertBar(doc, doc.bars) // one more bar at the end
 */
export function insertBar(doc: GrooveDocument, index: number, count = 1): GrooveDocument {
  if (!Number.isInteger(index) || index < 0 || index > doc.bars || !Number.isInteger(count) || count < 1)
    throw new RhythmError(`cannot insert ${count} bar${count === 1 ? "" : "s"} before bar ${index + 1}: insert at least one whole bar, before bar 1 to bar ${doc.bars + 1}`);
  requireBarLimit(doc.bars + count);
  const bar = barLength(doc.meter);
  const point = bar.mul(index);
  const shift = bar.mul(count);
  const move = <T extends { at: Rational }>(x: T): T => (q(x.at).compare(point) >= 0 ? { ...x, at: fmt(q(x.at).add(shift)) } : x);
  return {
    ...doc,
    bars: doc.bars + count,
    sections: sectionsAfterInsert(doc, index, count),
    kit: { ...doc.kit, lanes: doc.kit.lanes.map((l) => ({ ...l, hits: l.hits.map(move) })) },
    keys: { ...doc.keys, notes: doc.keys.notes.map((n) => untie(move(n))) },
  };
}

/**
 * Delete bars [start, start+count). Their hits and notes are reported in `dropped`; notes held into the
 * deleted bars are cut at its start (reported in `adjusted`). At least one bar remains.
 * @example deleteBar(doc, 1) // remove bar 2
 */
export function deleteBar(doc: GrooveDocument, start: number, count = 1): EditResult {
  requireBarRange(doc, start, count);
  if (count >= doc.bars) throw new RhythmError("a groove keeps at least one bar");
  const bar = barLength(doc.meter);
  const from = bar.mul(start);
  const to = bar.mul(start + count);
  const shift = bar.mul(count);
  const dropped: DroppedItem[] = [];
  const adjusted: AdjustedNote[] = [];
  const reason = count === 1 ? `bar ${start + 1} was deleted` : `bars ${start + 1}–${start + count} were deleted`;
  const inside = (p: Fraction) => p.compare(from) >= 0 && p.compare(to) < 0;
  const lanes: KitLane[] = doc.kit.lanes.map((l) => {
    const hits: KitHit[] = [];
    for (const h of l.hits) {
      const p = q(h.at);
      if (inside(p)) dropped.push(dropHit(doc, l.piece, h, reason));
      else hits.push(p.compare(to) >= 0 ? { ...h, at: fmt(p.sub(shift)) } : h);
    }
    return { ...l, hits };
  });
  const notes: KeyNote[] = [];
  for (const n of doc.keys.notes) {
    const p = q(n.at);
    if (inside(p)) {
      dropped.push(dropNote(doc, n, reason));
      continue;
    }
    if (p.compare(to) >= 0) {
      notes.push({ ...n, at: fmt(p.sub(shift)) });
      continue;
    }
    const end = p.add(q(n.duration));
    if (end.compare(from) > 0) {
      const d = fmt(from.sub(p));
      adjusted.push({ pitch: n.pitch, at: n.at, from: n.duration, to: d, reason: `it was held into ${reason.replace(/ (was|were) deleted$/, "")}` });
      notes.push({ ...n, duration: d });
    } else notes.push(n);
  }
  return {
    doc: {
      ...doc,
      bars: doc.bars - count,
      sections: sectionsAfterDelete(doc, start, count),
      kit: { ...doc.kit, lanes },
      keys: { ...doc.keys, notes: sortNotes(notes) },
    },
    dropped,
    adjusted,
  };
}

/**
 * Copy bars [start, start+count) into a clip (positions relative to the first copied bar). Notes held
 * past the range are cut at its end.
 * @example pasteBars(doc, copyBars(doc, 0), 1)
 */
export function copyBars(doc: GrooveDocument, start: number, count = 1): BarClip {
  requireBarRange(doc, start, count);
  const bar = barLength(doc.meter);
  const from = bar.mul(start);
  const to = bar.mul(start + count);
  const inside = (p: Fraction) => p.compare(from) >= 0 && p.compare(to) < 0;
  return {
    meter: doc.meter,
    step: doc.grid.step,
    bars: count,
    lanes: doc.kit.lanes.map((l) => ({
      piece: l.piece,
      hits: l.hits.filter((h) => inside(q(h.at))).map((h) => ({ ...h, at: fmt(q(h.at).sub(from)) })),
    })),
    notes: doc.keys.notes
      .filter((n) => inside(q(n.at)))
      .map((n) => {
        const p = q(n.at);
        const held = p.add(q(n.duration));
        const end = held.compare(to) > 0 ? to : held;
        return { ...n, at: fmt(p.sub(from)), duration: fmt(end.sub(p)) };
      }),
  };
}

/** Reason given for material replaced by a paste (so a UI can tell replaced from misfit). */
export const PASTED_OVER = "it was pasted over";

/**
 * Paste a clip over the bars starting at `atBar`, replacing what they held (the groove grows when the clip
 * runs past its end). Each clip bar lands on one target bar at the same offset; material that does not fit
 * the target meter or grid is reported in `dropped`, and replaced material too.
 * @example pasteBars(doc, clip, 4)
 */
export function pasteBars(doc: GrooveDocument, clip: BarClip, atBar: number): EditResult {
  if (!Number.isInteger(atBar) || atBar < 0 || atBar > doc.bars) throw new RhythmError(`cannot paste at bar ${atBar + 1}: paste at bar 1 to bar ${doc.bars + 1}`);
  requireBarLimit(atBar + clip.bars);
  let base = doc;
  if (atBar + clip.bars > doc.bars) base = insertBar(doc, doc.bars, atBar + clip.bars - doc.bars);
  const bar = barLength(base.meter);
  const clipBar = barLength(clip.meter);
  const step = q(base.grid.step);
  const from = bar.mul(atBar);
  const to = bar.mul(atBar + clip.bars);
  const dropped: DroppedItem[] = [];
  const adjusted: AdjustedNote[] = [];
  const inside = (p: Fraction) => p.compare(from) >= 0 && p.compare(to) < 0;
  const replaced = PASTED_OVER;
  const clipWhere = (p: Fraction) => {
    const i = Number(p.div(clipBar).floor().valueOf());
    return `copied bar ${i + 1}, ${describeAt(clip, p.sub(clipBar.mul(i))).replace(/^bar 1, /, "")}`;
  };
  /** Target position of a clip offset, or a reason it cannot land. */
  const land = (off: Fraction): Fraction | string => {
    const i = Number(off.div(clipBar).floor().valueOf());
    const inBar = off.sub(clipBar.mul(i));
    if (inBar.compare(bar) >= 0) return `it lies beyond the end of a ${base.meter.beatsPerBar}/${base.meter.beatUnit} bar`;
    if (inBar.div(step).d !== 1n) return `it is not on the ${base.grid.step} grid`;
    return from.add(bar.mul(i)).add(inBar);
  };

  const cleared = base.kit.lanes.map((l) => {
    const kept: KitHit[] = [];
    for (const h of l.hits) {
      if (inside(q(h.at))) dropped.push(dropHit(base, l.piece, h, replaced));
      else kept.push(h);
    }
    return kept.length === l.hits.length ? l : { ...l, hits: kept };
  });
  let out: GrooveDocument = { ...base, kit: { ...base.kit, lanes: cleared } };
  for (const cl of clip.lanes) {
    const add: KitHit[] = [];
    for (const h of cl.hits) {
      const t = land(q(h.at));
      if (typeof t !== "string") add.push({ ...h, at: fmt(t) });
      else
        dropped.push({
          kind: "hit",
          piece: cl.piece,
          at: h.at,
          dynamic: h.dynamic,
          ...(h.articulation ? { articulation: h.articulation } : {}),
          where: clipWhere(q(h.at)),
          reason: t,
        });
    }
    if (add.length > 0) out = withLane(out, cl.piece, (hits) => [...hits, ...add].sort(byAt));
  }

  const notes: KeyNote[] = [];
  for (const n of base.keys.notes) {
    const p = q(n.at);
    if (inside(p)) {
      dropped.push(dropNote(base, n, replaced));
      continue;
    }
    const end = p.add(q(n.duration));
    if (p.compare(from) < 0 && end.compare(from) > 0) {
      const d = fmt(from.sub(p));
      adjusted.push({ pitch: n.pitch, at: n.at, from: n.duration, to: d, reason: "it was held into the pasted bars" });
      notes.push({ ...n, duration: d });
    } else notes.push(n);
  }
  const total = grooveLength(base);
  for (const n of clip.notes) {
    const t = land(q(n.at));
    if (typeof t === "string") {
      dropped.push({ kind: "note", pitch: n.pitch, at: n.at, duration: n.duration, where: clipWhere(q(n.at)), reason: t });
      continue;
    }
    let d = q(n.duration);
    if (t.add(d).compare(total) > 0) d = total.sub(t);
    const snapped = d.div(step).d === 1n ? d : snapDuration(base, d, total.sub(t));
    if (!snapped.equals(q(n.duration)))
      adjusted.push({ pitch: n.pitch, at: fmt(t), from: n.duration, to: fmt(snapped), reason: "its length did not fit the target bars or grid" });
    notes.push({ ...n, at: fmt(t), duration: fmt(snapped) });
  }
  return { doc: { ...out, keys: { ...base.keys, notes: sortNotes(notes) } }, dropped, adjusted };
}

/**
 * Repeat bars [start, start+count) right after themselves. The copies join the section of the last copied
 * bar (not the section after it, which an insertion at a section's first bar would grow).
 * @example duplicateBar(doc, 0) // bar 1 twice
 */
export function duplicateBar(doc: GrooveDocument, start: number, count = 1): GrooveDocument {
  requireBarRange(doc, start, count);
  const clip = copyBars(doc, start, count);
  const opened = insertBar(doc, start + count, count);
  const out = pasteBars(opened, clip, start + count).doc;
  return doc.sections.length === 0 ? out : { ...out, sections: sectionsAfterInsert(doc, start + count - 1, count) };
}

// ---------------------------------------------------------------------------------------------------------------
// Meter, grid, tempo, swing

function finish(doc: GrooveDocument, dropped: DroppedItem[], adjusted: AdjustedNote[]): EditResult {
  const r = parseGroove(doc);
  if (!r.ok) throw new RhythmError(r.issues.map((i) => i.message).join("; "), r.issues);
  return { doc: r.doc, dropped, adjusted };
}

/**
 * Change the meter of every bar. Each hit keeps its bar and its offset inside the bar (so 4/4 → 3/4 loses
 * beat 4, reported); notes held past the new end are shortened. Tempo is left as it is. Throws when the
 * current grid does not divide the new bar (change the grid first).
 * @example changeMeter(doc, { beatsPerBar: 3, beatUnit: 4 })
 */
export function changeMeter(doc: GrooveDocument, meter: Meter): EditResult {
  const oldBar = barLength(doc.meter);
  const newBar = barLength(meter);
  const step = q(doc.grid.step);
  if (newBar.div(step).d !== 1n)
    throw new RhythmError(`the ${doc.grid.step} grid does not divide a ${meter.beatsPerBar}/${meter.beatUnit} bar: choose another grid first`);
  const next: GrooveDocument = { ...doc, meter: meter.grouping ? meter : { beatsPerBar: meter.beatsPerBar, beatUnit: meter.beatUnit } };
  const dropped: DroppedItem[] = [];
  const adjusted: AdjustedNote[] = [];
  const reason = `it lies beyond the end of a ${meter.beatsPerBar}/${meter.beatUnit} bar`;
  const map = (at: Rational): Fraction | null => {
    const p = q(at);
    const i = p.div(oldBar).floor();
    const off = p.sub(oldBar.mul(i));
    return off.compare(newBar) >= 0 ? null : newBar.mul(i).add(off);
  };
  const lanes = doc.kit.lanes.map((l) => {
    const hits: KitHit[] = [];
    for (const h of l.hits) {
      const t = map(h.at);
      if (t === null) dropped.push(dropHit(doc, l.piece, h, reason));
      else hits.push({ ...h, at: fmt(t) });
    }
    return { ...l, hits };
  });
  const total = grooveLength(next);
  const notes: KeyNote[] = [];
  for (const n of doc.keys.notes) {
    const t = map(n.at);
    if (t === null) {
      dropped.push(dropNote(doc, n, reason));
      continue;
    }
    let d = q(n.duration);
    if (t.add(d).compare(total) > 0) {
      d = total.sub(t);
      adjusted.push({ pitch: n.pitch, at: fmt(t), from: n.duration, to: fmt(d), reason: "it ran past the end of the groove" });
    }
    notes.push({ ...n, at: fmt(t), duration: fmt(d) });
  }
  return finish({ ...next, kit: { ...doc.kit, lanes }, keys: { ...doc.keys, notes: sortNotes(notes) } }, dropped, adjusted);
}

/**
 * Change the grid step ("1/16", "1/12" for eighth-note triplets…). Hits on the new grid stay; the others
 * are reported. Notes that start off the new grid are reported; lengths are snapped to whole steps.
 * @example changeGrid(doc, "1/12").dropped // the sixteenths that are not on the triplet grid
 */
export function changeGrid(doc: GrooveDocument, step: RationalInput): EditResult {
  const s = q(step);
  if (s.compare(0) <= 0) throw new RhythmError("a grid step must be greater than 0");
  const bar = barLength(doc.meter);
  if (bar.div(s).d !== 1n)
    throw new RhythmError(`a grid step of ${fmt(s)} does not divide a ${doc.meter.beatsPerBar}/${doc.meter.beatUnit} bar`);
  const next: GrooveDocument = { ...doc, grid: { step: fmt(s) } };
  const onGrid = (at: Rational) => q(at).div(s).d === 1n;
  const reason = `it is not on the new ${fmt(s)} grid`;
  const dropped: DroppedItem[] = [];
  const adjusted: AdjustedNote[] = [];
  const lanes = doc.kit.lanes.map((l) => {
    if (l.hits.every((h) => onGrid(h.at))) return l;
    return {
      ...l,
      hits: l.hits.filter((h) => {
        if (onGrid(h.at)) return true;
        dropped.push(dropHit(doc, l.piece, h, reason));
        return false;
      }),
    };
  });
  const total = grooveLength(doc);
  const notes: KeyNote[] = [];
  for (const n of doc.keys.notes) {
    if (!onGrid(n.at)) {
      dropped.push(dropNote(doc, n, reason));
      continue;
    }
    const d = q(n.duration);
    if (d.div(s).d === 1n) {
      notes.push(n);
      continue;
    }
    // Round to the nearest whole number of steps (at least one, never past the end).
    let steps = d.div(s).round();
    if (steps.compare(1) < 0) steps = new Fraction(1);
    let nd = s.mul(steps);
    const room = total.sub(q(n.at));
    if (nd.compare(room) > 0) nd = room.div(s).floor().mul(s);
    adjusted.push({ pitch: n.pitch, at: n.at, from: n.duration, to: fmt(nd), reason: `its length is not a whole number of ${fmt(s)} steps` });
    notes.push({ ...n, duration: fmt(nd) });
  }
  return finish({ ...next, kit: { ...doc.kit, lanes }, keys: { ...doc.keys, notes } }, dropped, adjusted);
}

/**
 * Change tempo (bpm and/or the note value that carries the beat). Positions are note values, so nothing moves.
 * @example changeTempo(doc, { bpm: "120" })
 */
export function changeTempo(doc: GrooveDocument, tempo: { bpm?: RationalInput; beatNote?: RationalInput }): EditResult {
  const next: Tempo = {
    bpm: tempo.bpm === undefined ? doc.tempo.bpm : fmt(tempo.bpm),
    beatNote: tempo.beatNote === undefined ? doc.tempo.beatNote : fmt(tempo.beatNote),
  };
  const bpm = q(next.bpm).valueOf();
  if (!tempoInRange(bpm))
    throw new RhythmError(`tempo ${bpm} bpm is outside ${LIMITS.minBpm}–${LIMITS.maxBpm}`);
  if (q(next.beatNote).compare(0) <= 0) throw new RhythmError("the beat note must be greater than 0");
  return { doc: { ...doc, tempo: next }, dropped: [], adjusted: [] };
}

/**
 * Change swing (unit and ratio, 0.5 = straight … 0.75). Swing moves sound, not positions: nothing is lost.
 * @example changeSwing(doc, { unit: "1/8", ratio: 2 / 3 })
 */
export function changeSwing(doc: GrooveDocument, swing: Partial<Swing>): EditResult {
  const next: Swing = { unit: swing.unit === undefined ? doc.swing.unit : fmt(swing.unit), ratio: swing.ratio ?? doc.swing.ratio };
  if (!(next.ratio >= 0.5 && next.ratio <= 0.75)) throw new RhythmError("swing must be between 0.5 (straight) and 0.75");
  if (q(next.unit).compare(0) <= 0) throw new RhythmError("the swing unit must be greater than 0");
  return { doc: { ...doc, swing: next }, dropped: [], adjusted: [] };
}

/**
 * One line per lost item, for a notice.
 * @example describeDropped(changeMeter(doc, { beatsPerBar: 3, beatUnit: 4 }).dropped[0]) // "Snare (accent), bar 1, beat 4: it lies beyond the end of a 3/4 bar"
 */
export function describeDropped(item: DroppedItem, noteName: (pitch: number) => string = String): string {
  if (item.kind === "hit") {
    const extra = [item.dynamic !== "normal" ? item.dynamic : null, item.articulation ?? null].filter(Boolean).join(", ");
    return `${KIT_PIECES[item.piece].name}${extra ? ` (${extra})` : ""}, ${item.where}: ${item.reason}`;
  }
  return `Keys ${noteName(item.pitch)}, ${item.where}: ${item.reason}`;
}
