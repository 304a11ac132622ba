/**
 * NotationScore → SVG, for the browser and for Node (where ./server.ts supplies a DOM and text measurement).
 *
 * The SVG holds one group per system (`g.tx-system`, moved into place with a transform) and in it one group
 * per bar (`g.tx-bar`, data-bar = 0-based bar index) plus one group for ties that cross bar lines. Every
 * stroke and fill is `currentColor`, so inline SVG follows the page's light or dark theme.
 */
import type { NotationScore } from "../../lib/rhythm/notation/model";
import { drawTie, type DrawnBar, type TieAnchor } from "./bar";
import { BarCache, planScore, type Plan, type PlannedBar, type RenderOptions } from "./layout";
import { SVGContext, configureVexFlow } from "./vexflow";

export type { RenderOptions } from "./layout";

export interface BarLayout {
  /** 0-based bar index in the score. */
  readonly bar: number;
  readonly system: number;
  /** Horizontal extent of the bar (SVG pixels) and where its notes start and end. */
  readonly x0: number;
  readonly x1: number;
  readonly noteStartX: number;
  readonly noteEndX: number;
  /** x of each counted beat (as the metronome and the playhead count them: 4 in 4/4, 2 in 6/8, 3 in 7/8). */
  readonly beats: readonly number[];
}

export interface SystemLayout {
  readonly index: number;
  /** Top of the system and its height (SVG pixels). */
  readonly y: number;
  readonly height: number;
  /** Top line of the kit staff and bottom line of the lowest staff (SVG pixels). */
  readonly staffTop: number;
  readonly staffBottom: number;
  readonly bars: readonly number[];
}

/** Positions in CSS pixels of the drawn SVG (layout units × scale). */
export interface ScoreLayout {
  readonly width: number;
  readonly height: number;
  /** CSS pixels per SVG unit (1 unless the drawing was scaled down to fit a narrow width). */
  readonly scale: number;
  readonly systems: readonly SystemLayout[];
  readonly bars: readonly BarLayout[];
}

export interface RenderResult {
  readonly svg: string;
  readonly layout: ScoreLayout;
}

const SVG_NS = "http://www.w3.org/2000/svg";

/**
 * Tidy VexFlow's output: every colour becomes currentColor (theme-aware inline SVG), and the invisible
 * hit-test rectangles and empty paths go (they add bytes and trip some rasterisers).
 */
export function tidySvg(root: Element): void {
  let child = root.firstElementChild;
  while (child) {
    const next = child.nextElementSibling;
    const tag = child.localName;
    if ((tag === "rect" && child.getAttribute("opacity") === "0") || (tag === "path" && !child.getAttribute("d"))) {
      child.remove();
    } else {
      const fill = child.getAttribute("fill");
      if (fill && fill !== "none" && fill !== "currentColor") child.setAttribute("fill", "currentColor");
      const stroke = child.getAttribute("stroke");
      if (stroke && stroke !== "none" && stroke !== "currentColor") child.setAttribute("stroke", "currentColor");
      if (child.firstElementChild) tidySvg(child);
    }
    child = next;
  }
}

/**
 * VexFlow's SVG context with a cheaper save/restore: its state and attributes hold only strings and
 * numbers, so shallow copies do what its structured clones do, at a fraction of the cost (every element
 * drawn saves and restores once).
 */
class InkContext extends SVGContext {
  override save(): this {
    this.stateStack.push({ state: { ...this.state }, attributes: { ...this.attributes } });
    return this;
  }

  override restore(): this {
    const saved = this.stateStack.pop();
    if (saved) {
      this.state = saved.state;
      this.attributes = saved.attributes;
    }
    return this;
  }
}

/** A drawing context on a detached element, drawing in currentColor. */
function inkContext(doc: Document): InkContext {
  const ctx = new InkContext(doc.createElement("div"));
  ctx.setFillStyle("currentColor");
  ctx.setStrokeStyle("currentColor");
  return ctx;
}

/** Draw a bar into a fresh `g.tx-bar` (system coordinates). */
export function drawBarGroup(doc: Document, score: NotationScore, planned: PlannedBar, plan: Plan, cache: BarCache): { group: SVGGElement; drawn: DrawnBar } {
  const ctx = inkContext(doc);
  const build = cache.build(score, score.bars[planned.index]!, planned.flags);
  const drawn = build.draw(ctx, planned.x, planned.width, plan.systems[planned.system]!.geometry);
  const group = doc.createElementNS(SVG_NS, "g") as SVGGElement;
  group.setAttribute("class", "tx-bar");
  group.setAttribute("data-bar", String(planned.index));
  const svg = ctx.svg;
  while (svg.firstChild) group.appendChild(svg.firstChild);
  tidySvg(group);
  return { group, drawn };
}

/** The ties crossing bar lines in one system, and half ties at its edges. */
export function drawSystemTies(doc: Document, bars: readonly DrawnBar[]): SVGGElement {
  const ctx = inkContext(doc);
  const match = (a: TieAnchor, b: TieAnchor) => a.midi === b.midi && a.staff === b.staff;
  bars.forEach((bar, k) => {
    const next = bars[k + 1];
    for (const out of bar.tiesOut) {
      const into = next?.tiesIn.find((t) => match(t, out));
      drawTie(ctx, out, into ?? { x: bar.tieExitX, y: out.y }, out.direction);
    }
    const prev = bars[k - 1];
    for (const into of bar.tiesIn) {
      if (prev?.tiesOut.some((t) => match(t, into))) continue;
      drawTie(ctx, { x: bar.tieEntryX, y: into.y }, into, into.direction);
    }
  });
  const group = doc.createElementNS(SVG_NS, "g") as SVGGElement;
  group.setAttribute("class", "tx-ties");
  const svg = ctx.svg;
  while (svg.firstChild) group.appendChild(svg.firstChild);
  tidySvg(group);
  return group;
}

/** Layout of a plan once its bars are drawn, in CSS pixels of the drawing. */
export function layoutOf(plan: Plan, drawn: ReadonlyMap<number, DrawnBar>): ScoreLayout {
  const k = plan.scale;
  const r = (v: number) => Math.round(v * k * 100) / 100;
  return {
    width: plan.width,
    height: plan.height,
    scale: k,
    systems: plan.systems.map((s) => {
      const g = s.geometry;
      const bottom = g.bassTop > 0 ? g.bassTop + 40 : g.kitTop + 40;
      return { index: s.index, y: r(s.y), height: r(g.height), staffTop: r(s.y + g.kitTop), staffBottom: r(s.y + bottom), bars: s.bars };
    }),
    bars: plan.bars.map((b) => {
      const d = drawn.get(b.index)!;
      return {
        bar: b.index,
        system: b.system,
        x0: r(b.x),
        x1: r(b.x + b.width),
        noteStartX: r(d.noteStartX),
        noteEndX: r(d.noteEndX),
        beats: d.beats.map(r),
      };
    }),
  };
}

/** An accessible name for the drawing. */
export function describeScore(score: NotationScore, bars: number): string {
  const { beatsPerBar, beatUnit } = score.meter;
  const bpm = Math.round(Number(evalRational(score.tempo.bpm)) * 10) / 10;
  const parts = [`${beatsPerBar}/${beatUnit}`, `${bpm} bpm`, `${bars} ${bars === 1 ? "bar" : "bars"}`, score.hasKeys ? "drum kit and keys" : "drum kit"];
  return `Notation: ${parts.join(", ")}`;
}

function evalRational(r: string): number {
  const slash = r.indexOf("/");
  return slash < 0 ? Number(r) : Number(r.slice(0, slash)) / Number(r.slice(slash + 1));
}

/** An <svg> carrying what VexFlow's own root element would (its groups only write attributes that differ). */
export function createInkSvg(doc: Document, theme?: RenderOptions["theme"]): SVGSVGElement {
  const svg = doc.createElementNS(SVG_NS, "svg") as SVGSVGElement;
  svg.setAttribute("xmlns", SVG_NS);
  svg.setAttribute("fill", "currentColor");
  svg.setAttribute("stroke", "currentColor");
  svg.setAttribute("stroke-width", "1");
  svg.setAttribute("font-family", "Bravura,Academico");
  svg.setAttribute("font-size", "10pt");
  svg.setAttribute("font-weight", "normal");
  svg.setAttribute("font-style", "normal");
  if (theme?.color) svg.setAttribute("color", theme.color);
  return svg;
}

/** Create the root <svg> for a plan. */
export function createRoot(doc: Document, plan: Plan, label: string, theme?: RenderOptions["theme"]): SVGSVGElement {
  const svg = createInkSvg(doc, theme);
  svg.setAttribute("class", "tx-score");
  sizeRoot(svg, plan);
  svg.setAttribute("role", "img");
  svg.setAttribute("aria-label", label);
  if (theme?.background) svg.setAttribute("style", `background:${theme.background}`);
  return svg;
}

export function sizeRoot(svg: SVGSVGElement, plan: Plan): void {
  svg.setAttribute("width", String(plan.width));
  svg.setAttribute("height", String(plan.height));
  svg.setAttribute("viewBox", `0 0 ${plan.layoutWidth} ${plan.layoutHeight}`);
}

/** A `g.tx-system` placed at its y. */
export function createSystemGroup(doc: Document, y: number, index: number): SVGGElement {
  const g = doc.createElementNS(SVG_NS, "g") as SVGGElement;
  g.setAttribute("class", "tx-system");
  g.setAttribute("data-system", String(index));
  g.setAttribute("transform", `translate(0,${y})`);
  return g;
}

/**
 * Draw a whole score (or a range of its bars) as an SVG string, with the layout of every bar and beat.
 * Needs a DOM (`document`): the browser's, or the one ./server.ts provides.
 * @example const { svg, layout } = renderScoreSvg(spellGroove(doc), { width: 800 })
 */
export function renderScoreSvg(score: NotationScore, opts: RenderOptions): RenderResult {
  configureVexFlow();
  const doc = document;
  const cache = new BarCache();
  const plan = planScore(score, opts, cache);
  const root = createRoot(doc, plan, describeScore(score, plan.bars.length), opts.theme);
  const drawn = new Map<number, DrawnBar>();
  for (const system of plan.systems) {
    const g = createSystemGroup(doc, system.y, system.index);
    const inSystem: DrawnBar[] = [];
    for (const planned of plan.bars.filter((b) => b.system === system.index)) {
      const { group, drawn: d } = drawBarGroup(doc, score, planned, plan, cache);
      g.appendChild(group);
      drawn.set(planned.index, d);
      inSystem.push(d);
    }
    g.appendChild(drawSystemTies(doc, inSystem));
    root.appendChild(g);
  }
  cache.settle();
  return { svg: root.outerHTML, layout: layoutOf(plan, drawn) };
}
