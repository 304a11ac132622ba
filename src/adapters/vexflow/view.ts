/**
 * Live notation in the browser: draws a score into an element and, on each update, redraws only the bars
 * whose content or place changed (a bar's key is its content, flags, x and width), plus the cross-bar ties
 * of the systems they sit in.
 *
 * Unlike the server's single SVG (./render.ts), each bar here is its own small <svg>, placed absolutely over
 * the bar's box (content may overflow it), and each system's ties are one more. The browser then repaints
 * only the bar that changed: one SVG for the whole score repaints all of it on every edit, which measured
 * two to three times slower in chromium. The groups are the server's (g.tx-bar, g.tx-ties), drawn in far fewer
 * elements (FlatContext in ./render.ts), since each costs the browser style and layout work on every redraw.
 *
 * A playhead overlay (two absolutely placed boxes) marks the playing bar and beat without touching the SVG.
 */
import type { NotationScore } from "../../lib/rhythm/notation/model";
import type { DrawnBar } from "./bar";
import { BarCache, barKey, keptLines, planScore, type KeptLines, type Plan, type PlannedBar, type RenderOptions } from "./layout";
import { createInkSvg, describeScore, drawBarGroup, drawSystemTies, layoutOf, type ScoreLayout } from "./render";
import { configureVexFlow } from "./vexflow";

export interface PlayPosition {
  /** 0-based bar index in the score and 0-based counted beat (as the playback plan counts them). */
  readonly bar: number;
  readonly beat: number;
}

interface LiveBar {
  key: string;
  system: number;
  svg: SVGSVGElement;
  drawn: DrawnBar;
}

export interface UpdateStats {
  /** Bars drawn in this update (the others were kept). */
  readonly barsDrawn: number;
  readonly bars: number;
  readonly ms: number;
}

/**
 * An incremental notation drawing inside `host`.
 * @example const r = new NotationRenderer(div); r.update(score, { width: 800 }); r.highlight({ bar: 0, beat: 2 })
 */
export class NotationRenderer {
  /** The drawing: a box of the drawing's size holding the bar and tie SVGs and the playhead marks. */
  readonly canvas: HTMLDivElement;
  private readonly barBox: HTMLDivElement;
  private readonly beatLine: HTMLDivElement;
  private bars = new Map<number, LiveBar>();
  private ties: SVGSVGElement[] = [];
  private readonly cache = new BarCache();
  private themeKey = "";
  private current: ScoreLayout | null = null;
  private lines: KeptLines | null = null;
  private playhead: PlayPosition | null = null;
  /** What the last update did (for benchmarks and tests). */
  lastStats: UpdateStats = { barsDrawn: 0, bars: 0, ms: 0 };

  constructor(private readonly host: HTMLElement) {
    configureVexFlow();
    const doc = host.ownerDocument;
    this.canvas = doc.createElement("div");
    this.canvas.className = "tx-notation-canvas";
    this.canvas.setAttribute("role", "img");
    Object.assign(this.canvas.style, { position: "relative", maxWidth: "100%" });
    this.barBox = overlay(doc, "tx-playhead-bar", "var(--tx-playhead-bar, rgba(245, 166, 35, 0.16))");
    this.beatLine = overlay(doc, "tx-playhead-beat", "var(--tx-playhead-beat, rgba(245, 130, 35, 0.85))");
    this.canvas.append(this.barBox, this.beatLine);
    host.appendChild(this.canvas);
  }

  /** The layout of the last drawing (CSS pixels inside the drawing). */
  get layout(): ScoreLayout | null {
    return this.current;
  }

  /** Draw `score`, redrawing only what changed since the last call. */
  update(score: NotationScore, opts: RenderOptions): ScoreLayout {
    const t0 = performance.now();
    const doc = this.host.ownerDocument;
    const plan = planScore(score, opts, this.cache, this.lines ?? undefined);
    this.lines = keptLines(plan, opts, score);
    const themeKey = JSON.stringify(opts.theme ?? {});
    if (themeKey !== this.themeKey) this.clear(themeKey);
    this.canvas.style.width = `${plan.width}px`;
    this.canvas.style.height = `${plan.height}px`;
    this.canvas.style.background = opts.theme?.background ?? "";
    this.canvas.setAttribute("aria-label", describeScore(score, plan.bars.length));

    let barsDrawn = 0;
    const seen = new Set<number>();
    const changedSystems = new Set<number>();
    for (const planned of plan.bars) {
      seen.add(planned.index);
      const key = `${barKey(score.bars[planned.index]!, planned)}|${geometryKey(plan, planned.system)}`;
      const old = this.bars.get(planned.index);
      if (old && old.key === key) {
        // Same drawing; its system may have moved up or down, or been renumbered.
        const top = `${plan.systems[planned.system]!.y * plan.scale}px`;
        if (old.svg.style.top !== top) old.svg.style.top = top;
        if (old.system !== planned.system) {
          changedSystems.add(old.system);
          changedSystems.add(planned.system);
          old.system = planned.system;
        }
        continue;
      }
      const { group, drawn } = drawBarGroup(doc, score, planned, plan, this.cache, true);
      const svg = this.pieceSvg(doc, plan, planned.system, opts, planned);
      svg.setAttribute("data-bar", String(planned.index));
      svg.appendChild(group);
      if (old) old.svg.replaceWith(svg);
      else this.canvas.insertBefore(svg, this.barBox);
      if (old) changedSystems.add(old.system);
      this.bars.set(planned.index, { key, system: planned.system, svg, drawn });
      changedSystems.add(planned.system);
      barsDrawn++;
    }
    for (const [index, live] of this.bars) {
      if (seen.has(index)) continue;
      live.svg.remove();
      this.bars.delete(index);
      changedSystems.add(live.system);
    }
    // Ties across bar lines, one SVG per system, redrawn with any bar of their system.
    for (let s = plan.systems.length; s < this.ties.length; s++) this.ties[s]?.remove();
    this.ties.length = Math.min(this.ties.length, plan.systems.length);
    for (const system of plan.systems) {
      const old = this.ties[system.index];
      if (old && !changedSystems.has(system.index) && old.dataset.y === String(system.y)) continue;
      const drawnBars = system.bars.map((b) => this.bars.get(b)!.drawn);
      const svg = this.pieceSvg(doc, plan, system.index, opts);
      svg.dataset.y = String(system.y);
      svg.appendChild(drawSystemTies(doc, drawnBars, true));
      if (old) old.replaceWith(svg);
      else this.canvas.insertBefore(svg, this.barBox);
      this.ties[system.index] = svg;
    }
    this.cache.settle();

    const drawnMap = new Map<number, DrawnBar>();
    for (const [index, live] of this.bars) drawnMap.set(index, live.drawn);
    this.current = layoutOf(plan, drawnMap);
    this.highlight(this.playhead);
    this.lastStats = { barsDrawn, bars: plan.bars.length, ms: performance.now() - t0 };
    return this.current;
  }

  /**
   * An <svg> over one bar's box (or a whole system's width for its ties), in the system's coordinates.
   * Content reaching past the box (bar numbers, the brace, marks) still shows: overflow is visible.
   */
  private pieceSvg(doc: Document, plan: Plan, system: number, opts: RenderOptions, bar?: PlannedBar): SVGSVGElement {
    const sys = plan.systems[system]!;
    const k = plan.scale;
    const x = bar ? bar.x : 0;
    const w = bar ? bar.width : plan.layoutWidth;
    const h = sys.geometry.height;
    const svg = createInkSvg(doc, opts.theme);
    svg.setAttribute("class", bar ? "tx-score-bar" : "tx-score-ties");
    svg.setAttribute("aria-hidden", "true");
    svg.setAttribute("width", String(w * k));
    svg.setAttribute("height", String(h * k));
    svg.setAttribute("viewBox", `${x} 0 ${w} ${h}`);
    svg.setAttribute("overflow", "visible");
    Object.assign(svg.style, { position: "absolute", left: `${x * k}px`, top: `${sys.y * k}px`, overflow: "visible", pointerEvents: "none" });
    return svg;
  }

  private clear(themeKey: string): void {
    for (const live of this.bars.values()) live.svg.remove();
    for (const t of this.ties) t?.remove();
    this.bars.clear();
    this.ties = [];
    this.themeKey = themeKey;
  }

  /** Mark the playing bar and beat (null hides the marks). Moves two boxes; the SVG is untouched. */
  highlight(pos: PlayPosition | null): void {
    this.playhead = pos;
    const layout = this.current;
    const bar = pos && layout ? layout.bars.find((b) => b.bar === pos.bar) : undefined;
    if (!pos || !layout || !bar) {
      this.barBox.style.display = "none";
      this.beatLine.style.display = "none";
      return;
    }
    const system = layout.systems[bar.system]!;
    const top = system.staffTop - 10 * layout.scale;
    const height = system.staffBottom - system.staffTop + 20 * layout.scale;
    place(this.barBox, bar.x0, top, bar.x1 - bar.x0, height);
    const x = bar.beats[Math.max(0, Math.min(bar.beats.length - 1, pos.beat))] ?? bar.noteStartX;
    place(this.beatLine, x - 1, top, 2, height);
  }

  dispose(): void {
    this.canvas.remove();
    this.bars.clear();
    this.ties = [];
  }
}

/** Bars drawn by warmUp, and how many times each. */
const WARM_BARS = 4;
const WARM_ROUNDS = 3;

/**
 * Draw the score's first bars off-screen a few times, one bar per idle moment, so that the browser has
 * compiled the drawing code before the first edit: the first edits otherwise take up to half as long again
 * as later ones. Returns a function that stops what is not done yet.
 * @example const stop = warmUp(score, { width: 800 }); // … later, on unmount: stop()
 */
export function warmUp(score: NotationScore, opts: RenderOptions): () => void {
  const bars = Math.min(score.bars.length, WARM_BARS);
  if (typeof requestIdleCallback === "undefined" || bars === 0) return () => {};
  let left = bars * WARM_ROUNDS;
  let handle = 0;
  const step = (deadline: IdleDeadline) => {
    while (left > 0 && deadline.timeRemaining() > 6) {
      left--;
      const bar = left % bars;
      // A fresh renderer each time: nothing measured or drawn before is reused, as for an edited bar.
      new NotationRenderer(document.createElement("div")).update(score, { ...opts, fromBar: bar, toBar: bar + 1 });
    }
    if (left > 0) handle = requestIdleCallback(step);
  };
  handle = requestIdleCallback(step);
  return () => cancelIdleCallback(handle);
}

/** What a bar's drawing depends on in its system (not the system's place on the page). */
function geometryKey(plan: Plan, system: number): string {
  const g = plan.systems[system]!.geometry;
  return `${plan.scale}:${g.kitTop}:${g.trebleTop}:${g.bassTop}:${g.height}`;
}

function overlay(doc: Document, className: string, background: string): HTMLDivElement {
  const el = doc.createElement("div");
  el.className = className;
  el.setAttribute("aria-hidden", "true");
  Object.assign(el.style, {
    position: "absolute",
    left: "0",
    top: "0",
    display: "none",
    pointerEvents: "none",
    background,
    borderRadius: "2px",
    willChange: "transform",
  });
  return el;
}

function place(el: HTMLDivElement, x: number, y: number, w: number, h: number): void {
  el.style.display = "block";
  el.style.transform = `translate(${x}px, ${y}px)`;
  el.style.width = `${w}px`;
  el.style.height = `${h}px`;
}
