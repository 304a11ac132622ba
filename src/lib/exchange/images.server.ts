/**
 * Notation as standalone images, on the server: SVG with its fonts inside, and PNG through @resvg/resvg-js.
 *
 * The VexFlow server renderer (src/adapters/vexflow/server.ts) draws music symbols as text in the Bravura font
 * (and words in Academico). A downloaded SVG is opened where those fonts are not installed, so the SVG carries
 * them as @font-face rules with the WOFF2 files inlined; the PNG is rasterised by resvg with the same font
 * files loaded (no system fonts, so the picture is the same on every machine). Black on white.
 */
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { Resvg } from "@resvg/resvg-js";
import { notationFontFiles, renderScoreSvgOnServer } from "../../adapters/vexflow/server";
import type { GrooveDocument } from "../rhythm/document";
import { spellGroove } from "../rhythm/notation/spell";

const require = createRequire(import.meta.url);

/** Widths offered for images, CSS pixels. */
export const IMAGE_WIDTH = { min: 540, max: 2400, default: 1200 } as const;
/** PNG pixel density (device pixels per CSS pixel). */
export const PNG_SCALE = { min: 1, max: 4, default: 2 } as const;
/** Most bars drawn in one image (a long song is drawn in parts, or printed). */
export const MAX_IMAGE_BARS = 200;
/** Largest PNG, in pixels (about 160 MB of memory while rasterising). */
export const MAX_PNG_PIXELS = 40_000_000;

const INK = "#111111";
const PAPER = "#ffffff";

export class ImageTooLarge extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ImageTooLarge";
  }
}

export interface ImageOptions {
  /** Width in CSS pixels (clamped to IMAGE_WIDTH). */
  width?: number;
  /** Bars to draw, 0-based, `to` exclusive (default: all, at most MAX_IMAGE_BARS). */
  fromBar?: number;
  toBar?: number;
  /** Shown as the SVG's <title> (its accessible name in files). */
  title?: string;
  /** Draw the keys staves (default true). */
  showKeys?: boolean;
}

function range(doc: GrooveDocument, o: ImageOptions): { from: number; to: number } {
  const from = Math.max(0, Math.min(doc.bars - 1, Math.floor(o.fromBar ?? 0)));
  const to = Math.max(from + 1, Math.min(doc.bars, Math.floor(o.toBar ?? doc.bars)));
  if (to - from > MAX_IMAGE_BARS) {
    throw new ImageTooLarge(`An image holds at most ${MAX_IMAGE_BARS} bars and this groove has ${doc.bars}: choose the bars to draw, or print the chart.`);
  }
  return { from, to };
}

function draw(doc: GrooveDocument, o: ImageOptions): string {
  const { from, to } = range(doc, o);
  const width = Math.round(Math.max(IMAGE_WIDTH.min, Math.min(IMAGE_WIDTH.max, o.width ?? IMAGE_WIDTH.default)));
  return renderScoreSvgOnServer(spellGroove(doc), { width, fromBar: from, toBar: to, showKeys: o.showKeys ?? true, theme: { color: INK, background: PAPER } });
}

let fontCss: string | undefined;

/** @font-face rules with the notation fonts inlined (WOFF2, base64). */
function embeddedFonts(): string {
  if (fontCss) return fontCss;
  const face = (family: string, file: string, weight: string) =>
    `@font-face{font-family:${family};font-weight:${weight};src:url(data:font/woff2;base64,${readFileSync(require.resolve(file)).toString("base64")}) format("woff2")}`;
  fontCss = [
    face("Bravura", "@vexflow-fonts/bravura/bravura.woff2", "normal"),
    face("Academico", "@vexflow-fonts/academico/academico.woff2", "normal"),
    face("Academico", "@vexflow-fonts/academico/academico-bold.woff2", "bold"),
  ].join("");
  return fontCss;
}

const escapeXml = (s: string) => s.replace(/[<>&"']/g, (c) => `&#${c.charCodeAt(0)};`);

/**
 * The notation as a standalone SVG file (fonts inside, black on white).
 * @example notationSvg(doc, { title: "Salt Road" }).includes("@font-face") // true
 */
export function notationSvg(doc: GrooveDocument, options: ImageOptions = {}): string {
  const svg = draw(doc, options);
  const open = svg.indexOf(">") + 1;
  const title = options.title ? `<title>${escapeXml(options.title)}</title>` : "";
  return `<?xml version="1.0" encoding="UTF-8"?>\n${svg.slice(0, open)}${title}<defs><style>${embeddedFonts()}</style></defs><rect width="100%" height="100%" fill="${PAPER}"/>${svg.slice(open)}`;
}

/**
 * The notation as a PNG image, `scale` device pixels per CSS pixel.
 * @example notationPng(doc, { width: 1200, scale: 2 }) // Uint8Array starting with the PNG signature
 */
export function notationPng(doc: GrooveDocument, options: ImageOptions & { scale?: number } = {}): Uint8Array {
  const svg = draw(doc, options);
  const scale = Math.max(PNG_SCALE.min, Math.min(PNG_SCALE.max, options.scale ?? PNG_SCALE.default));
  const width = Number(/\swidth="([\d.]+)"/.exec(svg)?.[1] ?? 0);
  const height = Number(/\sheight="([\d.]+)"/.exec(svg)?.[1] ?? 0);
  if (width * height * scale * scale > MAX_PNG_PIXELS) {
    throw new ImageTooLarge(`That picture would be ${Math.round(width * scale)} × ${Math.round(height * scale)} pixels; draw fewer bars, a lower scale, or download the SVG.`);
  }
  const files = notationFontFiles();
  const resvg = new Resvg(svg, {
    fitTo: { mode: "zoom", value: scale },
    background: PAPER,
    font: { fontFiles: [files.bravura, files.academico, files.academicoBold], loadSystemFonts: false, defaultFontFamily: "Academico" },
  });
  return new Uint8Array(resvg.render().asPng());
}
