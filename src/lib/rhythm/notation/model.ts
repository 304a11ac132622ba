/**
 * The renderer-neutral notation model: what `spellGroove` produces from a groove document and what the
 * VexFlow preview, the server-rendered embed and the MusicXML export read.
 *
 * Conventions
 * - Time is exact: `at` and `duration` are canonical rational strings of WHOLE notes (see ../rational).
 *   `at` is the offset inside the bar; `NotationBar.start` is the bar's offset from the start of the groove.
 * - Every voice of every bar is a complete, gap-free sequence of events (notes and rests) whose written
 *   values add up exactly to the bar length: Σ value × (tuplet ? normal / actual : 1) = bar length.
 *   The one exception is a measure rest (`measure: true`): written as a whole rest in any meter, it fills
 *   the bar whatever its value says (MusicXML `<rest measure="yes"/>`).
 * - Note type names are MusicXML's `note-type-value` names, so an exporter can copy them.
 * - Ties are per notehead (a chord may tie some of its notes only): `tieStart` on the first note of a tie,
 *   `tieStop` on the note it continues into (possibly in the next bar).
 * - Beams: notes sharing the same `beam` number (unique within the voice of one bar) are beamed together.
 *   Rests never carry a beam number; a beam may pass over a rest that lies between two of its notes.
 */
import type { Articulation, Dynamic, KitPieceId } from "../kit";
import type { Rational } from "../rational";

/** Note types from longest to shortest (MusicXML `note-type-value` names). */
export const NOTE_TYPES = ["whole", "half", "quarter", "eighth", "16th", "32nd", "64th", "128th", "256th", "512th", "1024th"] as const;
export type NoteType = (typeof NOTE_TYPES)[number];

/** A written note value: a type plus dots (a dotted quarter is `{ type: "quarter", dots: 1 }`). */
export interface NoteValue {
  readonly type: NoteType;
  readonly dots: 0 | 1 | 2;
}

/**
 * Membership of an event in a tuplet: `actual` notes in the time of `normal` (3:2 for triplets; other odd
 * grids give 5:4, 7:4, …). Events of one tuplet share `group` (unique within the voice of one bar) and are
 * contiguous; a tuplet group never crosses a beat.
 */
export interface TupletRef {
  readonly actual: number;
  readonly normal: number;
  readonly group: number;
  readonly position: "start" | "middle" | "end";
}

/** How a kit hit is drawn on the percussion staff (positions read as in treble clef). */
export interface KitDisplay {
  /** Staff position as a treble-clef step and octave (MusicXML `display-step` / `display-octave`). */
  readonly step: Step;
  readonly octave: number;
  readonly notehead: Notehead;
  /** Open hi-hat: a small circle ("o") above the note. */
  readonly open?: boolean;
  /** Closed ("+") mark above the note; Tactus leaves hi-hats unmarked when closed (closed unless marked open). */
  readonly closed?: boolean;
  /** Accent mark (">"). */
  readonly accent?: boolean;
  /** Ghost note: the notehead in parentheses. */
  readonly ghost?: boolean;
  /** Flam: one grace note of the same piece before the note. */
  readonly flam?: boolean;
  /** Choke (cymbal stopped right after the stroke). */
  readonly choke?: boolean;
}

export type Step = "C" | "D" | "E" | "F" | "G" | "A" | "B";

/** Noteheads Tactus uses (MusicXML `notehead-value` names). */
export type Notehead = "normal" | "x" | "circle-x" | "diamond" | "triangle";

export interface KitHead {
  readonly kind: "kit";
  readonly piece: KitPieceId;
  readonly dynamic: Dynamic;
  readonly articulation?: Articulation;
  readonly display: KitDisplay;
  /** Always false for kit hits (drum notes are never tied); present so every head has the same tie fields. */
  readonly tieStart: boolean;
  readonly tieStop: boolean;
}

export interface KeysHead {
  readonly kind: "pitch";
  /** MIDI note number, 60 = C4. */
  readonly midi: number;
  readonly step: Step;
  /** -1 flat, 0 natural, 1 sharp. */
  readonly alter: -1 | 0 | 1;
  readonly octave: number;
  /** The accidental to print, if any (no key signature; accidentals last to the end of the bar). */
  readonly accidental?: "sharp" | "flat" | "natural";
  readonly velocity: number;
  readonly tieStart: boolean;
  readonly tieStop: boolean;
}

export type Head = KitHead | KeysHead;

interface EventBase {
  /** Offset from the start of the bar, whole notes. */
  readonly at: Rational;
  /** Sounding length, whole notes (= value × normal/actual; the bar length for a measure rest). */
  readonly duration: Rational;
  readonly value: NoteValue;
  readonly tuplet?: TupletRef;
}

export interface NoteEvent extends EventBase {
  readonly kind: "note";
  /** One head, or several for a chord, lowest staff position first. */
  readonly heads: readonly Head[];
  readonly stem: "up" | "down";
  /** Beam group within the voice of the bar; absent when the note is not beamed. */
  readonly beam?: number;
}

export interface RestEvent extends EventBase {
  readonly kind: "rest";
  /** A whole-bar rest (drawn as a whole rest centred in the bar, in any meter). */
  readonly measure?: boolean;
  /** Not drawn (the empty second voice of a kit bar); still counts for the voice's length. */
  readonly hidden?: boolean;
}

export type VoiceEvent = NoteEvent | RestEvent;

export interface NotationBar {
  /** 0-based bar index in written order. */
  readonly index: number;
  /** Offset of the bar from the start of the groove, whole notes. */
  readonly start: Rational;
  /** Bar length, whole notes. */
  readonly length: Rational;
  /** Percussion staff: voice 1 hands (stems up), voice 2 feet (stems down). */
  readonly kit: { readonly up: readonly VoiceEvent[]; readonly down: readonly VoiceEvent[] };
  /** Grand staff split at the document's splitPitch; null when the groove has no keys notes. */
  readonly keys: { readonly treble: readonly VoiceEvent[]; readonly bass: readonly VoiceEvent[] } | null;
}

export interface NotationSection {
  readonly name: string;
  readonly startBar: number;
  readonly bars: number;
  readonly repeats: number;
}

export interface NotationMeter {
  readonly beatsPerBar: number;
  readonly beatUnit: number;
  /** Beat grouping in beat units, always filled (the document's, or the default for the meter: 4/4 → 1+1+1+1, 6/8 → 3+3, 7/8 → 2+2+3). */
  readonly grouping: readonly number[];
}

export interface NotationScore {
  readonly meter: NotationMeter;
  readonly tempo: {
    readonly bpm: Rational;
    /** The note value carrying the beat, whole notes ("3/8" = dotted quarter). */
    readonly beatNote: Rational;
    /** The same as a written value, for a metronome mark (null if it is not a plain or dotted value). */
    readonly beatNoteValue: NoteValue | null;
  };
  /** Swing to print as a marking ("swung eighths" at a ratio), or null when the groove is straight. */
  readonly swing: { readonly unit: Rational; readonly ratio: number } | null;
  /** Bars in written order (repeats are not expanded). */
  readonly bars: readonly NotationBar[];
  /** Song form as in the document (empty when the groove is a single loop without sections). */
  readonly sections: readonly NotationSection[];
  /** True when the groove has keys notes (otherwise every bar's `keys` is null). */
  readonly hasKeys: boolean;
  /** True when the groove has kit lanes (a keys-only groove may leave the percussion staff out). */
  readonly hasKit: boolean;
}
