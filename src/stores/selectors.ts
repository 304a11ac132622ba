/**
 * Derived views of the groove document for the editor: grid columns, row lists, labels for people and
 * screen readers. Pure functions of the document (no second model is kept anywhere).
 */
import {
  KIT_PIECES,
  barLength,
  q,
  type GrooveDocument,
  type KitHit,
  type KitPieceId,
} from "../lib/rhythm";
import { beatStarts, describePosition } from "../lib/rhythm";
import { atOfStep, describeAt, stepCount } from "../lib/rhythm/editing";

export interface GridColumn {
  /** 0-based column (grid step) index in the whole groove. */
  col: number;
  at: string;
  /** 0-based bar. */
  bar: number;
  /** 0-based counted beat inside the bar (dotted quarters in 6/8, the groups of 7/8). */
  beat: number;
  /** First step of a bar. */
  barStart: boolean;
  /** Step on a counted beat. */
  beatStart: boolean;
  /** Step on a beat unit that is not a counted beat (the eighths inside a 6/8 beat): a lighter line. */
  unitStart: boolean;
  /** Short count shown above the column: the beat number, a counting syllable ("e", "&", "a", "trip", "let") or a dot. */
  count: string;
  /** The position in words ("bar 2, beat 3 and"), for accessible names. */
  where: string;
}

const SYLLABLE: Record<string, string> = { and: "&", e: "e", a: "a", trip: "trip", let: "let" };

/**
 * Every grid column of the groove with its bar, beat and line kind, counted as the core counts
 * (`describePosition`, `beatStarts`).
 * @example gridColumns(emptyGroove()).filter((c) => c.beatStart).length // 4
 */
export function gridColumns(doc: Pick<GrooveDocument, "meter" | "grid" | "bars">): GridColumn[] {
  const n = stepCount(doc);
  const bar = barLength(doc.meter);
  const unit = q(1).div(doc.meter.beatUnit);
  const starts = beatStarts(doc.meter);
  const cols: GridColumn[] = [];
  for (let col = 0; col < n; col++) {
    const at = atOfStep(doc, col);
    const p = q(at);
    const inBar = p.sub(bar.mul(p.div(bar).floor()));
    const words = describePosition(doc, at);
    const beatStart = starts.some((s) => s.equals(inBar));
    const unitStart = !beatStart && inBar.div(unit).d === 1n;
    const count = beatStart ? String(words.beat) : (words.sub && SYLLABLE[words.sub]) || "·";
    cols.push({ col, at, bar: words.bar - 1, beat: words.beat - 1, barStart: inBar.n === 0n, beatStart, unitStart, count, where: words.text });
  }
  return cols;
}

/** Dynamic and articulation in words, for the cell's accessible name. */
export function hitState(hit: KitHit | undefined): string {
  if (!hit) return "empty";
  const words = [hit.dynamic === "normal" ? "hit" : hit.dynamic];
  if (hit.articulation) words.push(hit.articulation);
  return words.join(", ");
}

/**
 * Accessible name of a kit cell: piece, bar, beat (and step), state.
 * @example kitCellLabel(doc, "snare", "1/4", hit) // "Snare, bar 1, beat 2: accent"
 */
export function kitCellLabel(doc: Pick<GrooveDocument, "meter">, piece: KitPieceId, at: string, hit: KitHit | undefined): string {
  return `${KIT_PIECES[piece].name}, ${describeAt(doc, at)}: ${hitState(hit)}`;
}

const NOTE_NAMES = ["C", "C♯", "D", "D♯", "E", "F", "F♯", "G", "G♯", "A", "A♯", "B"] as const;

/**
 * Pitch name with octave, MIDI 60 = C4 (scientific pitch notation, as most keyboard software labels middle C).
 * @example pitchName(61) // "C♯4"
 */
export function pitchName(pitch: number): string {
  return `${NOTE_NAMES[pitch % 12]}${Math.floor(pitch / 12) - 1}`;
}

/** Keys shown by default: two octaves from C3 (48) to B4 (71), around the split at middle C. */
export const DEFAULT_KEYS_RANGE = { low: 48, high: 71 } as const;

/**
 * The pitch rows to show, highest first: the chosen range, widened to whole octaves to include every note.
 * @example keysRows(doc, { low: 48, high: 71 })[0] // 71
 */
export function keysRows(doc: Pick<GrooveDocument, "keys">, range: { low: number; high: number }): number[] {
  let { low, high } = range;
  for (const n of doc.keys.notes) {
    if (n.pitch < low) low = n.pitch - (n.pitch % 12);
    if (n.pitch > high) high = Math.min(127, n.pitch + (11 - (n.pitch % 12)));
  }
  const rows: number[] = [];
  for (let p = high; p >= low; p--) rows.push(p);
  return rows;
}

/** Number of hits in the kit part. */
export function hitCount(doc: GrooveDocument): number {
  return doc.kit.lanes.reduce((a, l) => a + l.hits.length, 0);
}

/** Time signature as text, "7/8 (2+2+3)". */
export function meterText(doc: Pick<GrooveDocument, "meter">): string {
  const { beatsPerBar, beatUnit, grouping } = doc.meter;
  return `${beatsPerBar}/${beatUnit}${grouping ? ` (${grouping.join("+")})` : ""}`;
}

/** Grid steps offered by the editor, with names for people (common practice note names). */
export const GRID_CHOICES = [
  { step: "1/4", name: "Quarters" },
  { step: "1/8", name: "Eighths" },
  { step: "1/12", name: "Eighth triplets" },
  { step: "1/16", name: "Sixteenths" },
  { step: "1/24", name: "Sixteenth triplets" },
  { step: "1/32", name: "Thirty-seconds" },
] as const;

/** Beat notes offered for the tempo ("♩ = 96"). */
export const BEAT_NOTE_CHOICES = [
  { note: "1/8", name: "Eighth" },
  { note: "1/4", name: "Quarter" },
  { note: "3/8", name: "Dotted quarter" },
  { note: "1/2", name: "Half" },
  { note: "3/4", name: "Dotted half" },
] as const;
