/**
 * Demo grooves of an invented band, "The Lamplight Ferry" (songs and people are made up for the demo).
 * Each is a groove document in the core's format (src/lib/rhythm/document.ts): positions and durations are
 * exact rationals in WHOLE NOTES from the start of the first bar.
 *
 * One pair, "Undertow", holds two readings of the same sound: a 76 bpm reading on a sixteenth grid, and the
 * same pattern written at double tempo and displaced by an eighth so the backbeat lands on 2 and 4.
 */
import type { GrooveDocumentInput } from "../rhythm/document";
import { DEMO_DRUMMER } from "./people";

export interface DemoGroove {
  /** Fixed short id (nanoid alphabet), so seeding is an upsert. */
  readonly id: string;
  /** Fixed id of its first version. */
  readonly versionId: string;
  readonly ownerId: string;
  readonly title: string;
  readonly description: string;
  readonly tags: readonly string[];
  readonly visibility: "private" | "link" | "public";
  /** Message of the first saved version. */
  readonly message: string;
  readonly document: GrooveDocumentInput;
}

/** Kit hits at the given positions (whole notes), written as a space-separated list. */
function hits(positions: string, dynamic: "ghost" | "normal" | "accent" = "normal") {
  return positions
    .trim()
    .split(/\s+/)
    .map((at) => ({ at, dynamic }));
}

/** One chord: every pitch starts at `at` and lasts `duration`. */
function chord(at: string, duration: string, pitches: number[], velocity = 80) {
  return pitches.map((pitch) => ({ at, duration, pitch, velocity }));
}

// Chord voicings (MIDI numbers, 60 = middle C).
const A_MINOR = [57, 60, 64];
const F_MAJOR = [53, 57, 60];
const G_MAJOR = [55, 59, 62];
const C_MAJOR = [48, 55, 60, 64];
const D_MINOR = [50, 57, 62, 65];
const E_MINOR = [52, 59, 64, 67];

/** "Harbour Lights at Four", verse: 4/4 at 96 bpm, two bars on a sixteenth grid. */
const harbourLights: GrooveDocumentInput = {
  schemaVersion: 1,
  meter: { beatsPerBar: 4, beatUnit: 4 },
  tempo: { bpm: "96", beatNote: "1/4" },
  grid: { step: "1/16" },
  bars: 2,
  sections: [{ name: "Verse", startBar: 0, bars: 2, repeats: 4 }],
  kit: {
    lanes: [
      { piece: "hihat-closed", hits: hits("0 1/8 1/4 3/8 1/2 5/8 3/4 1 9/8 5/4 11/8 3/2 13/8 7/4") },
      { piece: "hihat-open", hits: hits("7/8 15/8") },
      { piece: "snare", hits: [...hits("1/4 3/4 5/4 7/4"), ...hits("7/16 23/16", "ghost")] },
      { piece: "kick", hits: hits("0 3/8 1/2 1 11/8 13/8") },
    ],
  },
  keys: {
    splitPitch: 60,
    notes: [...chord("0", "1/2", A_MINOR), ...chord("1/2", "1/2", F_MAJOR), ...chord("1", "1/2", C_MAJOR), ...chord("3/2", "1/2", G_MAJOR)],
  },
};

/** "Salt Road": 6/8 felt in two (dotted-quarter beat at 58), eighths grouped 3 + 3, two bars. */
const saltRoad: GrooveDocumentInput = {
  schemaVersion: 1,
  meter: { beatsPerBar: 6, beatUnit: 8, grouping: [3, 3] },
  tempo: { bpm: "58", beatNote: "3/8" },
  grid: { step: "1/16" },
  bars: 2,
  sections: [],
  kit: {
    lanes: [
      // Ride on every eighth: a 6/8 bar is 6/8 of a whole note.
      { piece: "ride", hits: hits("0 1/8 1/4 3/8 1/2 5/8 3/4 7/8 1 9/8 5/4 11/8") },
      { piece: "cross-stick", hits: hits("3/8 9/8") },
      { piece: "kick", hits: hits("0 5/16 3/4 1 17/16") },
    ],
  },
  keys: {
    splitPitch: 60,
    notes: [...chord("0", "3/8", D_MINOR), ...chord("3/8", "3/8", A_MINOR), ...chord("3/4", "3/4", F_MAJOR)],
  },
};

/** "Seven Lanterns": 7/8 grouped 2 + 2 + 3, eighth note at 240, one bar. */
const sevenLanterns: GrooveDocumentInput = {
  schemaVersion: 1,
  meter: { beatsPerBar: 7, beatUnit: 8, grouping: [2, 2, 3] },
  tempo: { bpm: "240", beatNote: "1/8" },
  grid: { step: "1/16" },
  bars: 1,
  sections: [],
  kit: {
    lanes: [
      // Group starts at 0, 2/8 and 4/8 carry the accents.
      { piece: "hihat-closed", hits: [...hits("0 1/4 1/2", "accent"), ...hits("1/8 3/8 5/8 3/4")] },
      { piece: "snare", hits: hits("1/4 5/8") },
      { piece: "kick", hits: hits("0 1/2 9/16") },
    ],
  },
  keys: {
    splitPitch: 60,
    notes: [...chord("0", "1/4", E_MINOR), ...chord("1/4", "1/4", D_MINOR), ...chord("1/2", "3/8", A_MINOR)],
  },
};

/** "The Ferryman's Waltz": 3/4 at 132 bpm, two bars on an eighth grid. */
const ferrymansWaltz: GrooveDocumentInput = {
  schemaVersion: 1,
  meter: { beatsPerBar: 3, beatUnit: 4 },
  tempo: { bpm: "132", beatNote: "1/4" },
  grid: { step: "1/8" },
  bars: 2,
  sections: [],
  kit: {
    lanes: [
      { piece: "ride", hits: hits("0 1/4 1/2 3/4 1 5/4") },
      { piece: "snare", hits: hits("1/4 1/2 1 5/4") },
      { piece: "kick", hits: hits("0 3/4") },
      { piece: "hihat-foot", hits: hits("1/4 1/2 1 5/4") },
    ],
  },
  keys: {
    splitPitch: 60,
    notes: [
      { at: "0", duration: "1/4", pitch: 45, velocity: 84 },
      ...chord("1/4", "1/4", [60, 64]),
      ...chord("1/2", "1/4", [60, 64]),
      { at: "3/4", duration: "1/4", pitch: 41, velocity: 84 },
      ...chord("1", "1/4", [60, 65]),
      ...chord("5/4", "1/4", [60, 65]),
    ],
  },
};

/*
 * "Undertow": two readings of one sound.
 *
 * Reading A (the first draft): 4/4 at 76 bpm, one bar, sixteenth grid. The snare sits on the "e" of every beat
 * (off-beat sixteenths) and the hi-hat on every odd sixteenth: correct, but hard to read.
 *
 * Reading B: double the tempo (152 bpm) and every position and duration, then displace by +1/8 (one eighth note
 * later), wrapping around the loop (B is two bars = 2 whole notes). For a position a of A (whole notes):
 *     b = (2·a + 1/8) mod 2
 *
 *   snare     a = 1/16  → 2/16 + 1/8 = 1/4   (bar 1, beat 2)
 *             a = 5/16  → 10/16 + 1/8 = 3/4  (bar 1, beat 4)
 *             a = 9/16  → 18/16 + 1/8 = 5/4  (bar 2, beat 2)
 *             a = 13/16 → 26/16 + 1/8 = 7/4  (bar 2, beat 4)
 *   ghost     a = 3/8   → 6/8 + 1/8 = 7/8
 *   hi-hat    a = 1/16 + k/8 (k = 0..7) → 1/8 + k/4 + 1/8 = 1/4 + k/4 → 1/4, 1/2, …, 7/4, and k = 7: 2 ≡ 0
 *             (a quarter-note hi-hat in B)
 *   kick      a = 15/16 → 30/16 + 1/8 = 2 ≡ 0  (bar 1, beat 1)
 *             a = 1/4   → 2/4 + 1/8 = 5/8
 *             a = 7/16  → 14/16 + 1/8 = 1    (bar 2, beat 1)
 *             a = 5/8   → 10/8 + 1/8 = 11/8
 *   keys      Am a = 15/16, d = 1/16 → 2 ≡ 0, d = 1/8
 *             Am a = 3/16,  d = 1/8  → 6/16 + 1/8 = 1/2, d = 1/4
 *             F  a = 7/16,  d = 3/16 → 14/16 + 1/8 = 1, d = 3/8
 *             G  a = 11/16, d = 1/4  → 22/16 + 1/8 = 3/2, d = 1/2 (ends exactly at 2)
 *
 * Seconds agree: at 76 bpm a whole note lasts 240/76 s, at 152 bpm 240/152 s, so B's time for a is
 * (2a + 1/8)·240/152 = a·240/76 + (1/8)·240/152: the same onsets shifted by a constant eighth (≈ 0.197 s),
 * in a loop of equal length (1 · 240/76 = 2 · 240/152 ≈ 3.158 s).
 */
const undertowSixteenths: GrooveDocumentInput = {
  schemaVersion: 1,
  meter: { beatsPerBar: 4, beatUnit: 4 },
  tempo: { bpm: "76", beatNote: "1/4" },
  grid: { step: "1/16" },
  bars: 1,
  sections: [],
  kit: {
    lanes: [
      { piece: "hihat-closed", hits: hits("1/16 3/16 5/16 7/16 9/16 11/16 13/16 15/16") },
      { piece: "snare", hits: [...hits("1/16 5/16 9/16 13/16"), ...hits("3/8", "ghost")] },
      { piece: "kick", hits: hits("15/16 1/4 7/16 5/8") },
    ],
  },
  keys: {
    splitPitch: 60,
    notes: [...chord("15/16", "1/16", A_MINOR), ...chord("3/16", "1/8", A_MINOR), ...chord("7/16", "3/16", F_MAJOR), ...chord("11/16", "1/4", G_MAJOR)],
  },
};

const undertowDoubleTime: GrooveDocumentInput = {
  schemaVersion: 1,
  meter: { beatsPerBar: 4, beatUnit: 4 },
  tempo: { bpm: "152", beatNote: "1/4" },
  grid: { step: "1/8" },
  bars: 2,
  sections: [],
  kit: {
    lanes: [
      { piece: "hihat-closed", hits: hits("0 1/4 1/2 3/4 1 5/4 3/2 7/4") },
      { piece: "snare", hits: [...hits("1/4 3/4 5/4 7/4"), ...hits("7/8", "ghost")] },
      { piece: "kick", hits: hits("0 5/8 1 11/8") },
    ],
  },
  keys: {
    splitPitch: 60,
    notes: [...chord("0", "1/8", A_MINOR), ...chord("1/2", "1/4", A_MINOR), ...chord("1", "3/8", F_MAJOR), ...chord("3/2", "1/2", G_MAJOR)],
  },
};

const owner = DEMO_DRUMMER.id;

export const DEMO_GROOVES: readonly DemoGroove[] = [
  {
    id: "LmpHarbour1",
    versionId: "LmpHarbour1v1",
    ownerId: owner,
    title: "Harbour Lights at Four — verse",
    description: "Verse groove: closed hi-hat eighths opening on the last eighth of each bar, ghosted snare pickups, keys on the changes.",
    tags: ["lamplight-ferry", "verse", "4/4"],
    visibility: "public",
    message: "First take of the verse groove",
    document: harbourLights,
  },
  {
    id: "LmpSaltRd01",
    versionId: "LmpSaltRd01v1",
    ownerId: owner,
    title: "Salt Road",
    description: "A 6/8 ride pattern felt in two, cross-stick on the second dotted-quarter beat.",
    tags: ["lamplight-ferry", "6/8"],
    visibility: "public",
    message: "Ride pattern as played at rehearsal",
    document: saltRoad,
  },
  {
    id: "LmpLantern7",
    versionId: "LmpLantern7v1",
    ownerId: owner,
    title: "Seven Lanterns",
    description: "7/8 grouped 2 + 2 + 3, accents on the start of each group.",
    tags: ["lamplight-ferry", "7/8", "odd meter"],
    visibility: "link",
    message: "Bridge figure in seven",
    document: sevenLanterns,
  },
  {
    id: "LmpWaltz003",
    versionId: "LmpWaltz003v1",
    ownerId: owner,
    title: "The Ferryman's Waltz",
    description: "A brushes-style 3/4 with the hi-hat foot on 2 and 3; keys play bass note then chord.",
    tags: ["lamplight-ferry", "3/4", "waltz"],
    visibility: "public",
    message: "Waltz time for the closing number",
    document: ferrymansWaltz,
  },
  {
    id: "LmpUndertA1",
    versionId: "LmpUndertA1v1",
    ownerId: owner,
    title: "Undertow — 76 bpm, sixteenths",
    description: "First reading of the Undertow groove: snare on off-beat sixteenths. Sounds the same as the double-time reading.",
    tags: ["lamplight-ferry", "undertow", "reading"],
    visibility: "public",
    message: "Transcribed at the tapped tempo",
    document: undertowSixteenths,
  },
  {
    id: "LmpUndertB1",
    versionId: "LmpUndertB1v1",
    ownerId: owner,
    title: "Undertow — 152 bpm, backbeat on 2 and 4",
    description: "The same sound at double tempo, displaced by an eighth: the backbeat now reads on 2 and 4.",
    tags: ["lamplight-ferry", "undertow", "reading", "double time"],
    visibility: "public",
    message: "Renotated at double time, displaced by an eighth",
    document: undertowDoubleTime,
  },
];

/** The groove the landing page shows. */
export const LANDING_GROOVE_ID = "LmpHarbour1";

/** The two readings of "Undertow" (same sound), as [76 bpm reading, 152 bpm reading]. */
export const UNDERTOW_PAIR = ["LmpUndertA1", "LmpUndertB1"] as const;
