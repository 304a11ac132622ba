/**
 * Displace: move all the written material by a number of grid steps, forwards or backwards
 * (an eighth note is the everyday case), so the same sound is written with the beat elsewhere.
 */
import { barLength, LIMITS, RhythmError, type GrooveDocument, type KeyNote, type KitHit, type Section } from "../document";
import { KIT_PIECE_INDEX, type KitPieceId } from "../kit";
import { q, type Rational, type RationalInput } from "../rational";
import { shiftKeepsSwing, swingPair } from "../swing";
import { mod, TickCodec, ticksOf } from "../ticks";
import { valueWords } from "../describe-position";
import { checkBars } from "./common";

/**
 * - "rotate": the groove is a loop; material moved past its end comes back at its start.
 * - "pad": song form; whole bars are added before (a pickup bar of rests) or after, so nothing is lost.
 * - "trim": song form; material moved outside the groove is dropped and reported.
 */
export type DisplaceMode = "rotate" | "pad" | "trim";

/** What a "trim" displacement left out, at the positions it had before the move. */
export interface DroppedMaterial {
  hits: { piece: KitPieceId; at: Rational; dynamic: KitHit["dynamic"] }[];
  /** `kept` is the part of the note that stayed (absent when the whole note was dropped). */
  notes: { pitch: number; at: Rational; duration: Rational; kept?: Rational }[];
}

export interface DisplaceReport {
  doc: GrooveDocument;
  dropped: DroppedMaterial;
  /** Bars added by "pad" before and after the material. */
  addedBars: { before: number; after: number };
  /** True when repeated sections were written out because the moved material no longer lines up with them. */
  repeatsWrittenOut: boolean;
}

/**
 * Move every hit and note by `by` whole notes (positive = later). `by` must be a whole number of grid steps.
 * See `displaceWithReport` for the modes and what they guarantee.
 * @example displace(doc, "1/8") // rotate a loop an eighth later
 * @example displace(doc, "-1/8", "pad") // start an eighth earlier, adding a pickup bar
 */
export function displace(doc: GrooveDocument, by: RationalInput, mode: DisplaceMode = "rotate"): GrooveDocument {
  return displaceWithReport(doc, by, mode).doc;
}

/**
 * Displace and report what was added or dropped.
 *
 * "rotate" needs a loop (no sections, or a single section). Positions wrap modulo the groove length. A keys
 * note that now runs past the end is split at the seam into a note ending at the end and a note at 0 marked
 * `tiedFromEnd`; a rotation first joins such marked pairs back into one held note, so the split happens only
 * where a rotation put it and `displace(displace(d, x), -x)` deep-equals `d` (for a normalised `d`).
 *
 * "pad" and "trim" shift the timeline: their schedule equals the original's moved by `by` (pad: plus the
 * pickup bars), apart from what "trim" reports as dropped. Sections that repeat are written out first
 * (`writeOutRepeats`), since moved material crosses their boundaries. A pickup bar becomes a "Pickup" section
 * when the groove has sections; bars added at the end join the last section.
 *
 * Throws a RhythmError when `by` is not on the grid (see `setGrid` to refine it first), when swing would
 * change (with swing on, `by` must be a whole number of swing pairs and the pairs must tile the bar), when
 * "rotate" meets a song form, or when a rotation would start two notes of the same pitch at one place
 * (only possible when notes of one pitch overlap). "trim" resolves that case by keeping the longer note.
 *
 * The output is normalised (hits and notes sorted as `normalizeGroove` does).
 * @example displaceWithReport(song, "-1/8", "pad").addedBars // { before: 1, after: 0 }: a pickup bar
 */
export function displaceWithReport(doc: GrooveDocument, by: RationalInput, mode: DisplaceMode = "rotate"): DisplaceReport {
  const shift = q(by);
  const codec = new TickCodec(doc.grid.step);
  const x = ticksOf(shift, doc.grid.step, `displacement by ${shift.toFraction()}`);
  if (!shiftKeepsSwing(doc.swing, doc.meter, shift))
    throw new RhythmError(
      `with ${doc.swing.unit} swing, displacing by ${valueWords(shift)} moves notes onto other parts of their swing pairs and changes the sound; displace by a multiple of ${swingPair(doc.swing).toFraction()} or make the groove straight first`,
    );
  if (mode === "rotate") {
    if (doc.sections.length > 1)
      throw new RhythmError(`rotation applies to a loop, but this groove has ${doc.sections.length} sections; displace it with a pickup bar ("pad") or a trimmed end ("trim")`);
    return { doc: rotate(doc, x, codec), dropped: { hits: [], notes: [] }, addedBars: { before: 0, after: 0 }, repeatsWrittenOut: false };
  }
  const repeats = doc.sections.some((s) => s.repeats > 1);
  const flat = repeats ? writeOutRepeats(doc) : doc;
  return { ...shiftTimeline(flat, x, codec, mode), repeatsWrittenOut: repeats };
}

interface TickNote {
  s: number;
  d: number;
  note: KeyNote;
}

function sortNotes(notes: TickNote[]): TickNote[] {
  return notes.sort((a, b) => a.s - b.s || a.note.pitch - b.note.pitch);
}

function emitNotes(notes: TickNote[], codec: TickCodec, what: string): KeyNote[] {
  sortNotes(notes);
  for (let i = 1; i < notes.length; i++)
    if (notes[i]!.s === notes[i - 1]!.s && notes[i]!.note.pitch === notes[i - 1]!.note.pitch)
      throw new RhythmError(`${what} would start two notes of pitch ${notes[i]!.note.pitch} at ${codec.fromTicks(notes[i]!.s)}`);
  return notes.map((n) => {
    const out: KeyNote = { ...n.note, at: codec.fromTicks(n.s), duration: codec.fromTicks(n.d) };
    if (out.tiedFromEnd === undefined || (out.tiedFromEnd && n.s !== 0)) delete out.tiedFromEnd;
    return out;
  });
}

function rotate(doc: GrooveDocument, x: number, codec: TickCodec): GrooveDocument {
  const total = ticksOf(barLength(doc.meter).mul(doc.bars), doc.grid.step, "groove length");
  const r = mod(x, total);
  const lanes = doc.kit.lanes.map((lane) => ({
    ...lane,
    hits: lane.hits
      .map((h) => ({ t: mod(codec.toTicks(h.at) + r, total), h }))
      .sort((a, b) => a.t - b.t)
      .map(({ t, h }) => ({ ...h, at: codec.fromTicks(t) })),
  }));

  // Join pieces a previous rotation split: a note at 0 marked tiedFromEnd and its partner ending at the end.
  const notes: TickNote[] = doc.keys.notes.map((note) => ({ s: codec.toTicks(note.at), d: codec.toTicks(note.duration, "duration"), note }));
  const endingAtEnd = new Map<string, TickNote[]>();
  for (const n of notes) if (n.s > 0 && n.s + n.d === total) {
    const key = `${n.note.pitch}|${n.note.velocity}`;
    endingAtEnd.set(key, [...(endingAtEnd.get(key) ?? []), n]);
  }
  const joined: TickNote[] = [];
  const consumed = new Set<TickNote>();
  for (const n of notes) {
    if (!(n.note.tiedFromEnd && n.s === 0)) continue;
    const partners = endingAtEnd.get(`${n.note.pitch}|${n.note.velocity}`);
    const partner = partners?.find((p) => !consumed.has(p) && p.d + n.d <= total);
    if (!partner) continue;
    consumed.add(partner);
    consumed.add(n);
    joined.push({ s: partner.s, d: partner.d + n.d, note: partner.note });
  }
  const whole = [...notes.filter((n) => !consumed.has(n)), ...joined];

  const out: TickNote[] = [];
  for (const n of whole) {
    const s = mod(n.s + r, total);
    const note = n.note.tiedFromEnd && s !== 0 ? { ...n.note, tiedFromEnd: undefined } : n.note;
    if (s + n.d <= total) out.push({ s, d: n.d, note });
    else {
      out.push({ s, d: total - s, note: { ...note, tiedFromEnd: undefined } });
      out.push({ s: 0, d: s + n.d - total, note: { ...note, tiedFromEnd: true } });
    }
  }
  return {
    ...doc,
    kit: { lanes },
    keys: { ...doc.keys, notes: emitNotes(out, codec, `rotating by ${codec.fromTicks(x)}`) },
  };
}

function shiftTimeline(doc: GrooveDocument, x: number, codec: TickCodec, mode: "pad" | "trim"): Omit<DisplaceReport, "repeatsWrittenOut"> {
  const barTicks = ticksOf(barLength(doc.meter), doc.grid.step, "bar length");
  const total = barTicks * doc.bars;
  const hits = doc.kit.lanes.map((lane) => lane.hits.map((h) => ({ t: codec.toTicks(h.at), h })));
  const notes: TickNote[] = doc.keys.notes.map((note) => ({ s: codec.toTicks(note.at), d: codec.toTicks(note.duration, "duration"), note }));
  const dropped: DroppedMaterial = { hits: [], notes: [] };
  let before = 0;
  let after = 0;
  let shift = x;

  if (mode === "pad") {
    let first = Infinity;
    let last = -Infinity; // first free tick needed after the material
    for (const lane of hits) for (const { t } of lane) { first = Math.min(first, t); last = Math.max(last, t + 1); }
    for (const n of notes) { first = Math.min(first, n.s); last = Math.max(last, n.s + n.d); }
    if (first !== Infinity) {
      if (first + x < 0) before = Math.ceil(-(first + x) / barTicks);
      shift = x + before * barTicks;
      if (last + shift > total + before * barTicks) after = Math.ceil((last + shift - total - before * barTicks) / barTicks);
    }
  }
  const bars = doc.bars + before + after;
  checkBars(bars, `displacing by ${codec.fromTicks(x)}`);
  const newTotal = bars * barTicks;

  const lanes = doc.kit.lanes.map((lane, li) => ({
    ...lane,
    hits: hits[li]!.flatMap(({ t, h }) => {
      const s = t + shift;
      if (s >= 0 && s < newTotal) return [{ ...h, at: codec.fromTicks(s) }];
      dropped.hits.push({ piece: lane.piece, at: h.at, dynamic: h.dynamic });
      return [];
    }),
  }));
  const out: TickNote[] = [];
  for (const n of notes) {
    const s = n.s + shift;
    const e = s + n.d;
    const from = Math.max(s, 0);
    const to = Math.min(e, newTotal);
    if (to <= from) {
      dropped.notes.push({ pitch: n.note.pitch, at: n.note.at, duration: n.note.duration });
      continue;
    }
    if (from !== s || to !== e)
      dropped.notes.push({ pitch: n.note.pitch, at: n.note.at, duration: n.note.duration, kept: codec.fromTicks(to - from) });
    out.push({ s: from, d: to - from, note: n.note });
  }
  if (mode === "trim") {
    // Two overlapping notes of one pitch can both be cut back to the start: keep the longer one.
    out.sort((a, b) => a.s - b.s || a.note.pitch - b.note.pitch || b.d - a.d);
    for (let i = out.length - 1; i > 0; i--) {
      const [prev, cur] = [out[i - 1]!, out[i]!];
      if (prev.s !== cur.s || prev.note.pitch !== cur.note.pitch) continue;
      dropped.notes.push({ pitch: cur.note.pitch, at: cur.note.at, duration: cur.note.duration });
      out.splice(i, 1);
    }
  }
  dropped.hits.sort((a, b) => q(a.at).compare(q(b.at)) || (KIT_PIECE_INDEX.get(a.piece) ?? 0) - (KIT_PIECE_INDEX.get(b.piece) ?? 0));

  let sections: Section[] = doc.sections.map((s) => ({ ...s, startBar: s.startBar + before }));
  if (sections.length > 0) {
    if (before > 0) sections = [{ name: "Pickup", startBar: 0, bars: before, repeats: 1 }, ...sections];
    if (after > 0) sections[sections.length - 1] = { ...sections[sections.length - 1]!, bars: sections[sections.length - 1]!.bars + after };
  }
  return {
    doc: {
      ...doc,
      bars,
      sections,
      kit: { lanes },
      keys: { ...doc.keys, notes: emitNotes(out, codec, `displacing by ${codec.fromTicks(x)}`) },
    },
    dropped,
    addedBars: { before, after },
  };
}

/**
 * Write repeated sections out bar by bar, so the groove plays the same with every repeat count 1.
 * Each pass becomes its own section with the same name. Keys notes keep their full length; a `tiedFromEnd`
 * note that continues a note held over a repeat (as the schedule plays it) becomes part of that note.
 * @example writeOutRepeats(doc).sections.every((s) => s.repeats === 1) // true
 */
export function writeOutRepeats(doc: GrooveDocument): GrooveDocument {
  if (!doc.sections.some((s) => s.repeats > 1)) return doc;
  const codec = new TickCodec(doc.grid.step);
  const barTicks = ticksOf(barLength(doc.meter), doc.grid.step, "bar length");
  const sections: Section[] = [];
  const passesOfBar: number[][] = Array.from({ length: doc.bars }, () => []);
  let pass = 0;
  for (const s of doc.sections)
    for (let r = 0; r < s.repeats; r++) {
      sections.push({ name: s.name, startBar: pass, bars: s.bars, repeats: 1 });
      for (let b = 0; b < s.bars; b++) passesOfBar[s.startBar + b]!.push(pass++);
    }
  checkBars(pass, "writing out the repeats");
  const copies = (at: Rational) => passesOfBar[Math.floor(codec.toTicks(at) / barTicks)]!.length;
  for (const lane of doc.kit.lanes)
    if (lane.hits.reduce((a, h) => a + copies(h.at), 0) > LIMITS.maxHitsPerLane)
      throw new RhythmError(`writing out the repeats gives ${lane.piece} more than ${LIMITS.maxHitsPerLane} hits`);
  if (doc.keys.notes.reduce((a, n) => a + copies(n.at), 0) > LIMITS.maxKeyNotes)
    throw new RhythmError(`writing out the repeats gives the keys more than ${LIMITS.maxKeyNotes} notes`);
  const place = (t: number) => passesOfBar[Math.floor(t / barTicks)]!.map((p) => p * barTicks + (t % barTicks));
  return {
    ...doc,
    bars: pass,
    sections,
    kit: {
      lanes: doc.kit.lanes.map((lane) => ({
        ...lane,
        hits: lane.hits
          .flatMap((h) => place(codec.toTicks(h.at)).map((t) => ({ t, h })))
          .sort((a, b) => a.t - b.t)
          .map(({ t, h }) => ({ ...h, at: codec.fromTicks(t) })),
      })),
    },
    keys: {
      ...doc.keys,
      notes: emitNotes(
        joinHeld(doc.keys.notes.flatMap((note) => place(codec.toTicks(note.at)).map((s) => ({ s, d: codec.toTicks(note.duration, "duration"), note })))),
        codec,
        "writing out the repeats",
      ),
    },
  };
}

/** Extend notes held into a copy of a `tiedFromEnd` note instead of sounding the copy again. */
function joinHeld(notes: TickNote[]): TickNote[] {
  const byEnd = new Map<string, TickNote>();
  for (const n of sortNotes(notes)) byEnd.set(`${n.note.pitch}|${n.note.velocity}|${n.s + n.d}`, n);
  const out: TickNote[] = [];
  for (const n of notes) {
    const held = n.note.tiedFromEnd && n.s > 0 ? byEnd.get(`${n.note.pitch}|${n.note.velocity}|${n.s}`) : undefined;
    if (held && held !== n) {
      byEnd.delete(`${held.note.pitch}|${held.note.velocity}|${held.s + held.d}`);
      held.d += n.d;
      byEnd.set(`${held.note.pitch}|${held.note.velocity}|${held.s + held.d}`, held);
    } else out.push(n);
  }
  return out;
}
