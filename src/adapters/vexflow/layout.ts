/**
 * Bars into systems: measure each bar's minimum width with the Formatter, fill each system greedily, and
 * give every bar of a system the same room for its notes (so bars line up and one changed bar moves nothing
 * else while the line breaks stay put).
 */
import type { NotationBar, NotationScore } from "../../lib/rhythm/notation/model";
import { BarBuild, systemGeometry, type BarFlags, type SystemGeometry } from "./bar";
import { Stave, configureVexFlow } from "./vexflow";

export interface RenderOptions {
  /** Width available, CSS pixels. */
  readonly width: number;
  /** Draw the keys grand staff (when the score has keys). Default true. */
  readonly showKeys?: boolean;
  /** First bar to draw (0-based, inclusive) and the bar after the last one (exclusive). */
  readonly fromBar?: number;
  readonly toBar?: number;
  /** Most bars on one system (default 4: grooves read in phrases of four bars). */
  readonly maxBarsPerSystem?: number;
  /**
   * Colours. By default the SVG draws in `currentColor` and inherits the page's text colour (light and dark
   * themes both work); give a colour for a standalone file or a rasterised image.
   */
  readonly theme?: { readonly color?: string; readonly background?: string };
}

export interface PlannedBar {
  /** Index into score.bars. */
  readonly index: number;
  readonly system: number;
  readonly x: number;
  readonly width: number;
  readonly flags: BarFlags;
}

export interface PlannedSystem {
  readonly index: number;
  readonly y: number;
  readonly bars: readonly number[];
  readonly geometry: SystemGeometry;
}

export interface Plan {
  /** Width and height of the drawing in CSS pixels. */
  readonly width: number;
  readonly height: number;
  /** CSS pixels per layout unit: below MIN_LAYOUT_WIDTH the drawing is laid out wider and scaled down. */
  readonly scale: number;
  /** Width and height in layout units (the SVG viewBox). */
  readonly layoutWidth: number;
  readonly layoutHeight: number;
  readonly systems: readonly PlannedSystem[];
  readonly bars: readonly PlannedBar[];
}

const SYSTEM_GAP = 18;
/** Narrower drawings are laid out at this width and scaled down, so a phone still gets a readable bar. */
export const MIN_LAYOUT_WIDTH = 540;

/** Content of a bar as drawn: the cache key for measurements and drawings. */
export function barContentKey(bar: NotationBar, keys: boolean): string {
  const cached = contentKeys.get(bar);
  if (cached && cached[0] === keys) return cached[1];
  const key = JSON.stringify([bar.length, bar.kit, keys ? bar.keys : null]);
  contentKeys.set(bar, [keys, key]);
  return key;
}

/** Content keys by bar object: one JSON serialisation per bar per render, not one per use. */
const contentKeys = new WeakMap<NotationBar, [boolean, string]>();

function flagsKey(f: BarFlags): string {
  return `${+f.systemStart}${+f.timeSignature}${+f.tempo}${+f.final}${+f.keys}|${f.barNumber ?? ""}|${f.section ?? ""}`;
}

export function barKey(bar: NotationBar, planned: PlannedBar): string {
  return `${barContentKey(bar, planned.flags.keys)}|${flagsKey(planned.flags)}|${planned.x}|${planned.width}`;
}

/**
 * Measures bars and hands out builds. A build made to measure a bar is reused for drawing it when its flags
 * turn out the same, so a changed bar is built once.
 */
export class BarCache {
  private readonly notes = new Map<string, number>();
  private readonly starts = new Map<string, number>();
  private pending = new Map<string, BarBuild>();

  notesWidth(score: NotationScore, bar: NotationBar, guess: BarFlags): number {
    const key = barContentKey(bar, guess.keys);
    let w = this.notes.get(key);
    if (w === undefined) {
      const build = new BarBuild(score, bar, guess);
      w = build.notesWidth();
      this.notes.set(key, w);
      this.pending.set(`${key}|${flagsKey(guess)}`, build);
    }
    return w;
  }

  /** Width of the clefs and time signature a bar starts with (depends on the flags only). */
  startWidth(score: NotationScore, flags: Pick<BarFlags, "systemStart" | "timeSignature" | "keys">): number {
    const key = `${+flags.systemStart}${+flags.timeSignature}${+flags.keys}|${score.meter.beatsPerBar}/${score.meter.beatUnit}`;
    let w = this.starts.get(key);
    if (w === undefined) {
      configureVexFlow();
      w = 0;
      for (const clef of flags.keys ? ["percussion", "treble", "bass"] : ["percussion"]) {
        const s = new Stave(0, 0, 400);
        if (flags.systemStart) s.addClef(clef);
        if (flags.timeSignature) s.addTimeSignature(`${score.meter.beatsPerBar}/${score.meter.beatUnit}`);
        w = Math.max(w, s.getNoteStartX());
      }
      this.starts.set(key, w);
    }
    return w;
  }

  build(score: NotationScore, bar: NotationBar, flags: BarFlags): BarBuild {
    const key = `${barContentKey(bar, flags.keys)}|${flagsKey(flags)}`;
    const b = this.pending.get(key);
    if (b) {
      this.pending.delete(key);
      return b;
    }
    return new BarBuild(score, bar, flags);
  }

  /** Drop builds that were measured but not drawn (call after each render). */
  settle(): void {
    this.pending = new Map();
    if (this.notes.size > 4000) this.notes.clear();
  }
}

/** The bars a render covers. */
export function barRange(score: NotationScore, opts: RenderOptions): { from: number; to: number } {
  const n = score.bars.length;
  const from = Math.max(0, Math.min(n, Math.floor(opts.fromBar ?? 0)));
  const to = Math.max(from, Math.min(n, Math.floor(opts.toBar ?? n)));
  return { from, to };
}

/** Section names by the bar they start at (with "xn" when the section repeats). */
function sectionStarts(score: NotationScore): Map<number, string> {
  const m = new Map<number, string>();
  for (const s of score.sections) {
    const name = s.repeats > 1 ? `${s.name} x${s.repeats}` : s.name;
    if (name.trim()) m.set(s.startBar, name);
  }
  return m;
}

/** Systems of an earlier plan, to keep while they fit (for a drawing that is being edited). */
export interface KeptLines {
  readonly signature: string;
  readonly lines: readonly (readonly number[])[];
}

/** What line breaks depend on besides the bars: kept lines are only reused under the same signature. */
function planSignature(opts: RenderOptions, keys: boolean, from: number): string {
  return `${Math.floor(opts.width)}|${keys}|${from}|${opts.maxBarsPerSystem ?? 4}`;
}

/** The lines of a plan, to pass as `keep` to the next planScore of the same drawing. */
export function keptLines(plan: Plan, opts: RenderOptions, score: NotationScore): KeptLines {
  const keys = (opts.showKeys ?? true) && score.hasKeys;
  return { signature: planSignature(opts, keys, barRange(score, opts).from), lines: plan.systems.map((s) => s.bars) };
}

/**
 * Plan the systems for a width.
 * @example planScore(score, { width: 800 }, new BarCache()).systems.length // 2 for an 8-bar groove
 */
export function planScore(score: NotationScore, opts: RenderOptions, cache: BarCache, keep?: KeptLines): Plan {
  const keys = (opts.showKeys ?? true) && score.hasKeys;
  const { from, to } = barRange(score, opts);
  const maxBars = Math.max(1, Math.floor(opts.maxBarsPerSystem ?? 4));
  const left = keys ? 26 : 10;
  const right = 2;
  const cssWidth = Math.max(1, Math.floor(opts.width));
  const layoutWidth = Math.max(cssWidth, MIN_LAYOUT_WIDTH);
  const avail = layoutWidth - left - right;
  const pad = Stave.defaultPadding;
  const sections = sectionStarts(score);

  const flagsFor = (i: number, start: boolean): BarFlags => ({
    systemStart: start,
    timeSignature: i === from,
    tempo: i === from,
    barNumber: start ? i + 1 : null,
    section: sections.get(i) ?? null,
    final: i === score.bars.length - 1,
    keys,
  });

  // A bar is measured with the flags it will most likely be drawn with (a system start where the kept lines
  // start one), so the build made to measure it is also the one drawn.
  const kept = keep?.signature === planSignature(opts, keys, from) ? keep.lines : [];
  const keptStarts = new Set(kept.map((line) => line[0]));
  const notes: number[] = [];
  for (let i = from; i < to; i++) notes.push(cache.notesWidth(score, score.bars[i]!, flagsFor(i, i === from || keptStarts.has(i))));
  const startW = (i: number, start: boolean) => cache.startWidth(score, { systemStart: start, timeSignature: i === from, keys });

  // Line breaking with equal note room per bar. Systems of the previous drawing (`keep`) stay as they were
  // while their bars still fit, so an edit does not reflow the page: a system that no longer fits is broken
  // up on its own, and the systems after it stay. What is not covered is filled greedily.
  const lines: { bars: number[]; area: number }[] = [];
  const fits = (line: readonly number[]) => {
    let fixed = 0;
    let widest = 0;
    line.forEach((b, k) => {
      fixed += startW(b, k === 0) + pad;
      widest = Math.max(widest, notes[b - from]!);
    });
    return { ok: fixed + widest * line.length <= avail, fixed, widest };
  };
  /** Greedy lines over bars [i, end). */
  const greedy = (i: number, end: number) => {
    while (i < end) {
      const bars = [i];
      let fixed = startW(i, true) + pad;
      let widest = notes[i - from]!;
      let j = i + 1;
      while (j < end && bars.length < maxBars) {
        const f = fixed + startW(j, false) + pad;
        const w = Math.max(widest, notes[j - from]!);
        if (f + w * (bars.length + 1) > avail) break;
        bars.push(j);
        fixed = f;
        widest = w;
        j++;
      }
      lines.push({ bars, area: Math.max(widest, (avail - fixed) / bars.length) });
      i = j;
    }
  };
  let i = from;
  for (const line of kept) {
    if (line[0] !== i || line.length === 0 || line.length > maxBars || line[line.length - 1]! >= to) break;
    const f = fits(line);
    if (f.ok) lines.push({ bars: [...line], area: (avail - f.fixed) / line.length });
    else greedy(i, line[line.length - 1]! + 1);
    i = line[line.length - 1]! + 1;
  }
  greedy(i, to);
  // Every system but the last is justified to the full width. The last one keeps the note room of the
  // system before it instead of stretching a lone bar; a single short system gets the room of a full one.
  const nominal = (avail - startW(from, true) - maxBars * pad) / maxBars;
  const plannedBars: PlannedBar[] = [];
  let y = 0;
  const systems: PlannedSystem[] = lines.map((line, s) => {
    const last = s === lines.length - 1;
    const widest = Math.max(...line.bars.map((b) => notes[b - from]!));
    let area = line.area;
    if (last && lines.length > 1) area = Math.max(widest, Math.min(line.area, lines[s - 1]!.area));
    else if (last && line.bars.length < maxBars) area = Math.max(widest, Math.min(line.area, nominal));
    area = Math.floor(area);
    let x = left;
    let marks = false;
    line.bars.forEach((b, k) => {
      const flags = flagsFor(b, k === 0);
      marks ||= flags.tempo || flags.section !== null;
      const width = Math.round(startW(b, k === 0) + area + pad);
      plannedBars.push({ index: b, system: s, x, width, flags });
      x += width;
    });
    const geometry = systemGeometry(keys, marks);
    const system = { index: s, y, bars: line.bars, geometry };
    y += geometry.height + SYSTEM_GAP;
    return system;
  });
  const layoutHeight = systems.length === 0 ? systemGeometry(keys).height : y - SYSTEM_GAP;
  const scale = cssWidth / layoutWidth;
  return { width: cssWidth, height: Math.ceil(layoutHeight * scale), scale, layoutWidth, layoutHeight, systems, bars: plannedBars };
}
