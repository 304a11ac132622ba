/**
 * What the play island reads from the page: the documents to play and, for each drawing the page holds, where
 * bars and beats sit (as fractions of the drawing, so the playhead follows the drawing at any scale).
 * Built on the server, read in the browser; JSON inside a `<script type="application/json">`.
 */
import type { GrooveDocument } from "../../lib/rhythm/document";

/** One drawing: its size and, per system and bar, the positions the playhead needs (CSS pixels of the drawing). */
export interface IslandLayout {
  /** Width and height of the drawing. */
  w: number;
  h: number;
  /** Per system: [top, bottom] of the playhead (staff extent with a margin). */
  sys: [number, number][];
  /** Per drawn bar: [written bar, system, note start x, note end x, x of each time-signature beat…]. */
  bars: number[][];
}

export interface IslandReading {
  doc: GrooveDocument;
  /** One layout per drawing of this reading on the page, in the order of the page's `.tx-bucket` elements. */
  layouts: IslandLayout[];
}

export interface IslandData {
  readings: IslandReading[];
  /** Written bar (0-based) to start playing from. */
  startBar: number;
  /**
   * Seconds each reading sounds after reading 0 (0 for reading 0), or null when the readings do not sound the
   * same (the playheads then share the clock only).
   */
  offsets: (number | null)[];
}

/** Element id prefix of the JSON script of an island (one per island root). */
export const ISLAND_DATA_ATTR = "data-tx-island";

/** Serialize for a `<script type="application/json">` (no "</script>" can end it early). */
export function islandJson(data: IslandData): string {
  return JSON.stringify(data).replace(/</g, "\\u003c").replace(/\u2028/g, "\\u2028").replace(/\u2029/g, "\\u2029");
}
