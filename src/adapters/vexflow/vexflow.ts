/**
 * The one place Tactus imports VexFlow. `vexflow/core` carries no font data and never fetches fonts: the
 * page ships Bravura and Academico itself (src/styles/notation-fonts.css) and the server measures text with
 * the same font files (./server.ts).
 */
import { Element, Metrics, MetricsDefaults, VexFlow } from "vexflow/core";

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
  remeasureNothingTwice();
}

/**
 * Every VexFlow element copies its font and style records from Metrics with structuredClone when it is
 * created. The records are flat (strings and numbers), so a spread makes the same copy much faster; drawing
 * a bar creates hundreds of elements. Plain values looked up by key are kept too.
 */
function cheaperMetricCopies(): void {
  const getFontInfo = Metrics.getFontInfo.bind(Metrics);
  const getStyle = Metrics.getStyle.bind(Metrics);
  const get = Metrics.get.bind(Metrics);
  const clear = Metrics.clear.bind(Metrics);
  const fonts = new Map<string, ReturnType<typeof getFontInfo>>();
  const styles = new Map<string, ReturnType<typeof getStyle>>();
  const values = new Map<string, unknown>();
  // Metrics.get splits its dotted key and walks the defaults on every call; a note's x alone asks for
  // "Stave.padding" each time, and a beam asks for its notes' x a few hundred times while choosing a slope.
  // Plain values are kept (records are still looked up, as callers may change what they get).
  Metrics.get = (key: string, defaultValue?: unknown) => {
    if (defaultValue !== null && typeof defaultValue === "object") return get(key, defaultValue);
    const k = defaultValue === undefined ? key : `${key}\u0000${typeof defaultValue}:${String(defaultValue)}`;
    if (values.has(k)) return values.get(k);
    const v = get(key, defaultValue);
    if (v === null || typeof v !== "object") values.set(k, v);
    return v;
  };
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
    values.clear();
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

/** The fields of a VexFlow element that its text measurement reads and writes. */
interface MeasuredElement {
  readonly fontInfo: { family: string; size: string | number; weight: string | number; style: string };
  readonly text: string;
  metricsValid: boolean;
  _textMetrics: TextMetrics;
  _width: number;
  _height: number;
  measureText(): TextMetrics;
}

const measured = new Map<string, TextMetrics>();
let measuredWith: unknown = null;

/**
 * Every glyph VexFlow creates (each notehead, rest, flag, digit) measures its text with a canvas: setting the
 * canvas font and shaping the glyph again, although a bar uses a handful of different glyphs. The same font
 * and text always measure the same, so keep each answer (per measuring canvas; see forgetTextMetrics).
 */
function remeasureNothingTwice(): void {
  const proto = Element.prototype as unknown as MeasuredElement;
  const measure = proto.measureText;
  proto.measureText = function (this: MeasuredElement): TextMetrics {
    const canvas = Element.getTextMeasurementCanvas();
    if (canvas !== measuredWith) forgetTextMetrics(canvas);
    const f = this.fontInfo;
    const key = `${f.family}\u0000${f.size}\u0000${f.weight}\u0000${f.style}\u0000${this.text}`;
    const known = measured.get(key);
    if (!known) {
      const m = measure.call(this);
      if (this.metricsValid) {
        if (measured.size > 5000) measured.clear();
        measured.set(key, m);
      }
      return m;
    }
    this._textMetrics = known;
    this._width = known.width;
    this._height = known.actualBoundingBoxAscent + known.actualBoundingBoxDescent;
    this.metricsValid = true;
    return known;
  };
}

/**
 * Drop the kept text measurements (call when the fonts they were made with change, e.g. once the notation
 * fonts have loaded). A new measuring canvas drops them too.
 */
export function forgetTextMetrics(canvas: unknown = Element.getTextMeasurementCanvas()): void {
  measured.clear();
  measuredWith = canvas;
}
