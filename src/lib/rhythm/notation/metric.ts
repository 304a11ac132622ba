/**
 * The metric frame of a bar as the spelling code sees it: beat groups, the middle of the bar, beam units.
 *
 * Engraving rules followed (The Open University, "An introduction to music theory", OpenLearn 2016,
 * sections 3.6 and 4.2; E. Gould, "Behind Bars", 2011, from memory):
 * - beat groups are the meter's `beatGrouping` (../meter.ts: 4/4 → 1+1+1+1, 6/8 → 3+3, 7/8 → 2+2+3, or the
 *   document's own grouping); notes and rests show each group;
 * - the middle of the bar (beat 3 of 4/4) is kept visible whenever it is a group boundary.
 */
import { beatGrouping, type MeterLike } from "../meter";
import { isPowerOfTwo } from "./timebase";

/** One beat group of the bar, in ticks. */
export interface Group {
  readonly start: number;
  readonly end: number;
  /** Units (beats of the time signature) in the group. */
  readonly units: number;
  /** Ticks of one unit. */
  readonly unit: number;
  /** True when the group's length is a plain note value (a binary tree of halves). */
  readonly binary: boolean;
}

export interface Metric {
  readonly barTicks: number;
  readonly groups: readonly Group[];
  /** Tick of the middle of the bar when it is a group boundary (beat 3 of 4/4), else null. */
  readonly middle: number | null;
  /** Spans that beams never cross: each beat in simple meters (beat unit quarter or longer), each group otherwise (or when the document gives a grouping). */
  readonly beamUnits: readonly (readonly [number, number])[];
  /** True when dotted rests may be written (compound groups), false in simple time. */
  readonly compound: boolean;
}

/**
 * The metric frame of a bar in ticks (D ticks per whole note).
 * @example makeMetric({ beatsPerBar: 6, beatUnit: 8 }, 64).groups.map((g) => g.start) // [0, 24]
 */
export function makeMetric(meter: MeterLike, D: number): Metric {
  const unit = D / meter.beatUnit;
  const barTicks = unit * meter.beatsPerBar;
  const grouping = beatGrouping(meter);
  const groups: Group[] = [];
  let at = 0;
  for (const units of grouping) {
    groups.push({ start: at, end: at + units * unit, units, unit, binary: isPowerOfTwo(units) });
    at += units * unit;
  }
  const half = barTicks / 2;
  const middle = groups.length > 1 && groups.some((g) => g.start === half) ? half : null;
  // Beams follow the beat in simple meters, the groups in compound and odd meters or when the document
  // gives its own grouping.
  const simple = meter.beatUnit <= 4 && !(meter.grouping && meter.grouping.length > 0);
  const beamUnits: [number, number][] = simple
    ? Array.from({ length: meter.beatsPerBar }, (_, i) => [i * unit, (i + 1) * unit] as [number, number])
    : groups.map((g) => [g.start, g.end] as [number, number]);
  return { barTicks, groups, middle, beamUnits, compound: groups.some((g) => !g.binary) };
}

/**
 * Index of the group containing tick t (0 ≤ t < barTicks).
 * @example groupIndexAt(makeMetric({ beatsPerBar: 6, beatUnit: 8 }, 64), 30) // 1 (the second dotted quarter)
 */
export function groupIndexAt(metric: Metric, t: number): number {
  const gs = metric.groups;
  for (let i = gs.length - 1; i >= 0; i--) if (gs[i]!.start <= t) return i;
  return 0;
}
