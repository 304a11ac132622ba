/**
 * The groove document: the one model of a groove that the editor, the server, the database (jsonb),
 * the exporters and the embed all share. Defined once, here, with zod.
 *
 * Time is exact: every position (`at`) and duration is a rational number of WHOLE NOTES written as a
 * string ("3/16" = three sixteenths), measured from the start of the first bar. Bar k (0-based) starts at
 * k × barLength, where barLength = beatsPerBar / beatUnit whole notes.
 *
 * Validation rejects, naming the field: positions outside the groove, durations ≤ 0, positions or
 * durations off the grid, pitches outside 0–127, unknown kit pieces, grids that do not divide the bar,
 * groupings that do not add up to the bar, and sections that do not tile the bars.
 */
import { z } from "zod";
import { ARTICULATIONS, DYNAMICS, KIT_PIECE_IDS } from "./kit";
import { Fraction, RATIONAL_PATTERN, fmt, q, type Rational } from "./rational";

export const SCHEMA_VERSION = 1 as const;

/** Limits that keep a document a sane size (a 1,000-bar song form with a busy kit still fits). */
export const LIMITS = {
  maxBars: 4096,
  maxBeatsPerBar: 32,
  maxHitsPerLane: 100_000,
  maxKeyNotes: 100_000,
  maxSections: 128,
  maxSectionName: 40,
  maxRepeats: 64,
  minBpm: 10,
  maxBpm: 1000,
} as const;

/** Velocity of a keys note that does not give one (MIDI note-on velocity, a moderate forte). */
export const DEFAULT_KEY_VELOCITY = 90;

/**
 * True when a tempo in bpm is inside the document's limits (LIMITS.minBpm–maxBpm): the one check that
 * validation, tempo edits and renotation share.
 * @example tempoInRange(2000) // false
 */
export function tempoInRange(bpm: number): boolean {
  return bpm >= LIMITS.minBpm && bpm <= LIMITS.maxBpm;
}

const BEAT_UNITS = [1, 2, 4, 8, 16, 32] as const;

// Plain-words messages for the range checks (zod's defaults name a number, not what it means).
const BEATS_MESSAGE = `beats per bar must be from 1 to ${LIMITS.maxBeatsPerBar}`;
const BARS_MESSAGE = `a groove has 1 to ${LIMITS.maxBars} bars`;
const SWING_MESSAGE = "swing must be between 0.5 (straight) and 0.75";
const REPEATS_MESSAGE = `a section plays from 1 to ${LIMITS.maxRepeats} times`;
const VELOCITY_MESSAGE = "velocity must be a whole number from 1 to 127 (MIDI note-on velocity)";
const PITCH_MESSAGE = "pitch must be a MIDI number from 0 to 127";

/** An exact rational: "3/16", "2", or a plain number (decimals are converted exactly: 75.5 → "151/2"). */
const rationalSchema = z
  .union([z.string().regex(RATIONAL_PATTERN, "must be a rational such as 3/16 or 2"), z.number().finite()])
  .transform((v, ctx): Rational => {
    try {
      return fmt(q(v));
    } catch {
      ctx.addIssue({ code: "custom", message: "must be a rational such as 3/16 or 2" });
      return z.NEVER;
    }
  });

const positiveRational = rationalSchema.refine((v) => q(v).s > 0n && q(v).n > 0n, "must be greater than 0");

export const meterSchema = z.object({
  /** Beats in one bar, the time signature's upper number. */
  beatsPerBar: z.number().int("beats per bar must be a whole number").min(1, BEATS_MESSAGE).max(LIMITS.maxBeatsPerBar, BEATS_MESSAGE),
  /** Note value of one beat, the time signature's lower number (4 = quarter). */
  beatUnit: z.union([z.literal(1), z.literal(2), z.literal(4), z.literal(8), z.literal(16), z.literal(32)], {
    message: `beat unit must be one of ${BEAT_UNITS.join(", ")}`,
  }),
  /** How beats are grouped, in beat units, e.g. [3, 3] for 6/8 or [2, 2, 3] for 7/8. Must add up to beatsPerBar. */
  grouping: z
    .array(z.number().int("a beat group must be a whole number of beats").min(1, "a beat group has at least one beat"))
    .max(LIMITS.maxBeatsPerBar, `a grouping has at most ${LIMITS.maxBeatsPerBar} groups`)
    .optional(),
});

const tempoSchema = z.object({
  /** Beats per minute, exact ("75", "151/2"). */
  bpm: positiveRational,
  /** The note value that carries the beat: "1/4" for a quarter, "3/8" for a dotted quarter (6/8). */
  beatNote: positiveRational,
});

const gridSchema = z.object({
  /** The step of the grid in whole notes: "1/16" sixteenths, "1/12" eighth-note triplets, "1/24" sixteenth triplets. */
  step: positiveRational,
});

const swingSchema = z.object({
  /** The note value that is swung in pairs ("1/8" for eighth swing, "1/16" for sixteenth swing). */
  unit: positiveRational,
  /** Share of the pair given to the first note: 0.5 straight, 2/3 triplet swing, at most 0.75. */
  ratio: z.number().min(0.5, SWING_MESSAGE).max(0.75, SWING_MESSAGE),
});

export const sectionSchema = z.object({
  name: z.string().trim().min(1, "a section needs a name").max(LIMITS.maxSectionName, `a section name has at most ${LIMITS.maxSectionName} characters`),
  /** First bar of the section, 0-based. */
  startBar: z.number().int("a section starts on a whole bar").min(0, "a section cannot start before the first bar"),
  bars: z.number().int("a section has a whole number of bars").min(1, "a section has at least one bar"),
  /** How many times the section is played in a row. */
  repeats: z.number().int("repeats must be a whole number").min(1, REPEATS_MESSAGE).max(LIMITS.maxRepeats, REPEATS_MESSAGE),
});

const kitHitSchema = z.object({
  at: rationalSchema,
  dynamic: z.enum(DYNAMICS).default("normal"),
  articulation: z.enum(ARTICULATIONS).optional(),
});

const kitLaneSchema = z.object({
  piece: z.enum(KIT_PIECE_IDS, { message: `unknown kit piece; known pieces: ${KIT_PIECE_IDS.join(", ")}` }),
  hits: z.array(kitHitSchema).max(LIMITS.maxHitsPerLane, `a kit lane has at most ${LIMITS.maxHitsPerLane} hits`),
});

const keyNoteSchema = z.object({
  at: rationalSchema,
  duration: positiveRational,
  /** MIDI note number, 60 = middle C. */
  pitch: z.number().int(PITCH_MESSAGE).min(0, PITCH_MESSAGE).max(127, PITCH_MESSAGE),
  velocity: z.number().int(VELOCITY_MESSAGE).min(1, VELOCITY_MESSAGE).max(127, VELOCITY_MESSAGE).default(DEFAULT_KEY_VELOCITY),
  /**
   * Loops only: this note (at 0) continues the note of the same pitch and velocity that ends where the groove
   * ends, so when the loop repeats they are one note held across the seam. Written by `displace` when a
   * rotation splits a held note; lets the inverse rotation join the two pieces again exactly.
   */
  tiedFromEnd: z.boolean().optional(),
});

const grooveObjectSchema = z.object({
  schemaVersion: z.literal(SCHEMA_VERSION, { message: `schemaVersion must be ${SCHEMA_VERSION}` }),
  meter: meterSchema,
  tempo: tempoSchema,
  grid: gridSchema,
  swing: swingSchema.default({ unit: "1/8", ratio: 0.5 }),
  bars: z.number().int("bars must be a whole number").min(1, BARS_MESSAGE).max(LIMITS.maxBars, BARS_MESSAGE),
  /** Song form. Empty means the whole groove is one loop played once. */
  sections: z.array(sectionSchema).max(LIMITS.maxSections, `a groove has at most ${LIMITS.maxSections} sections`).default([]),
  kit: z.object({ lanes: z.array(kitLaneSchema).max(KIT_PIECE_IDS.length, `the kit has at most ${KIT_PIECE_IDS.length} lanes, one per piece`) }),
  keys: z.object({
    notes: z.array(keyNoteSchema).max(LIMITS.maxKeyNotes, `the keys part has at most ${LIMITS.maxKeyNotes} notes`),
    /** Notes at or above this pitch go on the upper (treble) staff. */
    splitPitch: z.number().int(PITCH_MESSAGE).min(0, PITCH_MESSAGE).max(127, PITCH_MESSAGE).default(60),
  }),
});

/**
 * Whole notes in one bar.
 * @example barLength({ beatsPerBar: 7, beatUnit: 8 }).toFraction() // "7/8"
 */
export function barLength(meter: { beatsPerBar: number; beatUnit: number }): Fraction {
  return new Fraction(meter.beatsPerBar, meter.beatUnit);
}

/**
 * Whole notes in the written groove (bars × bar length; repeats not counted).
 * @example grooveLength({ meter: { beatsPerBar: 4, beatUnit: 4 }, bars: 3 }).toFraction() // "3"
 */
export function grooveLength(doc: Pick<GrooveDocument, "meter" | "bars">): Fraction {
  return barLength(doc.meter).mul(doc.bars);
}

type Ctx = z.core.$RefinementCtx<z.output<typeof grooveObjectSchema>>;

function checkGroove(doc: z.output<typeof grooveObjectSchema>, ctx: Ctx): void {
  const issue = (path: (string | number)[], message: string) => ctx.addIssue({ code: "custom", path, message });
  const bar = barLength(doc.meter);
  const total = bar.mul(doc.bars);
  const step = q(doc.grid.step);

  if (doc.meter.grouping) {
    const sum = doc.meter.grouping.reduce((a, b) => a + b, 0);
    if (sum !== doc.meter.beatsPerBar)
      issue(["meter", "grouping"], `grouping adds up to ${sum}, but the bar has ${doc.meter.beatsPerBar} beats`);
  }
  const bpm = q(doc.tempo.bpm).valueOf();
  if (!tempoInRange(bpm))
    issue(["tempo", "bpm"], `tempo ${bpm} bpm is outside ${LIMITS.minBpm}–${LIMITS.maxBpm}`);
  if (bar.div(step).d !== 1n)
    issue(["grid", "step"], `a grid step of ${doc.grid.step} does not divide a ${doc.meter.beatsPerBar}/${doc.meter.beatUnit} bar`);

  let expectedStart = 0;
  doc.sections.forEach((s, i) => {
    if (s.startBar !== expectedStart)
      issue(["sections", i, "startBar"], `section "${s.name}" starts at bar ${s.startBar + 1}, expected bar ${expectedStart + 1} (sections follow each other)`);
    expectedStart = s.startBar + s.bars;
  });
  if (doc.sections.length > 0 && expectedStart !== doc.bars)
    issue(["sections"], `sections cover ${expectedStart} bars, but the groove has ${doc.bars}`);

  const outside = (at: Fraction) => at.s < 0n && at.n > 0n ? true : at.compare(total) >= 0;
  const seenPieces = new Set<string>();
  doc.kit.lanes.forEach((lane, li) => {
    if (seenPieces.has(lane.piece)) issue(["kit", "lanes", li, "piece"], `kit piece "${lane.piece}" has two lanes`);
    seenPieces.add(lane.piece);
    const seenAt = new Set<string>();
    lane.hits.forEach((hit, hi) => {
      const at = q(hit.at);
      const path = ["kit", "lanes", li, "hits", hi, "at"];
      if (outside(at)) issue(path, `position ${hit.at} is outside the groove (0 to ${fmt(total)} whole notes)`);
      else if (at.div(step).d !== 1n) issue(path, `position ${hit.at} is not on the ${doc.grid.step} grid`);
      if (seenAt.has(hit.at)) issue(path, `${lane.piece} has two hits at ${hit.at}`);
      seenAt.add(hit.at);
    });
  });

  const seenNotes = new Set<string>();
  doc.keys.notes.forEach((n, i) => {
    const at = q(n.at);
    const end = at.add(q(n.duration));
    if (outside(at)) issue(["keys", "notes", i, "at"], `position ${n.at} is outside the groove (0 to ${fmt(total)} whole notes)`);
    else if (at.div(step).d !== 1n) issue(["keys", "notes", i, "at"], `position ${n.at} is not on the ${doc.grid.step} grid`);
    else if (end.compare(total) > 0) issue(["keys", "notes", i, "duration"], `note at ${n.at} lasting ${n.duration} runs past the end of the groove`);
    if (q(n.duration).div(step).d !== 1n) issue(["keys", "notes", i, "duration"], `duration ${n.duration} is not a whole number of ${doc.grid.step} steps`);
    if (n.tiedFromEnd && at.n !== 0n) issue(["keys", "notes", i, "tiedFromEnd"], `only a note at 0 can continue from the end of the groove`);
    const key = `${n.at}|${n.pitch}`;
    if (seenNotes.has(key)) issue(["keys", "notes", i], `two notes of pitch ${n.pitch} start at ${n.at}`);
    seenNotes.add(key);
  });
}

/**
 * The full schema: shape plus the musical checks. Use `parseGroove` unless you need zod composition.
 * The musical checks run only on a document whose shape is valid (they read its rationals as fractions);
 * a malformed one gets the shape issues alone.
 */
export const grooveDocumentSchema = grooveObjectSchema.superRefine(checkGroove, { when: (payload) => payload.issues.length === 0 });

export type GrooveDocument = z.output<typeof grooveObjectSchema>;
/** What producers may send: numbers allowed for rationals, defaults may be omitted. */
export type GrooveDocumentInput = z.input<typeof grooveObjectSchema>;
export type Meter = GrooveDocument["meter"];
export type Tempo = GrooveDocument["tempo"];
export type Swing = GrooveDocument["swing"];
export type Section = GrooveDocument["sections"][number];
export type KitLane = GrooveDocument["kit"]["lanes"][number];
export type KitHit = KitLane["hits"][number];
export type KeyNote = GrooveDocument["keys"]["notes"][number];

export interface DocumentIssue {
  /** Dotted path of the offending field, e.g. "kit.lanes.0.hits.3.at". */
  path: string;
  message: string;
}

export type ParseResult = { ok: true; doc: GrooveDocument } | { ok: false; issues: DocumentIssue[] };

/**
 * Error thrown by the core for invalid documents or impossible transforms; the message says why in plain
 * words and `issues` name the fields.
 * @example try { halfTime(threeBars) } catch (e) { if (e instanceof RhythmError) show(e.message) } // "halving a 3-bar groove gives 1 1/2 bars; …"
 */
export class RhythmError extends Error {
  constructor(
    message: string,
    readonly issues: DocumentIssue[] = [],
  ) {
    super(message);
    this.name = "RhythmError";
  }
}

/**
 * Validate and normalise a groove document (hits and notes sorted, rationals canonical).
 * @example parseGroove(json).ok ? use(json.doc) : show(json.issues)
 */
export function parseGroove(input: unknown): ParseResult {
  const r = grooveDocumentSchema.safeParse(input);
  if (!r.success)
    return { ok: false, issues: r.error.issues.map((i) => ({ path: i.path.join("."), message: i.message })) };
  return { ok: true, doc: normalizeGroove(r.data) };
}

/**
 * Like `parseGroove`, but throws a RhythmError listing the issues.
 * @example assertGroove({ ...emptyGroove(), bars: 0 }) // throws "invalid groove: bars: a groove has 1 to 4096 bars"
 */
export function assertGroove(input: unknown): GrooveDocument {
  const r = parseGroove(input);
  if (!r.ok) throw new RhythmError(`invalid groove: ${r.issues.map((i) => `${i.path}: ${i.message}`).join("; ")}`, r.issues);
  return r.doc;
}

/**
 * Sort hits by position and notes by position then pitch, so equal grooves have equal JSON.
 * @example JSON.stringify(normalizeGroove(a)) === JSON.stringify(normalizeGroove(b)) // same content, any order
 */
export function normalizeGroove(doc: GrooveDocument): GrooveDocument {
  const byAt = (a: { at: Rational }, b: { at: Rational }) => q(a.at).compare(q(b.at));
  return {
    ...doc,
    kit: { lanes: doc.kit.lanes.map((l) => ({ ...l, hits: [...l.hits].sort(byAt) })) },
    keys: { ...doc.keys, notes: [...doc.keys.notes].sort((a, b) => byAt(a, b) || a.pitch - b.pitch) },
  };
}

/**
 * The play order of bars in a song form: each section's bars, repeated. Without sections, every bar once.
 * @example playOrder({ bars: 2, sections: [{ name: "A", startBar: 0, bars: 2, repeats: 2 }] }) // [0, 1, 0, 1]
 */
export function playOrder(doc: Pick<GrooveDocument, "bars" | "sections">): number[] {
  if (doc.sections.length === 0) return Array.from({ length: doc.bars }, (_, i) => i);
  const order: number[] = [];
  for (const s of doc.sections)
    for (let r = 0; r < s.repeats; r++) for (let b = 0; b < s.bars; b++) order.push(s.startBar + b);
  return order;
}

/**
 * A new empty groove: one bar of 4/4 at 96 bpm on a sixteenth grid, with the usual three kit rows.
 * @example toggleHit(emptyGroove(), "snare", "1/4") // a snare on beat 2
 */
export function emptyGroove(): GrooveDocument {
  return {
    schemaVersion: SCHEMA_VERSION,
    meter: { beatsPerBar: 4, beatUnit: 4 },
    tempo: { bpm: "96", beatNote: "1/4" },
    grid: { step: "1/16" },
    swing: { unit: "1/8", ratio: 0.5 },
    bars: 1,
    sections: [],
    kit: {
      lanes: [
        { piece: "hihat-closed", hits: [] },
        { piece: "snare", hits: [] },
        { piece: "kick", hits: [] },
      ],
    },
    keys: { notes: [], splitPitch: 60 },
  };
}
