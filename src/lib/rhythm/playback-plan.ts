/**
 * The playback plan: everything an audio engine must play for one press of play, laid out on one timeline in
 * seconds, so the engine only has to put each event on its clock. Pure: no audio library here.
 *
 * Layout of the timeline (seconds from the press of play, at the groove's written tempo):
 *
 *   [ count-in ][ first pass, from startBar to the end of the body ][ loop body ] ← repeats while looping
 *
 * - The body is the play order of the loop range: the whole groove in its song form (sections and their
 *   repeats) when the range is every bar, otherwise the written bars of the range, once each.
 * - When the play starts at the body's first bar, the first pass IS the loop body (no duplicate region).
 * - Count-in: `countInBars` bars of metronome clicks at the groove's meter and tempo, downbeat accented,
 *   played once. Metronome: one click per counted beat (see meter.ts: 6/8 clicks dotted quarters), the
 *   first beat of each bar accented.
 * - Open hi-hat: rings until the next closed or foot hi-hat stroke (the foot closes the cymbals), at most
 *   OPEN_HAT_RING_SECONDS. A "choke" articulation stops a cymbal after CHOKE_SECONDS.
 * - Flam: a soft grace stroke FLAM_GRACE_SECONDS before the main stroke (dropped when it would fall before
 *   the start of the timeline; in a loop, the grace of a flam on the loop's first step sounds at the body's end).
 * - Keys notes held across the loop seam (`tiedFromEnd`, see schedule.ts) sound as one note when the loop repeats.
 */
import { barLength, playOrder, type GrooveDocument } from "./document";
import type { Articulation, Dynamic, KitPieceId } from "./kit";
import { beatStarts } from "./meter";
import { compileSchedule, secondsPerWholeNote, type ScheduledEvent } from "./schedule";
import { swingInBar } from "./swing";

/** How long a grace stroke of a flam comes before the main stroke, in seconds (common practice: a few tens of ms). */
export const FLAM_GRACE_SECONDS = 0.025;
/** Velocity of a flam's grace stroke relative to the main stroke (the grace is played softer, common practice). */
export const FLAM_GRACE_VELOCITY_RATIO = 0.5;
/** Longest an open hi-hat rings when nothing closes it. */
export const OPEN_HAT_RING_SECONDS = 1.2;
/** A choked cymbal is grabbed right after the stroke. */
export const CHOKE_SECONDS = 0.12;
/** MIDI velocities of the metronome: accented downbeat, other beats. */
export const CLICK_VELOCITY = { downbeat: 120, beat: 80 } as const;

export type Voice = KitPieceId | "keys" | "click";

export interface PlanEvent {
  /** Seconds from the press of play (count-in included). */
  time: number;
  /** Seconds the sound is held: keys note length, open hi-hat until it is closed, choke; kit hits otherwise nominal. */
  duration: number;
  voice: Voice;
  /** MIDI velocity 1–127. */
  velocity: number;
  /** Keys only: MIDI note number. */
  pitch?: number;
  /** Click only: the first beat of a bar. */
  downbeat?: boolean;
  /** Kit only: the written dynamic of the hit. */
  dynamic?: Dynamic;
  articulation?: Articulation;
  /** Kit only: the soft grace stroke of a flam. */
  grace?: boolean;
  /** Written bar (0-based); count-in clicks have negative bars (-countInBars … -1). */
  bar: number;
  /** Counted beat of the bar the event falls in (0-based). */
  beat: number;
  /** Part of the count-in. */
  countIn?: boolean;
  /** Loop body only: played on the first time through the body, not when the loop repeats (a tied continuation). */
  firstPassOnly?: boolean;
}

/** A counted beat on the timeline, for the playhead. */
export interface BeatMark {
  time: number;
  bar: number;
  beat: number;
  countIn: boolean;
}

export interface PlaybackOptions {
  /** Bars to loop (0-based start, exclusive end), or null to play the groove's play order once. */
  loopRange?: { startBar: number; endBar: number } | null;
  /** Bars of count-in clicks before the groove (0 = none). */
  countInBars?: number;
  /** Click every counted beat while the groove plays. */
  metronome?: boolean;
  /** Written bar to start from (its first place in the body); default: the body's first bar. */
  startBar?: number;
}

export interface PlaybackPlan {
  /** Every event, sorted by time (then click, kit, keys). */
  events: PlanEvent[];
  /** Every counted beat, count-in included, sorted. */
  beats: BeatMark[];
  countInSeconds: number;
  /** Where the loop body starts and ends (seconds); null when the play does not loop. */
  loop: { start: number; end: number } | null;
  /** When a non-looping play is over (the end of the last bar). */
  end: number;
  /** The written bars of the body, in play order. */
  body: number[];
  /** Seconds per whole note at the groove's tempo (the engine converts seconds to its own ticks with it). */
  secondsPerWhole: number;
}

const VOICE_ORDER = (v: Voice) => (v === "click" ? 0 : v === "keys" ? 2 : 1);
const isClosingHat = (e: PlanEvent) => (e.voice === "hihat-closed" && !e.grace) || e.voice === "hihat-foot";

function bodyOrder(doc: GrooveDocument, range: { startBar: number; endBar: number } | null | undefined): number[] {
  if (!range) return playOrder(doc);
  const start = Math.max(0, Math.min(doc.bars - 1, Math.floor(range.startBar)));
  const end = Math.max(start + 1, Math.min(doc.bars, Math.floor(range.endBar)));
  if (start === 0 && end === doc.bars) return playOrder(doc);
  return Array.from({ length: end - start }, (_, i) => start + i);
}

/** Counted beat (index) of a swung offset inside a bar, given the swung beat starts. */
function beatAt(offsetWhole: number, starts: number[]): number {
  let b = 0;
  for (let i = 1; i < starts.length; i++) if (offsetWhole >= starts[i]! - 1e-9) b = i;
  return b;
}

/**
 * Build the playback plan for one press of play.
 * @example
 * const plan = buildPlaybackPlan(doc, { loopRange: { startBar: 0, endBar: doc.bars }, countInBars: 1, metronome: true });
 * plan.events.filter((e) => e.countIn).length // beats in one bar, e.g. 4 in 4/4
 */
export function buildPlaybackPlan(doc: GrooveDocument, options: PlaybackOptions = {}): PlaybackPlan {
  const looping = options.loopRange != null;
  const body = bodyOrder(doc, options.loopRange);
  const spw = secondsPerWholeNote(doc.tempo);
  const bar = barLength(doc.meter);
  const barSeconds = bar.valueOf() * spw;
  const bodySeconds = barSeconds * body.length;
  const countInBars = Math.max(0, Math.floor(options.countInBars ?? 0));
  const countInSeconds = countInBars * barSeconds;
  // Swung beat starts inside a bar (beats normally sit on swing-pair boundaries, so swing rarely moves them).
  const starts = beatStarts(doc.meter).map((s) => swingInBar(s, doc.swing, bar));
  const startPass = Math.max(0, options.startBar == null ? 0 : body.indexOf(options.startBar));
  const startOffset = startPass * barSeconds;

  // One pass of the body (times from the body's start).
  const schedule = compileSchedule(doc, body);
  const pass: PlanEvent[] = [];
  for (const e of schedule) pass.push(...fromScheduled(e, e.time - e.pass * barSeconds, starts, spw));
  if (options.metronome)
    body.forEach((b, p) =>
      starts.forEach((s, i) => pass.push(click(p * barSeconds + s * spw, b, i))),
    );
  sortEvents(pass);
  if (looping) joinTiesAcrossSeam(pass, bodySeconds);
  setHatRings(pass, looping ? bodySeconds : null);

  const events: PlanEvent[] = [];
  const beats: BeatMark[] = [];
  for (let k = 0; k < countInBars; k++)
    starts.forEach((s, i) => {
      const time = k * barSeconds + s * spw;
      events.push({ ...click(time, k - countInBars, i), countIn: true });
      beats.push({ time, bar: k - countInBars, beat: i, countIn: true });
    });
  const markBeats = (offset: number, from: number) => {
    for (let p = from; p < body.length; p++)
      starts.forEach((s, i) => beats.push({ time: offset + (p - from) * barSeconds + s * spw, bar: body[p]!, beat: i, countIn: false }));
  };
  const place = (offset: number, from: number, to: number, firstTime: boolean) => {
    for (const e of pass) {
      const local = e.time - from;
      if (local < -1e-9 || e.time >= to - 1e-9) continue;
      if (e.firstPassOnly && !firstTime) continue;
      const { firstPassOnly: _drop, ...rest } = e;
      events.push({ ...rest, time: offset + local, ...(e.firstPassOnly && looping ? { firstPassOnly: true } : {}) });
    }
  };

  let loop: PlaybackPlan["loop"] = null;
  let end: number;
  if (!looping || startPass === 0) {
    // The first pass is the body itself (from startBar when not looping).
    place(countInSeconds, startOffset, bodySeconds, true);
    markBeats(countInSeconds, startPass);
    end = countInSeconds + bodySeconds - startOffset;
    if (looping) loop = { start: countInSeconds, end };
  } else {
    const first = bodySeconds - startOffset;
    place(countInSeconds, startOffset, bodySeconds, true);
    markBeats(countInSeconds, startPass);
    place(countInSeconds + first, 0, bodySeconds, false);
    markBeats(countInSeconds + first, 0);
    loop = { start: countInSeconds + first, end: countInSeconds + first + bodySeconds };
    end = loop.end;
  }
  addFlamGraces(events, loop);
  sortEvents(events);
  mergeUnisons(events);
  beats.sort((a, b) => a.time - b.time);
  return { events, beats, countInSeconds, loop, end, body, secondsPerWhole: spw };
}

function click(time: number, bar: number, beat: number): PlanEvent {
  const downbeat = beat === 0;
  return { time, duration: 0.05, voice: "click", velocity: downbeat ? CLICK_VELOCITY.downbeat : CLICK_VELOCITY.beat, downbeat, bar, beat };
}

function fromScheduled(e: ScheduledEvent, offsetInBar: number, starts: number[], spw: number): PlanEvent[] {
  const beat = beatAt(offsetInBar / spw, starts);
  if (e.kind === "keys") {
    const k: PlanEvent = { time: e.time, duration: e.duration, voice: "keys", velocity: e.velocity, pitch: e.pitch!, bar: e.bar, beat };
    if (e.tiedFromEnd) k.firstPassOnly = true; // tentatively; joinTiesAcrossSeam decides
    return [k];
  }
  const open = e.articulation === "open" && e.piece === "hihat-closed";
  const voice: Voice = open ? "hihat-open" : e.piece!;
  const hit: PlanEvent = { time: e.time, duration: e.duration, voice, velocity: e.velocity, dynamic: e.dynamic!, bar: e.bar, beat };
  if (e.articulation) hit.articulation = e.articulation;
  if (e.articulation === "choke") hit.duration = CHOKE_SECONDS;
  return [hit];
}

function sortEvents(list: PlanEvent[]): void {
  list.sort((a, b) => a.time - b.time || VOICE_ORDER(a.voice) - VOICE_ORDER(b.voice) || (a.pitch ?? 0) - (b.pitch ?? 0));
}

/**
 * In a loop, a keys note that continues (`tiedFromEnd`) a note held to the body's end is not attacked again
 * when the loop repeats: the held note is lengthened instead. Continuations with nothing to join are normal notes.
 */
function joinTiesAcrossSeam(pass: PlanEvent[], bodySeconds: number): void {
  for (const c of pass) {
    if (!c.firstPassOnly) continue;
    const held = c.time < 1e-9
      ? pass.find((h) => h.voice === "keys" && h !== c && h.pitch === c.pitch && h.velocity === c.velocity && Math.abs(h.time + h.duration - bodySeconds) < 1e-9)
      : undefined;
    if (held) held.duration += c.duration;
    else delete c.firstPassOnly;
  }
}

/** Open hi-hats ring until the next closing stroke (looking across the loop seam when looping). */
function setHatRings(pass: PlanEvent[], loopSeconds: number | null): void {
  const closers = pass.filter(isClosingHat).map((e) => e.time);
  for (const e of pass) {
    if (e.voice !== "hihat-open") continue;
    let next = closers.find((t) => t > e.time + 1e-9);
    if (next === undefined && loopSeconds !== null && closers.length > 0) next = closers[0]! + loopSeconds;
    e.duration = Math.min(OPEN_HAT_RING_SECONDS, next === undefined ? OPEN_HAT_RING_SECONDS : next - e.time);
  }
}

/**
 * One stroke per voice (and pitch) at a time: an open-hi-hat articulation on the closed row and an open hi-hat
 * lane at the same place, or a flam's grace landing on another stroke, sound once, as the louder of the two.
 * (A struck voice cannot start twice at the same instant.)
 */
function mergeUnisons(events: PlanEvent[]): void {
  let w = 0;
  for (let r = 0; r < events.length; r++) {
    const e = events[r]!;
    let merged = false;
    for (let k = w - 1; k >= 0 && events[k]!.time > e.time - 1e-6; k--) {
      const o = events[k]!;
      if (o.voice !== e.voice || o.pitch !== e.pitch) continue;
      if (e.velocity > o.velocity) events[k] = { ...e, duration: Math.max(e.duration, o.duration) };
      else o.duration = Math.max(e.duration, o.duration);
      merged = true;
      break;
    }
    if (!merged) events[w++] = e;
  }
  events.length = w;
}

/** Add the grace strokes of flams, placed FLAM_GRACE_SECONDS before their main strokes. */
function addFlamGraces(events: PlanEvent[], loop: PlaybackPlan["loop"]): void {
  const graces: PlanEvent[] = [];
  for (const e of events) {
    if (e.articulation !== "flam" || e.grace) continue;
    const time = e.time - FLAM_GRACE_SECONDS;
    const g: PlanEvent = { ...e, time, velocity: Math.max(1, Math.round(e.velocity * FLAM_GRACE_VELOCITY_RATIO)), grace: true };
    delete g.articulation;
    delete g.firstPassOnly;
    // A flam on the loop's first step: its grace ends every time through the body, before the loop comes round.
    if (loop && e.time >= loop.start - 1e-9 && time < loop.start - 1e-9) graces.push({ ...g, time: time + (loop.end - loop.start) });
    // The first time, the grace sounds where it falls (in the count-in or the first pass), unless before the start.
    if (time >= -1e-9) graces.push({ ...g, time: Math.max(0, time) });
  }
  events.push(...graces);
}

/**
 * The written bar and counted beat being heard at a time of the plan (null during silence before the start).
 * @example positionAt(plan, 0.5) // { bar: 0, beat: 1, countIn: false, time: 0.5 } at 120 bpm in 4/4
 */
export function positionAt(plan: PlaybackPlan, time: number): BeatMark | null {
  let lo = 0;
  let hi = plan.beats.length - 1;
  let found: BeatMark | null = null;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    const m = plan.beats[mid]!;
    if (m.time <= time + 1e-9) {
      found = m;
      lo = mid + 1;
    } else hi = mid - 1;
  }
  return found;
}

/** Seconds from the start of its bar to a beat mark of the plan. */
function beatOffset(plan: PlaybackPlan, mark: BeatMark): number {
  if (mark.beat === 0) return 0;
  for (let k = plan.beats.indexOf(mark); k >= 0; k--) if (plan.beats[k]!.beat === 0) return mark.time - plan.beats[k]!.time;
  return 0;
}

/**
 * Where to continue in a new plan (edits, tempo or loop changed while playing) from time `t` of the old one: the
 * same bar, the same distance into it in whole notes (so a tempo change keeps the place in the music); the new
 * loop's start when that bar is no longer played; null when a play without loop is already past its new end.
 * `pastFirstPass`: the loop has come round, so the bar is looked for in the loop body, not in the first pass.
 * @example carryPosition(planAt96, 1.25, planAt150, false) // 0.8: beat 3 of bar 1 at either tempo
 */
export function carryPosition(old: PlaybackPlan, t: number, next: PlaybackPlan, pastFirstPass: boolean): number | null {
  let at = t * (next.secondsPerWhole / old.secondsPerWhole);
  const pos = positionAt(old, t);
  if (pos) {
    const intoBar = (t - (pos.time - beatOffset(old, pos))) / old.secondsPerWhole; // whole notes into the bar
    const from = pos.countIn ? 0 : next.loop && pastFirstPass ? next.loop.start : next.countInSeconds;
    const target = next.beats.find((m) => m.beat === 0 && m.bar === pos.bar && m.countIn === pos.countIn && m.time >= from - 1e-9);
    if (target) at = target.time + intoBar * next.secondsPerWhole;
    else if (next.loop) at = next.loop.start;
  }
  if (next.loop && at >= next.loop.end) at = next.loop.start + ((at - next.loop.start) % (next.loop.end - next.loop.start));
  if (!next.loop && at >= next.end) return null;
  return at;
}
