/**
 * The play island's engine, loaded on the first press of play (it brings Tone.js through the audio adapter).
 * Plays one reading and moves a playhead over every drawing of every reading on the page from one clock: the
 * bar and beat the player reports, extrapolated between reports with the page's clock, so the playhead glides.
 * On a compare page the other readings follow the same sound: a reading that sounds `offset` seconds later is
 * shown `offset` seconds further on (wrapped around its loop).
 */
import { createPlayer, installTestHook } from "../../adapters/tone";
import type { GrooveDocument } from "../../lib/rhythm/document";
import { barLength } from "../../lib/rhythm/document";
import { beatStarts } from "../../lib/rhythm/meter";
import { buildPlaybackPlan, type BeatMark, type PlaybackOptions, type PlaybackPlan } from "../../lib/rhythm/playback-plan";
import type { IslandData, IslandLayout } from "./island-data";
import type { IslandState, Session } from "./island";

interface Drawn {
  head: HTMLElement;
  line: HTMLElement;
  layout: IslandLayout;
  /** Written bar → its entry in layout.bars. */
  bars: Map<number, number[]>;
}

interface Reading {
  doc: GrooveDocument;
  drawn: Drawn[];
  /** Time-signature beat index where each counted beat starts (6/8 in two: [0, 3]). */
  beatIndex: number[];
  /** Seconds of each counted beat. */
  beatSeconds: number[];
  /** The whole groove as a loop (for following another reading). */
  cycle: PlaybackPlan;
  barSeconds: number;
}

/** Index of the last beat mark at or before t (-1 before the first). */
function markIndex(beats: readonly BeatMark[], t: number): number {
  let lo = 0;
  let hi = beats.length - 1;
  let found = -1;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    if (beats[mid]!.time <= t + 1e-9) {
      found = mid;
      lo = mid + 1;
    } else hi = mid - 1;
  }
  return found;
}

function prepare(root: HTMLElement, data: IslandData): Reading[] {
  const figures = Array.from(root.querySelectorAll<HTMLElement>(".tx-notation"));
  return data.readings.map((r, k) => {
    const figure = figures.find((f) => Number(f.dataset.reading ?? 0) === k);
    const heads = figure ? Array.from(figure.querySelectorAll<HTMLElement>(".tx-playhead")) : [];
    const drawn = heads.flatMap((head, i) => {
      const layout = r.layouts[i];
      const line = head.querySelector<HTMLElement>(".tx-line") ?? head;
      return layout ? [{ head, line, layout, bars: new Map(layout.bars.map((b) => [b[0]!, b])) }] : [];
    });
    const doc = r.doc;
    const starts = beatStarts(doc.meter);
    const bar = barLength(doc.meter);
    const cycle = buildPlaybackPlan(doc, { loopRange: { startBar: 0, endBar: doc.bars } });
    const beatSeconds = starts.map((s, i) => ((starts[i + 1] ?? bar).sub(s).valueOf()) * cycle.secondsPerWhole);
    return {
      doc,
      drawn,
      beatIndex: starts.map((s) => Math.round(s.mul(doc.meter.beatUnit).valueOf())),
      beatSeconds,
      cycle,
      barSeconds: bar.valueOf() * cycle.secondsPerWhole,
    };
  });
}

function hide(reading: Reading): void {
  for (const d of reading.drawn) d.head.hidden = true;
}

/** Put the reading's playheads at time t of `plan`. */
function place(reading: Reading, plan: PlaybackPlan, t: number): void {
  const i = markIndex(plan.beats, t);
  const mark = plan.beats[i];
  if (!mark || mark.countIn) return hide(reading);
  const next = plan.beats[i + 1];
  const span = next && next.time > mark.time && next.time - mark.time < reading.barSeconds ? next.time - mark.time : (reading.beatSeconds[mark.beat] ?? 1);
  const frac = Math.min(1, Math.max(0, (t - mark.time) / span));
  for (const d of reading.drawn) {
    const entry = d.bars.get(mark.bar);
    const sys = entry ? d.layout.sys[entry[1]!] : undefined;
    if (!entry || !sys) {
      d.head.hidden = true;
      continue;
    }
    const tsBeat = (k: number) => entry[4 + (reading.beatIndex[k] ?? 0)] ?? entry[2]!;
    const x0 = tsBeat(mark.beat);
    const x1 = mark.beat + 1 < reading.beatIndex.length ? tsBeat(mark.beat + 1) : entry[3]!;
    const x = x0 + (x1 - x0) * frac;
    // Transforms only: moving the playhead must not count as a layout shift.
    d.head.style.transform = `translate(${((x / d.layout.w) * 100).toFixed(3)}%, ${((sys[0] / d.layout.h) * 100).toFixed(3)}%)`;
    d.line.style.height = `${(((sys[1] - sys[0]) / d.layout.h) * 100).toFixed(3)}%`;
    d.head.hidden = false;
  }
}

const wrap = (x: number, len: number) => (len > 0 ? ((x % len) + len) % len : x);

/**
 * A playing session for one island.
 * @example const s = createSession(root, data); await s.play({ loop: true, metronome: false, reading: 0 });
 */
export function createSession(root: HTMLElement, data: IslandData): Session {
  const player = createPlayer();
  const readings = prepare(root, data);
  const stopped = new Set<() => void>();
  let playingIndex = 0;
  let plan: PlaybackPlan | null = null;
  let startOffset = 0;
  let clock: { t: number; at: number } | null = null;
  let raf = 0;

  const optionsFor = (state: IslandState, doc: GrooveDocument): PlaybackOptions => ({
    loopRange: state.loop ? { startBar: 0, endBar: doc.bars } : null,
    metronome: state.metronome,
    countInBars: 0,
    startBar: Math.min(doc.bars - 1, Math.max(0, data.startBar)),
  });

  const frame = () => {
    raf = 0;
    if (!clock || !plan) return;
    let t = clock.t + (performance.now() - clock.at) / 1000;
    if (plan.loop && t >= plan.loop.end) t = plan.loop.start + wrap(t - plan.loop.start, plan.loop.end - plan.loop.start);
    if (!plan.loop) t = Math.min(t, plan.end - 1e-6);
    const played = readings[playingIndex]!;
    place(played, plan, t);
    // Where the played reading is in its own groove (seconds from its first bar), for the others to follow.
    const cycleLength = played.cycle.loop ? played.cycle.loop.end : played.cycle.end;
    const musical = plan.loop && t >= plan.loop.start && plan.loop.start > 0 ? wrap(t - plan.loop.start, cycleLength) : wrap(t + startOffset, cycleLength);
    readings.forEach((r, k) => {
      if (k === playingIndex) return;
      const a = data.offsets[k];
      const b = data.offsets[playingIndex];
      const shift = a !== null && a !== undefined && b !== null && b !== undefined ? a - b : 0;
      const len = r.cycle.loop ? r.cycle.loop.end - r.cycle.loop.start : r.cycle.end;
      place(r, r.cycle, wrap(musical + shift, len));
    });
    raf = requestAnimationFrame(frame);
  };

  const halt = () => {
    clock = null;
    if (raf) cancelAnimationFrame(raf);
    raf = 0;
    readings.forEach(hide);
  };

  player.onPosition((p) => {
    if (!p) return halt();
    clock = { t: p.time, at: performance.now() };
    if (!raf) raf = requestAnimationFrame(frame);
  });
  player.onEnded(() => {
    halt();
    stopped.forEach((cb) => cb());
  });

  return {
    async play(state) {
      playingIndex = Math.min(readings.length - 1, Math.max(0, state.reading));
      const doc = readings[playingIndex]!.doc;
      const options = optionsFor(state, doc);
      plan = buildPlaybackPlan(doc, options);
      const first = plan.body.indexOf(options.startBar ?? 0);
      startOffset = Math.max(0, first) * readings[playingIndex]!.barSeconds;
      halt();
      installTestHook(doc, options);
      await player.play(doc, options);
    },
    update(state) {
      const doc = readings[playingIndex]!.doc;
      const options = optionsFor(state, doc);
      plan = buildPlaybackPlan(doc, options);
      installTestHook(doc, options);
      player.update(doc, options);
    },
    stop() {
      player.stop();
      halt();
    },
    onStopped(cb) {
      stopped.add(cb);
    },
  };
}
