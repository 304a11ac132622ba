/**
 * The schedule compiler: a groove document → every sounding event with its onset and duration in seconds,
 * for playback, export and comparison. This is the edge where exact whole notes become seconds.
 *
 * - seconds = whole notes × 60 / (bpm × beatNote) (common practice: quarter = 60 bpm lasts one second);
 * - bars are played in `playOrder` (sections with their repeats); `pass` is the index in that order;
 * - swing is applied to onsets and to the ends of keys notes (see swing.ts);
 * - a keys note belongs to the bar where it starts and sounds for its whole written length from there,
 *   whatever bar is played next;
 * - a keys note marked `tiedFromEnd` continues, without a new attack, a note of the same pitch and velocity
 *   that is still held when the groove comes back to its start (a loop played again); otherwise it sounds;
 * - kit hits get a nominal duration of KIT_HIT_SECONDS (a drum has no written length);
 * - velocity: the dynamic's DYNAMIC_VELOCITY for kit hits, the note's velocity for keys;
 * - order: time, then kit before keys, then kit pieces in KIT_PIECE_IDS order or pitches low to high.
 */
import { barLength, playOrder, type GrooveDocument, type Tempo } from "./document";
import { DYNAMIC_VELOCITY, KIT_PIECE_INDEX, type Articulation, type Dynamic, type KitPieceId } from "./kit";
import { Fraction, q, type Rational } from "./rational";
import { swingInBar } from "./swing";
import { TickCodec, ticksOf } from "./ticks";

/** Nominal sounding length given to a kit hit, in seconds (a drum hit has no written duration). */
export const KIT_HIT_SECONDS = 0.1;

export interface ScheduledEvent {
  /** Onset in seconds from the start of the play order. */
  time: number;
  /** Seconds: the swung written length for keys, KIT_HIT_SECONDS for kit hits. */
  duration: number;
  kind: "kit" | "keys";
  piece?: KitPieceId;
  pitch?: number;
  velocity: number;
  dynamic?: Dynamic;
  articulation?: Articulation;
  /** Written bar index, 0-based. */
  bar: number;
  /** Written position in whole notes from the start of the groove. */
  at: Rational;
  /** Index of the bar in the play order. */
  pass: number;
  /** Keys only: the note is the piece at 0 of a note held across the loop's seam (it was not re-attacked if joined). */
  tiedFromEnd?: boolean;
}

/**
 * Seconds in one whole note at a tempo.
 * @example secondsPerWholeNote({ bpm: "60", beatNote: "1/4" }) // 4
 */
export function secondsPerWholeNote(tempo: Tempo): number {
  return secondsPerWhole(tempo).valueOf();
}

function secondsPerWhole(tempo: Tempo): Fraction {
  return new Fraction(60).div(q(tempo.bpm).mul(q(tempo.beatNote)));
}

/**
 * Length of the whole play order in seconds (every section with its repeats).
 * @example scheduleLength(oneBarOf44At120) // 2
 */
export function scheduleLength(doc: GrooveDocument): number {
  return barLength(doc.meter).mul(playOrder(doc).length).mul(secondsPerWhole(doc.tempo)).valueOf();
}

interface Template {
  tick: number; // inside the bar
  kind: 0 | 1;
  order: number; // piece index or pitch
  /** Keys: length in ticks. */
  d: number;
  velocity: number;
  piece?: KitPieceId;
  pitch?: number;
  dynamic?: Dynamic;
  articulation?: Articulation;
  at: Rational;
  tiedFromEnd?: boolean;
  endsAtGrooveEnd?: boolean;
}

/**
 * Every sounding event of the groove in play order, sorted (see the module comment for the rules).
 * Never throws on a valid document. `order` overrides the play order (e.g. [0, 1, …] for one pass).
 * @example compileSchedule(doc)[0] // { time: 0, kind: "kit", piece: "kick", velocity: 90, bar: 0, at: "0", pass: 0, … }
 */
export function compileSchedule(doc: GrooveDocument, order: readonly number[] = playOrder(doc)): ScheduledEvent[] {
  const codec = new TickCodec(doc.grid.step);
  const bar = barLength(doc.meter);
  const barTicks = ticksOf(bar, doc.grid.step, "bar length");
  const totalTicks = barTicks * doc.bars;
  const barW = bar.valueOf();
  const spw = secondsPerWhole(doc.tempo).valueOf();
  const step = q(doc.grid.step);
  // Swung offset (whole notes from the barline) of every grid point of a bar, its end included.
  const offs = new Float64Array(barTicks + 1);
  for (let t = 0; t <= barTicks; t++) offs[t] = t === barTicks ? barW : swingInBar(step.mul(t), doc.swing, bar);
  const wOff = (rel: number) => {
    const k = Math.floor(rel / barTicks);
    return k * barW + offs[rel - k * barTicks]!;
  };

  const perBar: Template[][] = Array.from({ length: doc.bars }, () => []);
  for (const lane of doc.kit.lanes) {
    const order = KIT_PIECE_INDEX.get(lane.piece) ?? 0;
    for (const h of lane.hits) {
      const t = codec.toTicks(h.at);
      const b = Math.floor(t / barTicks);
      const item: Template = { tick: t - b * barTicks, kind: 0, order, d: 0, velocity: DYNAMIC_VELOCITY[h.dynamic], piece: lane.piece, dynamic: h.dynamic, at: h.at };
      if (h.articulation) item.articulation = h.articulation;
      perBar[b]?.push(item);
    }
  }
  for (const n of doc.keys.notes) {
    const t = codec.toTicks(n.at);
    const d = codec.toTicks(n.duration, "duration");
    const b = Math.floor(t / barTicks);
    const item: Template = { tick: t - b * barTicks, kind: 1, order: n.pitch, d, velocity: n.velocity, pitch: n.pitch, at: n.at };
    if (n.tiedFromEnd && t === 0) item.tiedFromEnd = true;
    if (t + d === totalTicks) item.endsAtGrooveEnd = true;
    perBar[b]?.push(item);
  }
  for (const list of perBar) list.sort((a, b) => a.tick - b.tick || a.kind - b.kind || a.order - b.order || a.d - b.d);

  const events: ScheduledEvent[] = [];
  // Keys notes held to the end of the groove, by pitch|velocity, waiting for a tied continuation.
  const held = new Map<string, ScheduledEvent>();
  for (let pass = 0; pass < order.length; pass++) {
    const b = order[pass]!;
    const list = perBar[b];
    if (!list) continue;
    const base = pass * barW;
    const passStart = base * spw;
    for (const it of list) {
      const time = (base + offs[it.tick]!) * spw;
      if (it.kind === 0) {
        const e: ScheduledEvent = { time, duration: KIT_HIT_SECONDS, kind: "kit", piece: it.piece!, velocity: it.velocity, dynamic: it.dynamic!, bar: b, at: it.at, pass };
        if (it.articulation) e.articulation = it.articulation;
        events.push(e);
        continue;
      }
      const duration = (base + wOff(it.tick + it.d)) * spw - time;
      const key = `${it.pitch}|${it.velocity}`;
      if (it.tiedFromEnd) {
        const prev = held.get(key);
        if (prev && Math.abs(prev.time + prev.duration - passStart) < 1e-9) {
          prev.duration += duration; // the held note goes on: no new attack
          held.delete(key);
          continue;
        }
      }
      const e: ScheduledEvent = { time, duration, kind: "keys", pitch: it.pitch!, velocity: it.velocity, bar: b, at: it.at, pass };
      if (it.tiedFromEnd) e.tiedFromEnd = true;
      if (it.endsAtGrooveEnd) held.set(key, e);
      events.push(e);
    }
  }
  return events;
}
