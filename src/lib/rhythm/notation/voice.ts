/**
 * Spelling one voice of one bar: a gap-free sequence of sounding pieces (notes or rests, in ticks) becomes
 * written values (plain or dotted, tied where a note is split, grouped into tuplets where the positions
 * are not on the binary grid).
 *
 * The rules, with their sources (The Open University, "An introduction to music theory", OpenLearn 2016,
 * sections 3.6 and 4.2, as collected in the project's reference notes; E. Gould, "Behind Bars", 2011,
 * from memory):
 * - A value may cross a beat group only when it starts on a group and ends on a group boundary, or at the
 *   middle of a plain group (a dotted quarter on beat 1 of 3/4); never across the middle of the bar
 *   (beat 3 of 4/4 stays visible) unless it fills the whole bar.
 * - Inside a plain (binary) beat, a plain value starts on a multiple of half its length
 *   (16th–8th–16th is fine); a dotted value starts or ends on a multiple of twice its undotted value.
 * - Inside a dotted (compound) group, a value crossing the units starts on a unit and ends on a unit or
 *   half way through one (quarter–eighth, dotted eighth–16th–eighth in 6/8).
 * - Rests show the beat: inside a beat, a rest sits on a multiple of its own length (rests shorter than a
 *   beat are grouped by half beat); across beats only a half-bar rest starting on beat 1 or 3 of 4/4
 *   (dotted only in compound time: no dotted rests in simple time), and a whole-bar rest.
 * - Positions not on the binary grid make the beat (or half beat, when nothing crosses its middle) a
 *   tuplet P:n (P the odd part of the positions' denominators, n the power of two below it: 3:2 for
 *   triplets); inside it the written values follow the compound rules. A tuplet never crosses a beat group.
 * - Kit notes (`truncate`) are never tied: a note keeps its first written value and the rest of its span
 *   becomes rests.
 */
import { RhythmError } from "../document";
import type { NoteValue } from "./model";
import { tickValues, type TickValue } from "./durations";
import { groupIndexAt, type Metric } from "./metric";
import { gcd, lcm } from "../ticks";
import { oddPart, powerOfTwoBelow } from "./timebase";

/** A sounding span of the voice: a note (payload) or a rest (null). Pieces tile the bar. */
export interface Piece<T> {
  readonly s: number;
  readonly e: number;
  readonly note: T | null;
}

/** One written event, times in sounding ticks from the start of the bar. */
export interface Written<T> {
  readonly s: number;
  readonly len: number;
  readonly value: NoteValue;
  readonly note: T | null;
  /** Index of the source piece (ties join consecutive events of one piece); -1 for rests left by kit notes. */
  readonly piece: number;
  readonly tuplet?: { actual: number; normal: number; group: number; position: "start" | "middle" | "end" };
  readonly measure?: boolean;
}

export interface VoiceOptions {
  /** Kit voice: notes are never tied and stay short (a quarter, or a dotted quarter filling a compound beat). */
  readonly kit: boolean;
}

interface Frag<T> {
  s: number;
  e: number;
  note: T | null;
  piece: number;
}

type Frame = { kind: "binary"; len: number } | { kind: "units"; units: number; unit: number };

interface Ctx<T> {
  readonly D: number;
  readonly metric: Metric;
  readonly values: readonly TickValue[];
  readonly byTicks: ReadonlyMap<number, NoteValue>;
  readonly kit: boolean;
  readonly out: Written<T>[];
  tupletGroups: number;
}

const cache = new Map<number, { values: TickValue[]; byTicks: Map<number, NoteValue> }>();

function valueTables(D: number) {
  let t = cache.get(D);
  if (!t) {
    const values = tickValues(D);
    t = { values, byTicks: new Map(values.map((v) => [v.ticks, v.value])) };
    cache.set(D, t);
  }
  return t;
}

/**
 * Spell one voice of a bar.
 * @example spellVoice([{ s: 0, e: 16, note: "x" }, { s: 16, e: 64, note: null }], makeMetric({ beatsPerBar: 4, beatUnit: 4 }, 64), 64, { kit: true })
 */
export function spellVoice<T>(pieces: readonly Piece<T>[], metric: Metric, D: number, opts: VoiceOptions): Written<T>[] {
  const bar = metric.barTicks;
  let silent = true;
  for (const p of pieces) if (p.note !== null) silent = false;
  if (silent) return [{ s: 0, len: bar, value: WHOLE, note: null, piece: -1, measure: true }];

  const { values, byTicks } = valueTables(D);
  const ctx: Ctx<T> = { D, metric, values, byTicks, kit: opts.kit, out: [], tupletGroups: 0 };
  const queues: Frag<T>[][] = metric.groups.map(() => []);

  pieces.forEach((p, index) => {
    let cur = p.s;
    while (cur < p.e) {
      const gi = groupIndexAt(metric, cur);
      const g = metric.groups[gi]!;
      const f = fragment(ctx, { s: p.s, e: p.e, note: p.note, piece: index }, cur, Math.min(p.e, g.end));
      if (p.e <= g.end) {
        queues[gi]!.push(f);
        break;
      }
      const x = cur === g.start ? crossingEnd(ctx, gi, cur, p.e, f.note === null) : 0;
      if (x > 0) {
        ctx.out.push({ s: cur, len: x - cur, value: byTicks.get(x - cur)!, note: f.note, piece: f.piece });
        cur = x;
      } else {
        queues[gi]!.push(f);
        cur = g.end;
      }
    }
  });

  queues.forEach((frags, gi) => {
    if (frags.length === 0) return;
    const g = metric.groups[gi]!;
    const a = frags[0]!.s;
    const frame: Frame =
      a === g.start && !g.binary ? { kind: "units", units: g.units, unit: g.unit } : { kind: "binary", len: g.end - a };
    spellRegion(ctx, frags, a, g.end - a, frame);
  });

  return ctx.out.sort(byStart);
}

const WHOLE: NoteValue = { type: "whole", dots: 0 };
const byStart = (x: { s: number }, y: { s: number }) => x.s - y.s;

/** The longest end x ≤ e of a single value from group start s across group boundaries, or 0. */
function crossingEnd<T>(ctx: Ctx<T>, gi: number, s: number, e: number, rest: boolean): number {
  const { metric, byTicks } = ctx;
  const bar = metric.barTicks;
  const candidates: number[] = [];
  for (let j = gi + 1; j < metric.groups.length; j++) {
    const g = metric.groups[j]!;
    if (g.binary && !rest) candidates.push(g.start + (g.end - g.start) / 2);
    candidates.push(g.end);
  }
  candidates.sort((x, y) => y - x);
  for (const x of candidates) {
    if (x > e) continue;
    const value = byTicks.get(x - s);
    if (!value) continue;
    const whole = s === 0 && x === bar;
    if (rest) {
      const half = metric.middle !== null && (s === 0 || s === metric.middle) && x - s === bar / 2;
      if (whole || (half && (value.dots === 0 || metric.compound))) return x;
      continue;
    }
    if (!whole && metric.middle !== null && s < metric.middle && x > metric.middle) continue;
    return x;
  }
  return 0;
}

function spellRegion<T>(ctx: Ctx<T>, frags: Frag<T>[], a: number, len: number, frame: Frame): void {
  const D = ctx.D;
  let P = 1;
  for (const f of frags) {
    P = lcm(P, oddPart(D / gcd(f.s - a, D)));
    P = lcm(P, oddPart(D / gcd(f.e - a, D)));
  }
  if (P === 1) {
    writeFrame(ctx, frags, a, frame, null);
    return;
  }
  if (frame.kind === "units") {
    // A compound or odd group with off-grid positions: spell each unit on its own.
    for (let i = 0; i < frame.units; i++) {
      const us = a + i * frame.unit;
      spellRegion(ctx, cut(ctx, frags, us, us + frame.unit), us, frame.unit, { kind: "binary", len: frame.unit });
    }
    return;
  }
  const mid = a + len / 2;
  if (len % 2 === 0 && frags.length > 1 && !frags.some((f) => f.s < mid && f.e > mid)) {
    spellRegion(ctx, cut(ctx, frags, a, mid), a, len / 2, { kind: "binary", len: len / 2 });
    spellRegion(ctx, cut(ctx, frags, mid, a + len), mid, len / 2, { kind: "binary", len: len / 2 });
    return;
  }
  const n = powerOfTwoBelow(P);
  const toWritten = (t: number) => {
    const w = ((t - a) * P) / n;
    if (!Number.isInteger(w)) throw new RhythmError(`internal: tuplet ${P}:${n} position is not a whole tick`);
    return w;
  };
  const written = frags.map((f) => ({ ...f, s: toWritten(f.s), e: toWritten(f.e) }));
  const group = ++ctx.tupletGroups;
  const first = ctx.out.length;
  writeFrame(ctx, written, 0, { kind: "units", units: P, unit: len / n }, { actual: P, normal: n, a, group });
  const last = ctx.out.length - 1;
  for (let i = first; i <= last; i++) {
    const ev = ctx.out[i]!;
    const position = i === first ? "start" : i === last ? "end" : "middle";
    ctx.out[i] = { ...ev, tuplet: { actual: P, normal: n, group, position } };
  }
}

/**
 * The part [s, e) of a fragment. A kit note is never tied, so the part after its start becomes a rest;
 * a keys note continues (and is tied).
 */
function fragment<T>(ctx: Ctx<T>, f: Frag<T>, s: number, e: number): Frag<T> {
  if (ctx.kit && f.note !== null && s > f.s) return { s, e, note: null, piece: -1 };
  return { s, e, note: f.note, piece: f.piece };
}

/** The fragments restricted to [from, to). */
function cut<T>(ctx: Ctx<T>, frags: Frag<T>[], from: number, to: number): Frag<T>[] {
  const out: Frag<T>[] = [];
  for (const f of frags) {
    const s = Math.max(f.s, from);
    const e = Math.min(f.e, to);
    if (s < e) out.push(fragment(ctx, f, s, e));
  }
  return out;
}

/**
 * Write fragments inside one frame (times relative to the frame start `a`; written ticks when `tup` is set)
 * by taking, at each point, the longest value the frame's rules allow.
 */
function writeFrame<T>(
  ctx: Ctx<T>,
  frags: Frag<T>[],
  a: number,
  frame: Frame,
  tup: { actual: number; normal: number; a: number; group: number } | null,
): void {
  const toSounding = (w: number) => (tup ? tup.a + (w * tup.normal) / tup.actual : w);
  // Kit notes stay short: a quarter at most, or a dotted quarter filling a dotted (compound) beat.
  const kitMax = frame.kind === "units" && !tup ? (3 * ctx.D) / 8 : ctx.D / 4;
  for (const f of frags) {
    let s = f.s - a;
    const e = f.e - a;
    let noteLeft = f.note !== null;
    while (s < e) {
      const isRest = !noteLeft;
      const cap = ctx.kit && !isRest ? kitMax : Infinity;
      let tv: TickValue | undefined;
      for (const v of ctx.values) {
        if (v.ticks <= e - s && v.ticks <= cap && fits(frame, s, v.ticks, v.value, isRest)) {
          tv = v;
          break;
        }
      }
      if (!tv) throw new RhythmError(`internal: no written value fits at ${s}–${e} of a frame`);
      const start = toSounding(s + a);
      const end = toSounding(s + a + tv.ticks);
      ctx.out.push({
        s: start,
        len: end - start,
        value: tv.value,
        note: isRest ? null : f.note,
        piece: isRest && f.note !== null ? -1 : f.piece,
      });
      s += tv.ticks;
      if (ctx.kit) noteLeft = false;
    }
  }
}

/** May a value of `len` ticks start at `s` (frame-relative) in this frame? */
function fits(frame: Frame, s: number, len: number, value: NoteValue, rest: boolean): boolean {
  const x = s + len;
  if (frame.kind === "binary") return x <= frame.len && fitsBinary(s, len, value, rest);
  const { units, unit } = frame;
  if (x > units * unit) return false;
  const i = Math.floor(s / unit);
  const j = Math.floor((x - 1) / unit);
  if (i === j) return fitsBinary(s - i * unit, len, value, rest);
  if (rest) return s === 0 && (x === units * unit || (x === 2 * unit && units >= 3 && value.dots === 0));
  return s % unit === 0 && (x % unit === 0 || (unit % 2 === 0 && x % unit === unit / 2));
}

/** Rules inside a plain beat (or unit), positions relative to its start. */
function fitsBinary(s: number, len: number, value: NoteValue, rest: boolean): boolean {
  if (rest) return value.dots === 0 && s % len === 0;
  if (value.dots === 0) return len % 2 === 0 ? s % (len / 2) === 0 : s % len === 0;
  const twice = (len * 4) / 3; // twice the undotted value
  return s % twice === 0 || (s + len) % twice === 0;
}
