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

  /** Write anything held back (nothing here; FlatContext merges), before the elements are taken from the context. */
  flush(): void {}
}

/** Attributes VexFlow's SVG context never writes on a path. */
const NOT_ON_PATHS = new Set(["x", "y", "width", "height", "font-family", "font-weight", "font-style", "font-size"]);

/** An element that FlatContext writes once for many strokes or glyphs. */
interface Merged {
  readonly kind: "path" | "text";
  readonly attrs: readonly (readonly [string, string])[];
  readonly parts: string[];
  readonly xs: number[];
  readonly ys: number[];
}

/**
 * For the page: the same picture in far fewer elements, each of which the browser must create, style and
 * lay out whenever a bar is redrawn.
 *
 * - No VexFlow wrapper groups (a <g> with a class, an id and the colours again around nearly every path and
 *   glyph): each element carries the class of the group it was drawn in ("vf-notehead", "vf-stem", …).
 * - Colours only where they differ from the drawing's own <svg> (createInkSvg), which they inherit.
 * - Strokes that share every attribute become one path of several subpaths (a bar's staff lines, stems and
 *   ledger lines), and one-glyph texts that share every attribute become one text that places each glyph
 *   itself with SVG's x and y lists (a bar's noteheads). Everything is drawn in currentColor, so the order in
 *   which these merged elements come does not change what shows.
 */
class FlatContext extends InkContext {
  /** Per open group: its class, and whether a real <g> stands for it (a rotation needs one). */
  private readonly open: { cls: string; real: boolean }[] = [];
  private readonly merged = new Map<string, Merged>();

  constructor(element: HTMLElement) {
    super(element);
    // Elements inherit these from the drawing's <svg> (createInkSvg), so they need not repeat them.
    const root = this.groupAttributes[0]!;
    root.fill = "currentColor";
    root.stroke = "currentColor";
  }

  override openGroup(cls?: string): SVGGElement {
    this.open.push({ cls: cls ? `vf-${cls}` : (this.open.at(-1)?.cls ?? ""), real: false });
    return this.parent;
  }

  override closeGroup(): void {
    if (this.open.pop()?.real) super.closeGroup();
  }

  override openRotation(angleDegrees: number, x: number, y: number): void {
    super.openGroup().setAttribute("transform", `translate(${x},${y}) rotate(${angleDegrees}) translate(-${x},-${y})`);
    this.open.push({ cls: this.open.at(-1)?.cls ?? "", real: true });
  }

  override add(elem: SVGElement): void {
    const cls = this.open.at(-1)?.cls;
    if (cls) elem.setAttribute("class", cls);
    super.add(elem);
  }

  override stroke(): this {
    if (!this.mergeable()) return super.stroke();
    this.mergeInto("path", { ...this.attributes, fill: "none" }).parts.push(this.path);
    return this;
  }

  override fillText(text: string, x: number, y: number): this {
    if (text.length !== 1 || !this.mergeable()) return super.fillText(text, x, y);
    const m = this.mergeInto("text", { ...this.attributes, stroke: "none" });
    m.parts.push(text);
    m.xs.push(this.round(x));
    m.ys.push(this.round(y));
    return this;
  }

  /** Write the merged paths and texts (after drawing, before the elements are taken from the context). */
  override flush(): void {
    for (const m of this.merged.values()) {
      const el = this.create(m.kind);
      for (const [name, value] of m.attrs) el.setAttribute(name, value);
      if (m.kind === "path") el.setAttribute("d", m.parts.join(""));
      else {
        el.setAttribute("x", m.xs.join(" "));
        el.setAttribute("y", m.ys.join(" "));
        el.textContent = m.parts.join("");
      }
      this.svg.appendChild(el);
    }
    this.merged.clear();
  }

  /** Merging needs the drawing's own attributes as the parent's (not inside a rotation) and no shadow. */
  private mergeable(): boolean {
    return !this.open.some((g) => g.real) && !(Number(this.attributes.shadowBlur) > 0);
  }

  /**
   * The merged element for these attributes: the ones VexFlow's context would write on the element (set,
   * and different from the parent's), colours as tidySvg leaves them, and the class.
   */
  private mergeInto(kind: "path" | "text", attributes: Record<string, unknown>): Merged {
    const parent = this.groupAttributes[this.groupAttributes.length - 1]!;
    const attrs: [string, string][] = [];
    for (const name in attributes) {
      if (kind === "path" && NOT_ON_PATHS.has(name)) continue;
      let value = attributes[name];
      if (!value || value == parent[name]) continue;
      if ((name === "fill" || name === "stroke") && value !== "none") value = "currentColor";
      if (value == parent[name]) continue;
      attrs.push([name, String(value)]);
    }
    const cls = this.open.at(-1)?.cls;
    if (cls) attrs.push(["class", cls]);
    const key = `${kind}|${attrs.map(([n, v]) => `${n}=${v}`).join("|")}`;
    let m = this.merged.get(key);
    if (!m) this.merged.set(key, (m = { kind, attrs, parts: [], xs: [], ys: [] }));
    return m;
  }
}

/** A drawing context on a detached element, drawing in currentColor (flat: see FlatContext). */
function inkContext(doc: Document, flat = false): InkContext {
  const ctx = flat ? new FlatContext(doc.createElement("div")) : new InkContext(doc.createElement("div"));
  ctx.setFillStyle("currentColor");
  ctx.setStrokeStyle("currentColor");
  return ctx;
}

/**
 * Draw a bar into a fresh `g.tx-bar` (system coordinates). `flat` draws it in far fewer elements (see
 * FlatContext), for the browser's live drawing; the server keeps VexFlow's structure.
 */
export function drawBarGroup(
  doc: Document,
  score: NotationScore,
  planned: PlannedBar,
  plan: Plan,
  cache: BarCache,
  flat = false,
): { group: SVGGElement; drawn: DrawnBar } {
  const ctx = inkContext(doc, flat);
  const build = cache.build(score, score.bars[planned.index]!, planned.flags);
  const drawn = build.draw(ctx, planned.x, planned.width, plan.systems[planned.system]!.geometry);
  const group = doc.createElementNS(SVG_NS, "g") as SVGGElement;
  group.setAttribute("class", "tx-bar");
  group.setAttribute("data-bar", String(planned.index));
  ctx.flush();
  const svg = ctx.svg;
  while (svg.firstChild) group.appendChild(svg.firstChild);
  tidySvg(group);
  return { group, drawn };
}

/** The ties crossing bar lines in one system, and half ties at its edges. */
export function drawSystemTies(doc: Document, bars: readonly DrawnBar[], flat = false): SVGGElement {
  const ctx = inkContext(doc, flat);
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
  ctx.flush();
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
