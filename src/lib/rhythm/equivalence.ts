/**
 * Proof of equivalence: do two grooves sound the same?
 *
 * Both documents are compiled to schedules (seconds) and compared as multisets of sounding events:
 * onset time, sound identity (kit piece and articulation, or keys pitch), velocity, and for keys the
 * duration. Kit durations are nominal and not compared. Tolerance: 1 microsecond.
 *
 * Verdicts:
 * - "identical": the same events at the same times (trailing silence, such as an empty last bar, is not a
 *   sounding event and is not compared);
 * - "offset": the same events moved by a constant time. First the shift that aligns the two first onsets is
 *   tried; then, when both grooves are loops (no sections or one) of the same length, every rotation that
 *   lines an event of b up with a like event of a (a loop heard from another point). For a rotation, notes
 *   held across either loop's seam are compared as one note (see `tiedFromEnd`);
 * - "different": the first mismatches, each in bars and beats of the side where the event sits.
 */
import { barLength, playOrder, type GrooveDocument } from "./document";
import { describePosition } from "./describe-position";
import { fmt, Fraction, type Rational } from "./rational";
import { ARTICULATIONS, KIT_PIECE_INDEX } from "./kit";
import { compileSchedule, secondsPerWholeNote, type ScheduledEvent } from "./schedule";

/** Onsets and durations closer than this are equal (1 microsecond). */
const EQUIVALENCE_TOLERANCE_SECONDS = 1e-6;

export interface Mismatch {
  /** The side that has this event without a partner on the other side. */
  side: "a" | "b";
  time: number;
  /** 1-based written bar and counted beat of the event on its side. */
  bar: number;
  beat: number;
  /** Index in the play order (0-based), useful when a bar is repeated. */
  pass: number;
  kind: "kit" | "keys";
  piece?: ScheduledEvent["piece"];
  pitch?: number;
  velocity: number;
  /** e.g. "bar 2, beat 3: snare (accent) only in b". */
  text: string;
}

export type Equivalence =
  | { verdict: "identical"; matched: number }
  | {
      verdict: "offset";
      /** b sounds this many seconds after a (negative: before). */
      offsetSeconds: number;
      offsetMs: number;
      /** The same offset in a's note values (whole notes). */
      offsetNotes: Rational;
      /** True when the match is a rotation of a loop rather than a shift of the whole timeline. */
      rotation: boolean;
      matched: number;
    }
  | { verdict: "different"; matched: number; mismatches: Mismatch[] };

const TOL = EQUIVALENCE_TOLERANCE_SECONDS;
const MAX_MISMATCHES = 10;
const MAX_ROTATIONS = 512;

const ARTICULATION_CODE = new Map<string | undefined, number>([[undefined, 0], ...ARTICULATIONS.map((a, i) => [a, i + 1] as const)]);

/** Sound identity as one integer: kind, kit piece and articulation or pitch, and velocity. */
function identity(e: ScheduledEvent): number {
  return e.kind === "kit"
    ? ((KIT_PIECE_INDEX.get(e.piece!) ?? 0) * 8 + (ARTICULATION_CODE.get(e.articulation) ?? 0)) * 128 + e.velocity
    : 1_000_000 + e.pitch! * 128 + e.velocity;
}

function identities(events: ScheduledEvent[]): Int32Array {
  const ids = new Int32Array(events.length);
  for (let k = 0; k < events.length; k++) ids[k] = identity(events[k]!);
  return ids;
}

interface Outcome {
  matched: number;
  unmatchedA: ScheduledEvent[];
  unmatchedB: ScheduledEvent[];
  complete: boolean;
}

/**
 * Walk two time-sorted event lists (b moved back by `shift`), matching events inside each cluster of
 * simultaneous onsets. Stops collecting mismatches after `keep`; with `keep` 0 it stops at the first one.
 */
function matchSorted(a: ScheduledEvent[], b: ScheduledEvent[], bTimes: Float64Array, keep: number, idA = identities(a), idB = identities(b)): Outcome {
  const out: Outcome = { matched: 0, unmatchedA: [], unmatchedB: [], complete: true };
  let i = 0;
  let j = 0;
  const miss = (side: "a" | "b", e: ScheduledEvent) => {
    out.complete = false;
    const list = side === "a" ? out.unmatchedA : out.unmatchedB;
    if (out.unmatchedA.length + out.unmatchedB.length < keep) list.push(e);
  };
  while (i < a.length || j < b.length) {
    if (keep === 0 && !out.complete) return out;
    const ta = i < a.length ? a[i]!.time : Infinity;
    const tb = j < b.length ? bTimes[j]! : Infinity;
    const t = Math.min(ta, tb);
    let i2 = i;
    while (i2 < a.length && a[i2]!.time <= t + TOL) i2++;
    let j2 = j;
    while (j2 < b.length && bTimes[j2]! <= t + TOL) j2++;
    if (i2 - i === 1 && j2 - j === 1) {
      const x = a[i]!;
      const y = b[j]!;
      if (idA[i] === idB[j] && (x.kind === "kit" || Math.abs(x.duration - y.duration) <= TOL)) out.matched++;
      else {
        miss("a", x);
        miss("b", y);
      }
    } else {
      const ca = a.slice(i, i2);
      const cb = b.slice(j, j2);
      const used = new Array<boolean>(cb.length).fill(false);
      for (let m = 0; m < ca.length; m++) {
        const x = ca[m]!;
        const id = idA[i + m];
        const k = cb.findIndex((y, n) => !used[n] && idB[j + n] === id && (x.kind === "kit" || Math.abs(x.duration - y.duration) <= TOL));
        if (k >= 0) {
          used[k] = true;
          out.matched++;
        } else miss("a", x);
      }
      cb.forEach((y, n) => used[n] || miss("b", y));
    }
    i = i2;
    j = j2;
  }
  return out;
}

function shifted(b: ScheduledEvent[], shift: number): Float64Array {
  const t = new Float64Array(b.length);
  for (let k = 0; k < b.length; k++) t[k] = b[k]!.time - shift;
  return t;
}

/** Closest rational with a denominator up to 100,000 (continued fractions). */
function toRational(x: number): Rational {
  if (!Number.isFinite(x)) return "0";
  const sign = x < 0 ? -1 : 1;
  let v = Math.abs(x);
  let [h0, h1, k0, k1] = [0, 1, 1, 0];
  for (let n = 0; n < 40; n++) {
    const a = Math.floor(v);
    const h2 = a * h1 + h0;
    const k2 = a * k1 + k0;
    if (k2 > 100_000) break;
    [h0, h1, k0, k1] = [h1, h2, k1, k2];
    if (Math.abs(Math.abs(x) - h1 / k1) < 1e-12) break;
    v = 1 / (v - a);
    if (!Number.isFinite(v)) break;
  }
  return fmt(new Fraction(sign * h1, k1 || 1));
}

function isLoop(doc: GrooveDocument): boolean {
  return doc.sections.length <= 1;
}

/** One pass of a loop's written bars, with notes held across the seam joined and times folded into [0, T). */
function cycle(doc: GrooveDocument, full: ScheduledEvent[]): { events: ScheduledEvent[]; length: number; isFull: boolean } {
  // When the play order is every bar once, the full schedule already is one cycle.
  const once = playOrder(doc).length === doc.bars;
  const events = once ? full.slice() : compileSchedule(doc, Array.from({ length: doc.bars }, (_, k) => k));
  const length = barLength(doc.meter).mul(doc.bars).valueOf() * secondsPerWholeNote(doc.tempo);
  const gone = new Set<ScheduledEvent>();
  for (const e of events) {
    if (!e.tiedFromEnd) continue;
    const k = events.findIndex((p) => p !== e && !gone.has(p) && p.kind === "keys" && p.pitch === e.pitch && p.velocity === e.velocity && Math.abs(p.time + p.duration - length) <= TOL);
    if (k >= 0) {
      events[k] = { ...events[k]!, duration: events[k]!.duration + e.duration }; // a copy: `full` stays as compiled
      gone.add(e);
    }
  }
  return { events: gone.size ? events.filter((e) => !gone.has(e)) : events, length, isFull: once && gone.size === 0 };
}

/**
 * b heard from `shift` seconds into its cycle: a sorted cycle rotates by cutting it in two, so no sort and
 * no copies are needed (events are reordered by reference, times recomputed).
 */
function rotated(events: ScheduledEvent[], ids: Int32Array, shift: number, length: number): { events: ScheduledEvent[]; times: Float64Array; ids: Int32Array } {
  const n = events.length;
  let cut = 0;
  while (cut < n && events[cut]!.time < shift - TOL) cut++;
  const out: ScheduledEvent[] = new Array(n);
  const times = new Float64Array(n);
  const outIds = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    const src = (cut + k) % n;
    out[k] = events[src]!;
    outIds[k] = ids[src]!;
    times[k] = src >= cut ? Math.max(0, events[src]!.time - shift) : events[src]!.time - shift + length;
  }
  return { events: out, times, ids: outIds };
}

/**
 * Compare two grooves by their sound (see the module comment).
 * @example compareGrooves(doc, doubleTime(doc)) // { verdict: "identical", matched: … }
 * @example compareGrooves(doc, displace(doc, "1/8", "pad")) // { verdict: "offset", offsetNotes: "1/8", … }
 */
export function compareGrooves(a: GrooveDocument, b: GrooveDocument): Equivalence {
  const ea = compileSchedule(a);
  const eb = compileSchedule(b);
  const idA = identities(ea);
  const idB = identities(eb);
  // Quick passes stop at the first mismatch; the detailed ones run only when the verdict is "different".
  const plain = matchSorted(ea, eb, shifted(eb, 0), 0, idA, idB);
  if (plain.complete) return { verdict: "identical", matched: plain.matched };
  const spwA = secondsPerWholeNote(a.tempo);
  const offset = (raw: number, rotation: boolean, matched: number): Equivalence => {
    const seconds = Math.round(raw * 1e9) / 1e9; // float noise off: nanoseconds are far inside the tolerance
    return { verdict: "offset", offsetSeconds: seconds, offsetMs: seconds * 1000, offsetNotes: toRational(seconds / spwA), rotation, matched };
  };

  const shift = ea.length > 0 && eb.length > 0 && ea.length === eb.length ? eb[0]!.time - ea[0]!.time : 0;
  if (Math.abs(shift) > TOL) {
    const moved = matchSorted(ea, eb, shifted(eb, shift), 0, idA, idB);
    if (moved.complete) return offset(shift, false, moved.matched);
  }

  if (isLoop(a) && isLoop(b) && playOrder(a).length * a.bars > 0) {
    const ca = cycle(a, ea);
    const cb = cycle(b, eb);
    const passesA = playOrder(a).length / a.bars;
    const passesB = playOrder(b).length / b.bars;
    if (Math.abs(ca.length - cb.length) <= TOL && passesA === passesB && ca.events.length === cb.events.length && cb.events.length > 0) {
      const L = ca.length;
      const aIds = ca.isFull ? idA : identities(ca.events);
      const bIds = cb.isFull ? idB : identities(cb.events);
      // Line up the rarest sound of b with each like event of a: few candidate rotations.
      const count = new Map<number, number>();
      for (const id of bIds) count.set(id, (count.get(id) ?? 0) + 1);
      let rare = 0;
      for (let k = 1; k < bIds.length; k++) if (count.get(bIds[k]!)! < count.get(bIds[rare]!)!) rare = k;
      const anchor = cb.events[rare]!;
      const aTimes = Float64Array.from(ca.events, (e) => e.time);
      const has = (t: number, id: number) => {
        // Is there an event of a with this identity within the tolerance of t (cyclically)?
        for (const u of [t, t - L, t + L]) {
          let lo = 0;
          let hi = aTimes.length;
          while (lo < hi) {
            const mid = (lo + hi) >> 1;
            if (aTimes[mid]! < u - TOL) lo = mid + 1;
            else hi = mid;
          }
          for (let k = lo; k < aTimes.length && aTimes[k]! <= u + TOL; k++) if (aIds[k] === id) return true;
        }
        return false;
      };
      const sample = Array.from({ length: Math.min(24, cb.events.length) }, (_, k) => Math.floor((k * cb.events.length) / Math.min(24, cb.events.length)));
      const shifts = [...new Set(ca.events.filter((_, k) => aIds[k] === bIds[rare]).map((e) => anchor.time - e.time))]
        .map((x) => x - Math.floor(x / L) * L)
        .sort((x, y) => Math.min(x, L - x) - Math.min(y, L - y))
        .filter((x) => sample.every((k) => has(cb.events[k]!.time - x - Math.floor((cb.events[k]!.time - x) / L) * L, bIds[k]!)))
        .slice(0, MAX_ROTATIONS);
      for (const s of shifts) {
        const rb = rotated(cb.events, bIds, s, L);
        const r = matchSorted(ca.events, rb.events, rb.times, 0, aIds, rb.ids);
        if (r.complete) {
          const signed = s > L / 2 + TOL ? s - L : s;
          return offset(Math.abs(signed) <= TOL ? 0 : signed, true, r.matched);
        }
      }
    }
  }

  const describe = (side: "a" | "b", e: ScheduledEvent): Mismatch => {
    const pos = describePosition(side === "a" ? a : b, e.at);
    const what = e.kind === "kit" ? `${e.piece}${e.dynamic && e.dynamic !== "normal" ? ` (${e.dynamic})` : ""}${e.articulation ? ` ${e.articulation}` : ""}` : `pitch ${e.pitch} (velocity ${e.velocity})`;
    const m: Mismatch = { side, time: e.time, bar: pos.bar, beat: pos.beat, pass: e.pass, kind: e.kind, velocity: e.velocity, text: `${pos.text}: ${what} only in ${side}` };
    if (e.piece) m.piece = e.piece;
    if (e.pitch !== undefined) m.pitch = e.pitch;
    return m;
  };
  let best = matchSorted(ea, eb, shifted(eb, 0), MAX_MISMATCHES, idA, idB);
  if (Math.abs(shift) > TOL) {
    const moved = matchSorted(ea, eb, shifted(eb, shift), MAX_MISMATCHES, idA, idB);
    if (moved.matched > best.matched) best = moved;
  }
  const mismatches = [...best.unmatchedA.map((e) => describe("a", e)), ...best.unmatchedB.map((e) => describe("b", e))]
    .sort((x, y) => x.time - y.time || (x.side < y.side ? -1 : 1))
    .slice(0, MAX_MISMATCHES);
  return { verdict: "different", matched: best.matched, mismatches };
}
