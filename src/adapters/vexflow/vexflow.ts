/**
 * The one place Tactus imports VexFlow. `vexflow/core` carries no font data and never fetches fonts: the
 * page ships Bravura and Academico itself (src/styles/notation-fonts.css) and the server measures text with
 * the same font files (./server.ts).
 */
import { Metrics, MetricsDefaults, VexFlow } from "vexflow/core";

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
  Metrics.clear();
  cheaperMetricCopies();
}

/**
 * Every VexFlow element copies its font and style records from Metrics with structuredClone when it is
 * created. The records are flat (strings and numbers), so a spread makes the same copy much faster; drawing
 * a bar creates hundreds of elements.
 */
function cheaperMetricCopies(): void {
  const getFontInfo = Metrics.getFontInfo.bind(Metrics);
  const getStyle = Metrics.getStyle.bind(Metrics);
  const clear = Metrics.clear.bind(Metrics);
  const fonts = new Map<string, ReturnType<typeof getFontInfo>>();
  const styles = new Map<string, ReturnType<typeof getStyle>>();
  Metrics.getFontInfo = (key: string) => {
    let f = fonts.get(key);
    if (!f) fonts.set(key, (f = getFontInfo(key)));
    return { ...f };
  };
  Metrics.getStyle = (key: string) => {
    let st = styles.get(key);
    if (!st) styles.set(key, (st = getStyle(key)));
    return { ...st };
  };
  Metrics.clear = (key?: string) => {
    if (key) {
      fonts.delete(key);
      styles.delete(key);
    } else {
      fonts.clear();
      styles.clear();
    }
    clear(key);
  };
}
