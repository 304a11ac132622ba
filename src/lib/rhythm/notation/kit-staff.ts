/**
 * Where each kit piece sits on the percussion staff (positions read as in treble clef) and its notehead.
 *
 * Sources (see the project's reference notes):
 * - PAS: N. Weinberg, "Guide to Standardized Drumset Notation", Percussive Arts Society, 1998, as followed by
 *   published teaching texts (verified): kick F4 (bottom space), floor tom A4, snare C5, high tom E5,
 *   ride F5 (x), hi-hat G5 (x), crash A5 (x, first ledger line above), hi-hat foot x below the staff;
 *   hi-hats are closed unless marked open; bell strokes are marked.
 * - From memory: mid tom D5 (fourth line), hi-hat foot on D4, cross-stick as a circled x in the snare space,
 *   open hi-hat marked "o".
 * - Tactus conventions (no standard position exists): ride bell = diamond on the ride line (the PAS text asks
 *   for bell strokes to be marked; a distinct head marks them without text); clap = x on the middle line (B4);
 *   tambourine = diamond on the bottom line (E4); cowbell = triangle above the first ledger line (B5).
 */
import { KIT_PIECES, type KitPieceId, type Limb } from "../kit";
import type { KitDisplay, Notehead, Step } from "./model";

export type KitSource = "PAS" | "memory" | "Tactus";

export interface KitStaffEntry {
  readonly step: Step;
  readonly octave: number;
  readonly notehead: Notehead;
  /** Drawn with the open ("o") mark. */
  readonly open?: boolean;
  /** Where the position and head come from. */
  readonly source: KitSource;
}

/** The table; its (position, notehead, open mark) triples are unique (checked by a test). */
export const KIT_STAFF: Readonly<Record<KitPieceId, KitStaffEntry>> = {
  kick: { step: "F", octave: 4, notehead: "normal", source: "PAS" },
  "tom-floor": { step: "A", octave: 4, notehead: "normal", source: "PAS" },
  snare: { step: "C", octave: 5, notehead: "normal", source: "PAS" },
  "tom-high": { step: "E", octave: 5, notehead: "normal", source: "PAS" },
  ride: { step: "F", octave: 5, notehead: "x", source: "PAS" },
  "hihat-closed": { step: "G", octave: 5, notehead: "x", source: "PAS" },
  crash: { step: "A", octave: 5, notehead: "x", source: "PAS" },
  "hihat-foot": { step: "D", octave: 4, notehead: "x", source: "memory" },
  "tom-mid": { step: "D", octave: 5, notehead: "normal", source: "memory" },
  "cross-stick": { step: "C", octave: 5, notehead: "circle-x", source: "memory" },
  "hihat-open": { step: "G", octave: 5, notehead: "x", open: true, source: "memory" },
  "ride-bell": { step: "F", octave: 5, notehead: "diamond", source: "Tactus" },
  clap: { step: "B", octave: 4, notehead: "x", source: "Tactus" },
  tambourine: { step: "E", octave: 4, notehead: "diamond", source: "Tactus" },
  cowbell: { step: "B", octave: 5, notehead: "triangle", source: "Tactus" },
};

const STEPS: readonly Step[] = ["C", "D", "E", "F", "G", "A", "B"];

/**
 * Diatonic staff index (C0 = 0), for ordering heads and choosing stems.
 * @example staffIndex("C", 5) // 35
 */
export function staffIndex(step: Step, octave: number): number {
  return octave * 7 + STEPS.indexOf(step);
}

/**
 * The voice a piece is written in: hands up (voice 1), feet down (voice 2).
 * @example kitVoice("kick") // "down"
 */
export function kitVoice(piece: KitPieceId): "up" | "down" {
  const limb: Limb = KIT_PIECES[piece].limb;
  return limb === "foot" ? "down" : "up";
}

/**
 * How one hit of a piece is drawn.
 * @example kitDisplay("hihat-closed", "accent") // { step: "G", octave: 5, notehead: "x", accent: true }
 */
export function kitDisplay(piece: KitPieceId, dynamic: "ghost" | "normal" | "accent", articulation?: "flam" | "open" | "choke"): KitDisplay {
  const e = KIT_STAFF[piece];
  const d: { -readonly [K in keyof KitDisplay]: KitDisplay[K] } = { step: e.step, octave: e.octave, notehead: e.notehead };
  if (e.open || articulation === "open") d.open = true;
  if (dynamic === "accent") d.accent = true;
  if (dynamic === "ghost") d.ghost = true;
  if (articulation === "flam") d.flam = true;
  if (articulation === "choke") d.choke = true;
  return d;
}
