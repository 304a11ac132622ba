/**
 * Live notation in the browser: draws a score into an element and, on each update, redraws only the bars
 * whose content or place changed (a bar's key is its content, flags, x and width), plus the cross-bar ties
 * of the systems they sit in. A playhead overlay (two absolutely placed boxes) marks the playing bar and
 * beat without touching the SVG.
 */
import type { NotationScore } from "../../lib/rhythm/notation/model";
import type { DrawnBar } from "./bar";
import { BarCache, barKey, keptLines, planScore, type KeptLines, type Plan, type RenderOptions } from "./layout";
import {
  createRoot,
  createSystemGroup,
  describeScore,
  drawBarGroup,
  drawSystemTies,
  layoutOf,
  sizeRoot,
  type ScoreLayout,
} from "./render";
import { configureVexFlow } from "./vexflow";

export interface PlayPosition {
  /** 0-based bar index in the score and 0-based beat of the time signature. */
  readonly bar: number;
  readonly beat: number;
}

interface LiveBar {
  key: string;
  system: number;
  group: SVGGElement;
  drawn: DrawnBar;
}

interface LiveSystem {
  group: SVGGElement;
  y: number;
  ties: SVGGElement | null;
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
  private readonly canvas: HTMLDivElement;
  private readonly barBox: HTMLDivElement;
  private readonly beatLine: HTMLDivElement;
  private root: SVGSVGElement | null = null;
  private systems: LiveSystem[] = [];
  private bars = new Map<number, LiveBar>();
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
    this.canvas.style.position = "relative";
    this.barBox = overlay(doc, "tx-playhead-bar", "var(--tx-playhead-bar, rgba(245, 166, 35, 0.16))");
    this.beatLine = overlay(doc, "tx-playhead-beat", "var(--tx-playhead-beat, rgba(245, 130, 35, 0.85))");
    this.canvas.append(this.barBox, this.beatLine);
    host.appendChild(this.canvas);
  }

  /** The layout of the last drawing (CSS pixels inside the drawing). */
  get layout(): ScoreLayout | null {
    return this.current;
  }

  /** The drawing's <svg> element. */
  get svg(): SVGSVGElement | null {
    return this.root;
  }

  /** Draw `score`, redrawing only what changed since the last call. */
  update(score: NotationScore, opts: RenderOptions): ScoreLayout {
    const t0 = performance.now();
    const doc = this.host.ownerDocument;
    const plan = planScore(score, opts, this.cache, this.lines ?? undefined);
    this.lines = keptLines(plan, opts, score);
    const label = describeScore(score, plan.bars.length);
    const themeKey = JSON.stringify(opts.theme ?? {});
    if (!this.root || themeKey !== this.themeKey) this.reset(doc, plan, label, opts);
    const root = this.root!;
    sizeRoot(root, plan);
    root.setAttribute("aria-label", label);

    let barsDrawn = 0;
    const seen = new Set<number>();
    const drawnBySystem: DrawnBar[][] = plan.systems.map(() => []);
    const changedSystems = new Set<number>();
    for (const system of plan.systems) {
      let live = this.systems[system.index];
      if (!live) {
        live = { group: createSystemGroup(doc, system.y, system.index), y: system.y, ties: null };
        root.appendChild(live.group);
        this.systems[system.index] = live;
        changedSystems.add(system.index);
      } else if (live.y !== system.y) {
        live.group.setAttribute("transform", `translate(0,${system.y})`);
        live.y = system.y;
      }
    }
    for (const planned of plan.bars) {
      seen.add(planned.index);
      const bar = score.bars[planned.index]!;
      const key = `${barKey(bar, planned)}|${geometryKey(plan, planned.system)}`;
      const old = this.bars.get(planned.index);
      if (old && old.key === key && old.system === planned.system) {
        drawnBySystem[planned.system]!.push(old.drawn);
        continue;
      }
      const { group, drawn } = drawBarGroup(doc, score, planned, plan, this.cache);
      barsDrawn++;
      const target = this.systems[planned.system]!.group;
      if (old && old.group.parentNode === target) old.group.replaceWith(group);
      else {
        old?.group.remove();
        target.insertBefore(group, this.systems[planned.system]!.ties);
      }
      if (old && old.system !== planned.system) changedSystems.add(old.system);
      this.bars.set(planned.index, { key, system: planned.system, group, drawn });
      changedSystems.add(planned.system);
      drawnBySystem[planned.system]!.push(drawn);
    }
    for (const [index, live] of this.bars) {
      if (seen.has(index)) continue;
      live.group.remove();
      this.bars.delete(index);
      changedSystems.add(live.system);
    }
    for (const s of changedSystems) {
      const live = this.systems[s];
      if (!live) continue;
      const ties = drawSystemTies(doc, drawnBySystem[s] ?? []);
      if (live.ties) live.ties.replaceWith(ties);
      else live.group.appendChild(ties);
      live.ties = ties;
    }
    while (this.systems.length > plan.systems.length) this.systems.pop()!.group.remove();
    this.cache.settle();

    const drawnMap = new Map<number, DrawnBar>();
    for (const [index, live] of this.bars) drawnMap.set(index, live.drawn);
    this.current = layoutOf(plan, drawnMap);
    this.highlight(this.playhead);
    this.lastStats = { barsDrawn, bars: plan.bars.length, ms: performance.now() - t0 };
    return this.current;
  }

  private reset(doc: Document, plan: Plan, label: string, opts: RenderOptions): void {
    this.root?.remove();
    this.systems = [];
    this.bars.clear();
    this.themeKey = JSON.stringify(opts.theme ?? {});
    this.root = createRoot(doc, plan, label, opts.theme);
    this.root.style.display = "block";
    this.root.style.maxWidth = "100%";
    this.root.style.height = "auto";
    this.canvas.insertBefore(this.root, this.barBox);
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
    this.root = null;
    this.systems = [];
    this.bars.clear();
  }
}

function geometryKey(plan: Plan, system: number): string {
  const g = plan.systems[system]!.geometry;
  return `${system}:${g.kitTop}:${g.trebleTop}:${g.bassTop}`;
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
