// The preview image of a version (Open Graph / Twitter card / oEmbed thumbnail): the first bars drawn on the
// server by the notation adapter, framed with the title on a paper background, rasterised to PNG by
// @resvg/resvg-js with the Bravura and Academico font files (no system fonts: the image is the same on every
// machine). Cached per version, title and width.
import { Resvg } from "@resvg/resvg-js";
import { notationFontFiles } from "../../adapters/vexflow/server";
import type { GrooveDocument } from "../rhythm/document";
import { grooveSummary } from "../share/describe";
import { PREVIEW_IMAGE, previewImageHeight } from "../share/embed-options";
import { drawVersion, Lru, strongEtag } from "./embed-cache";


/** Colours of the card: the light theme's paper and ink (src/styles/global.css). */
const PAPER = "#f7f4ee";
const INK = "#1c2330";
const SOFT = "#4a5363";
const BRASS = "#a8650b";

/** Bars shown on the card: enough to recognise the groove, few enough to stay legible in a small preview. */
export const PREVIEW_BARS = 2;

const escapeXml = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");

/** Shorten a title to fit one line of the card (Academico bold at 46 px holds about 40 characters). */
function fitTitle(title: string, max = 40): string {
  return title.length <= max ? title : `${title.slice(0, max - 1).trimEnd()}…`;
}

/**
 * The card as SVG (1200 × 630 user units).
 * @example previewSvg("abc", doc, { title: "Salt Road", ownerName: "Odile Marsh" }).startsWith("<svg") // true
 */
export function previewSvg(versionId: string, doc: GrooveDocument, text: { title: string; ownerName: string }): string {
  const { width: W, height: H } = PREVIEW_IMAGE;
  const margin = 56;
  const top = 150;
  const drawing = drawVersion(versionId, doc, {
    width: W - 2 * margin,
    keys: doc.keys.notes.length > 0,
    fromBar: 0,
    toBar: Math.min(doc.bars, PREVIEW_BARS),
    theme: { color: INK },
  });
  const box = { w: W - 2 * margin, h: H - top - 70 };
  const scale = Math.min(box.w / drawing.layout.width, box.h / drawing.layout.height, 1.6);
  const dw = drawing.layout.width * scale;
  const dh = drawing.layout.height * scale;
  // Nest the notation drawing: its own viewBox scales it into the box.
  const inner = drawing.svg
    .replace(/^<svg\b/, `<svg x="${(W - dw) / 2}" y="${top + (box.h - dh) / 2}"`)
    .replace(/ width="[\d.]+"/, ` width="${dw}"`)
    .replace(/ height="[\d.]+"/, ` height="${dh}"`);
  const subtitle = `${grooveSummary(doc)} · ${text.ownerName}`;
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}">` +
    `<rect width="${W}" height="${H}" fill="${PAPER}"/>` +
    `<rect x="0" y="0" width="12" height="${H}" fill="${BRASS}"/>` +
    `<text x="${margin}" y="84" font-family="Academico" font-weight="bold" font-size="46" fill="${INK}">${escapeXml(fitTitle(text.title))}</text>` +
    `<text x="${margin}" y="124" font-family="Academico" font-size="26" fill="${SOFT}">${escapeXml(subtitle)}</text>` +
    inner +
    `<text x="${W - margin}" y="${H - 28}" text-anchor="end" font-family="Academico" font-weight="bold" font-size="26" fill="${BRASS}">Tactus</text>` +
    `</svg>`
  );
}

export interface PreviewPng {
  png: Uint8Array;
  etag: string;
  width: number;
  height: number;
}

const cache = new Lru<PreviewPng>(400, 64 * 1024 * 1024);

/**
 * The card as PNG, `width` pixels wide (one of PREVIEW_IMAGE.widths), cached.
 * @example const { png } = previewPng(v.id, v.document, { title, ownerName }, 1200)
 */
export function previewPng(versionId: string, doc: GrooveDocument, text: { title: string; ownerName: string }, width: number = PREVIEW_IMAGE.width): PreviewPng {
  const key = `${versionId}|${width}|${text.title}|${text.ownerName}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const files = notationFontFiles();
  const resvg = new Resvg(previewSvg(versionId, doc, text), {
    fitTo: { mode: "width", value: width },
    font: { fontFiles: [files.bravura, files.academico, files.academicoBold], loadSystemFonts: false, defaultFontFamily: "Academico" },
    background: PAPER,
  });
  const png = new Uint8Array(resvg.render().asPng());
  const out = { png, etag: strongEtag(png), width, height: previewImageHeight(width) };
  cache.set(key, out, png.byteLength + 256);
  return out;
}
