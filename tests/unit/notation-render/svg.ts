// Helpers for the notation rendering tests: grooves written compactly, the server renderer, and an SVG reader.
import { createRequire } from "node:module";
import { renderScoreOnServer } from "../../../src/adapters/vexflow/server";
import type { RenderOptions, RenderResult } from "../../../src/adapters/vexflow/render";
import { assertGroove, spellGroove, type GrooveDocument, type GrooveDocumentInput, type NotationScore } from "../../../src/lib/rhythm";

const require = createRequire(import.meta.url);
const { JSDOM } = require("jsdom") as { JSDOM: new (html: string, opts?: { contentType: string }) => { window: Window & typeof globalThis } };

export type Hit = string | { at: string; dynamic?: "ghost" | "normal" | "accent"; articulation?: "flam" | "open" | "choke" };

export interface GroovePatch {
  meter?: { beatsPerBar: number; beatUnit: number; grouping?: number[] };
  grid?: string;
  bars?: number;
  bpm?: string;
  kit?: Record<string, Hit[]>;
  keys?: { at: string; duration: string; pitch: number }[];
  sections?: { name: string; startBar: number; bars: number; repeats: number }[];
}

/** A groove document from a compact description (positions in whole notes from the start). */
export function groove(p: GroovePatch): GrooveDocument {
  return assertGroove({
    schemaVersion: 1,
    meter: p.meter ?? { beatsPerBar: 4, beatUnit: 4 },
    tempo: { bpm: p.bpm ?? "96", beatNote: "1/4" },
    grid: { step: p.grid ?? "1/16" },
    bars: p.bars ?? 1,
    sections: p.sections ?? [],
    kit: { lanes: Object.entries(p.kit ?? {}).map(([piece, hits]) => ({ piece, hits: hits.map((h) => (typeof h === "string" ? { at: h } : h)) })) },
    keys: { notes: (p.keys ?? []).map((n) => ({ ...n, velocity: 90 })), splitPitch: 60 },
  } as GrooveDocumentInput);
}

/** Positions "0 1/8 1/4 …" of every `step` from `from` for `count` hits. */
export function every(step: number, count: number, denominator: number, from = 0): string[] {
  return Array.from({ length: count }, (_, i) => `${from + i * step}/${denominator}`);
}

export interface Rendered extends RenderResult {
  score: NotationScore;
  doc: Document;
  root: SVGSVGElement;
}

export function render(input: GrooveDocument | NotationScore, opts: Partial<RenderOptions> = {}): Rendered {
  const score = "bars" in input && Array.isArray(input.bars) ? (input as NotationScore) : spellGroove(input as GrooveDocument);
  const result = renderScoreOnServer(score, { width: 900, ...opts });
  const doc = new JSDOM(result.svg, { contentType: "image/svg+xml" }).window.document;
  return { ...result, score, doc, root: doc.documentElement as unknown as SVGSVGElement };
}

/**
 * Attributes an SVG element takes from its ancestors when it does not set them itself, with the values the
 * drawing's <svg> gives them (createInkSvg in src/adapters/vexflow/render.ts; none = not set).
 */
const INHERITED: Record<string, string> = {
  fill: "currentColor",
  stroke: "currentColor",
  "stroke-width": "1",
  "stroke-dasharray": "none",
  "font-family": "Bravura,Academico",
  "font-size": "10pt",
  "font-weight": "normal",
  "font-style": "normal",
};

/**
 * What a drawing puts on the page, stroke by stroke and glyph by glyph: every path, rect and text under
 * `group`, with the colours, line width and font it is drawn with (its own, or the one an enclosing element
 * sets) and its own geometry and text. A path of several subpaths counts as one path per subpath, a text that
 * places each of its glyphs (x and y lists) as one text per glyph. Wrapper groups, classes, ids and the order
 * of elements do not count (everything is drawn in one colour), so the browser's flat, merged drawing and
 * the server's grouped one compare equal when they draw the same.
 * @example inkOf(barGroup)[0] // '<path d=M10 20L30 20 fill=none font-family=Bravura,Academico …>'
 */
export function inkOf(group: Element): string[] {
  // One selector, not "path, rect, text": jsdom's engine does not keep document order across a selector list.
  const drawn = [...group.querySelectorAll("*")].filter((el) => el.localName === "path" || el.localName === "rect" || el.localName === "text");
  return drawn
    .flatMap((el) => {
      const attrs: string[] = [];
      for (const [name, value] of Object.entries(INHERITED)) {
        let from: Element | null = el;
        while (from && !from.hasAttribute(name)) from = from.parentElement;
        attrs.push(`${name}=${from ? from.getAttribute(name) : value}`);
      }
      const own = [...el.attributes].filter((a) => !(a.name in INHERITED) && a.name !== "class" && a.name !== "id");
      const rest = own.filter((a) => !["d", "x", "y"].includes(a.name)).map((a) => `${a.name}=${a.value}`);
      const line = (extra: string[], text: string) => `<${el.localName} ${[...attrs, ...rest, ...extra].sort().join(" ")}>${text}`;
      if (el.localName === "path") return (el.getAttribute("d") ?? "").split(/(?=M)/).map((d) => line([`d=${d}`], ""));
      const xs = (el.getAttribute("x") ?? "").split(" ").filter(Boolean);
      const ys = (el.getAttribute("y") ?? "").split(" ").filter(Boolean);
      const text = el.textContent ?? "";
      if (el.localName === "text" && xs.length > 1) return [...text].map((ch, i) => line([`x=${xs[i]}`, `y=${ys[i]}`], ch));
      return [line([...(el.hasAttribute("x") ? [`x=${xs.join(" ")}`] : []), ...(el.hasAttribute("y") ? [`y=${ys.join(" ")}`] : [])], text)];
    })
    .sort();
}

/** SMuFL code points (as Bravura and VexFlow 5 name them). */
export const GLYPH = {
  percussionClef: "\uE069", // unpitchedPercussionClef1
  trebleClef: "\uE050", // gClef
  bassClef: "\uE062", // fClef
  brace: "\uE000",
  noteheadBlack: "\uE0A4",
  noteheadHalf: "\uE0A3",
  noteheadXBlack: "\uE0A9",
  noteheadCircleX: "\uE0B3",
  parenthesisLeft: "\uE0F5",
  accent: "\uE4A0", // articAccentAbove
  accentBelow: "\uE4A1",
  openMark: "\uE5E7", // brassMuteOpen
  sharp: "\uE262",
  flat: "\uE260",
  restWhole: "\uE4E3",
  restQuarter: "\uE4E5",
  rest8th: "\uE4E6",
  tuplet3: "\uE883",
} as const;

export interface Head {
  glyph: string;
  x: number;
  y: number;
  /** Index of the bar (data-bar of the enclosing g.tx-bar) and of the system. */
  bar: number;
  system: number;
}

function barOf(el: Element): { bar: number; system: number } {
  const bar = el.closest("g.tx-bar");
  const system = el.closest("g.tx-system");
  return { bar: Number(bar?.getAttribute("data-bar") ?? -1), system: Number(system?.getAttribute("data-system") ?? -1) };
}

/** Every notehead drawn (text inside g.vf-notehead), in system coordinates. */
export function heads(r: Rendered): Head[] {
  return [...r.doc.querySelectorAll("g.vf-notehead > text")].map((t) => ({
    glyph: t.textContent ?? "",
    x: Number(t.getAttribute("x")),
    y: Number(t.getAttribute("y")),
    ...barOf(t),
  }));
}

/** Every text glyph drawn anywhere, with its enclosing VexFlow class. */
export function glyphs(r: Rendered): { glyph: string; cls: string; x: number; y: number; bar: number }[] {
  return [...r.doc.querySelectorAll("text")].map((t) => ({
    glyph: t.textContent ?? "",
    cls: t.parentElement?.getAttribute("class") ?? "",
    x: Number(t.getAttribute("x")),
    y: Number(t.getAttribute("y")),
    bar: barOf(t).bar,
  }));
}

export interface StemLine {
  x: number;
  base: number;
  tip: number;
  /** "up" when the tip is above the base. */
  dir: "up" | "down";
  bar: number;
}

/** Stems (paths in g.vf-stem): "M x y1 L x y2", base y1 at the notehead, tip y2. */
export function stems(r: Rendered): StemLine[] {
  return [...r.doc.querySelectorAll("g.vf-stem > path")].map((p) => {
    const n = (p.getAttribute("d") ?? "").match(/-?\d+(?:\.\d+)?/g)!.map(Number);
    const [x, base, , tip] = n as [number, number, number, number];
    return { x, base, tip, dir: tip < base ? "up" : "down", bar: barOf(p).bar };
  });
}

/** y of the five lines of each stave of a bar, top staff first (from the stave groups' horizontal paths). */
export function staffLines(r: Rendered, bar = 0): number[][] {
  const group = r.doc.querySelector(`g.tx-bar[data-bar="${bar}"]`)!;
  return [...group.querySelectorAll("g.vf-stave")].map((g) =>
    [...g.querySelectorAll("path")].map((p) => Math.floor(Number((p.getAttribute("d") ?? "").match(/-?\d+(?:\.\d+)?/g)![1]))),
  );
}
