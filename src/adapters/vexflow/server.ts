/**
 * Notation on the server: the same renderer as the browser, given a DOM by jsdom and a text-measuring
 * "canvas" built from the Bravura and Academico font files (fontkit), so glyph widths, and therefore the
 * layout, match a browser that draws with the same fonts.
 *
 * The jsdom document is lent to the renderer only while it draws (synchronously) and then taken back, so
 * nothing else on the server sees a global `document`.
 */
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import type { NotationScore } from "../../lib/rhythm/notation/model";
import { renderScoreSvg, type RenderOptions, type RenderResult } from "./render";
import { measuringCanvas, type FontTable, type MeasurableFont } from "./text-metrics";
import { Element, configureVexFlow } from "./vexflow";

const require = createRequire(import.meta.url);
// Loaded with require: neither package ships type declarations we rely on, and both stay server-only.
const fontkit = require("fontkit") as { create(buffer: Uint8Array): unknown };
const { JSDOM } = require("jsdom") as { JSDOM: new (html: string) => { window: Window & typeof globalThis } };
type Dom = InstanceType<typeof JSDOM>;

/** Paths of the font files shipped by the @vexflow-fonts packages. */
export function notationFontFiles(): { bravura: string; academico: string; academicoBold: string } {
  return {
    bravura: require.resolve("@vexflow-fonts/bravura/bravura.otf"),
    academico: require.resolve("@vexflow-fonts/academico/academico.otf"),
    academicoBold: require.resolve("@vexflow-fonts/academico/academico-bold.otf"),
  };
}

function openFont(path: string): MeasurableFont {
  return fontkit.create(readFileSync(path)) as unknown as MeasurableFont;
}

let dom: Dom | null = null;

function setUp(): Dom {
  if (dom) return dom;
  const files = notationFontFiles();
  const fonts: FontTable = {
    bravura: { normal: openFont(files.bravura) },
    academico: { normal: openFont(files.academico), bold: openFont(files.academicoBold) },
  };
  configureVexFlow();
  Element.setTextMeasurementCanvas(measuringCanvas(fonts) as unknown as HTMLCanvasElement);
  dom = new JSDOM("<!doctype html><html><body></body></html>");
  return dom;
}

/**
 * Make VexFlow measure text from the font files in this process (done by every server render; exported for
 * tests that drive the browser renderer under jsdom).
 */
export function useFontFileMetrics(): void {
  setUp();
}

/** Run `fn` with jsdom's document as the global one, then restore whatever was there. */
function withDocument<T>(fn: () => T): T {
  const { window } = setUp();
  const g = globalThis as { document?: Document };
  const had = Object.prototype.hasOwnProperty.call(g, "document");
  const previous = g.document;
  g.document = window.document;
  try {
    return fn();
  } finally {
    if (had) g.document = previous;
    else delete g.document;
  }
}

/**
 * Render a score to an SVG string on the server, with its layout (bars, beats) for a playhead.
 * @example renderScoreOnServer(spellGroove(doc), { width: 720 }).svg.startsWith("<svg") // true
 */
export function renderScoreOnServer(score: NotationScore, opts: RenderOptions): RenderResult {
  return withDocument(() => renderScoreSvg(score, opts));
}

/**
 * Render a score to an inline SVG string on the server.
 * @example const svg = renderScoreSvgOnServer(spellGroove(doc), { width: 720, showKeys: false })
 */
export function renderScoreSvgOnServer(score: NotationScore, opts: RenderOptions): string {
  return renderScoreOnServer(score, opts).svg;
}

export type { RenderOptions, RenderResult, ScoreLayout, BarLayout, SystemLayout } from "./render";
