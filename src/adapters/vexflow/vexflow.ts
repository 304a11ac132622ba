/**
 * The one place Tactus imports VexFlow. `vexflow/core` carries no font data and never fetches fonts: the
 * page ships Bravura and Academico itself (src/styles/notation-fonts.css) and the server measures text with
 * the same font files (./server.ts).
 */
import { MetricsDefaults, VexFlow } from "vexflow/core";

export * from "vexflow/core";

let configured = false;

/**
 * Point VexFlow at Bravura (music) and Academico (text), and draw everything in `currentColor` so inline SVG
 * follows the page's light or dark theme. Idempotent.
 */
export function configureVexFlow(): void {
  if (configured) return;
  configured = true;
  VexFlow.setFonts("Bravura", "Academico");
  const m = MetricsDefaults as unknown as Record<string, Record<string, unknown>>;
  // Stave lines are grey (#999) by default; ink is black. Both follow the text colour instead.
  m.Stave = { ...m.Stave, strokeStyle: "currentColor" };
  m.Stem = { ...m.Stem, strokeStyle: "currentColor" };
  m.StaveSection = { ...m.StaveSection, strokeStyle: "currentColor" };
}
