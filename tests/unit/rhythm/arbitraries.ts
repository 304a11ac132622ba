/**
 * fast-check arbitraries for valid groove documents, shared by the rhythm core's property tests.
 *
 * `grooveArb()` gives any valid document: meters from 2/4 to 12/8 including 6/8, 9/8, 12/8 and the odd
 * 5/8 and 7/8 groupings, grids of eighths, sixteenths, eighth triplets and sixteenth triplets (those that
 * divide the bar), 1–8 bars, optional sections with repeats, kit lanes with dynamics and articulations,
 * keys notes with chords and notes crossing barlines, optional swing. Options narrow it for properties
 * that need it (e.g. an even bar count for half time). Every document goes through `assertGroove`, so it
 * is normalised exactly as stored documents are.
 */
import fc from "fast-check";
import {
  assertGroove,
  barLength,
  DYNAMICS,
  KIT_PIECE_IDS,
  naturalBeatNote,
  q,
  type GrooveDocument,
  type GrooveDocumentInput,
  type Meter,
  type Rational,
} from "../../../src/lib/rhythm";

export const METERS: readonly Meter[] = [
  { beatsPerBar: 4, beatUnit: 4 },
  { beatsPerBar: 3, beatUnit: 4 },
  { beatsPerBar: 2, beatUnit: 4 },
  { beatsPerBar: 2, beatUnit: 2 },
  { beatsPerBar: 5, beatUnit: 4 },
  { beatsPerBar: 6, beatUnit: 8, grouping: [3, 3] },
  { beatsPerBar: 6, beatUnit: 8 },
  { beatsPerBar: 9, beatUnit: 8 },
  { beatsPerBar: 12, beatUnit: 8 },
  { beatsPerBar: 3, beatUnit: 8 },
  { beatsPerBar: 5, beatUnit: 8, grouping: [3, 2] },
  { beatsPerBar: 7, beatUnit: 8, grouping: [2, 2, 3] },
  { beatsPerBar: 7, beatUnit: 8, grouping: [3, 2, 2] },
];

export const GRIDS: readonly Rational[] = ["1/8", "1/16", "1/12", "1/24"];

export interface GrooveArbOptions {
  meters?: readonly Meter[];
  grids?: readonly Rational[];
  minBars?: number;
  maxBars?: number;
  /** Bar count (and every section's bars) a multiple of this. */
  barMultiple?: number;
  /** Allow song-form sections (default true). */
  sections?: boolean;
  /** Allow swing (default true). */
  swing?: boolean;
  minBpm?: number;
  maxBpm?: number;
  /** Allow keys notes of one pitch that overlap (valid but unusual; default true). */
  overlaps?: boolean;
}

/** Tick positions (grid steps) of the whole groove. */
function totalTicks(meter: Meter, step: Rational, bars: number): number {
  return Number(barLength(meter).mul(bars).div(q(step)).n);
}

const sectionsArb = (bars: number, multiple: number) =>
  fc
    .uniqueArray(fc.integer({ min: 1, max: Math.max(1, bars / multiple - 1) }), { maxLength: 3 })
    .chain((cuts) => {
      const points = [0, ...[...new Set(cuts.map((c) => c * multiple))].filter((c) => c < bars).sort((a, b) => a - b), bars];
      const n = points.length - 1;
      return fc.array(fc.integer({ min: 1, max: 3 }), { minLength: n, maxLength: n }).map((repeats) =>
        repeats.map((r, i) => ({ name: String.fromCharCode(65 + i), startBar: points[i]!, bars: points[i + 1]! - points[i]!, repeats: r })),
      );
    });

/**
 * Any valid groove document (narrowed by the options).
 * @example fc.assert(fc.property(grooveArb(), (doc) => compileSchedule(doc).length >= 0))
 */
export function grooveArb(options: GrooveArbOptions = {}): fc.Arbitrary<GrooveDocument> {
  const {
    meters = METERS,
    grids = GRIDS,
    minBars = 1,
    maxBars = 8,
    barMultiple = 1,
    sections: allowSections = true,
    swing: allowSwing = true,
    minBpm = 40,
    maxBpm = 240,
    overlaps = true,
  } = options;
  return fc
    .record({
      meter: fc.constantFrom(...meters),
      grid: fc.constantFrom(...grids),
      bars: fc.integer({ min: Math.ceil(minBars / barMultiple), max: Math.floor(maxBars / barMultiple) }).map((b) => b * barMultiple),
      bpm: fc.integer({ min: minBpm * 2, max: maxBpm * 2 }).map((h) => q(h).div(2).toFraction()),
    })
    .filter(({ meter, grid }) => barLength(meter).div(q(grid)).d === 1n)
    .chain(({ meter, grid, bars, bpm }) => {
      const T = totalTicks(meter, grid, bars);
      const pos = fc.integer({ min: 0, max: T - 1 });
      const lane = (piece: string) =>
        fc.record({
          piece: fc.constant(piece),
          hits: fc
            .uniqueArray(pos, { maxLength: Math.min(T, 24) })
            .chain((ticks) =>
              fc.tuple(
                ...ticks.map((t) =>
                  fc.record(
                    {
                      at: fc.constant(q(grid).mul(t).toFraction()),
                      dynamic: fc.constantFrom(...DYNAMICS),
                      articulation: fc.constantFrom("flam", "open", "choke"),
                    },
                    { requiredKeys: ["at", "dynamic"] },
                  ),
                ),
              ),
            ),
        });
      const chord = pos.chain((start) =>
        fc.record({
          start: fc.constant(start),
          len: fc.integer({ min: 1, max: T - start }),
          pitches: fc.uniqueArray(fc.integer({ min: 36, max: 96 }), { minLength: 1, maxLength: 3 }),
          velocity: fc.integer({ min: 1, max: 127 }),
        }),
      );
      return fc.record({
        lanes: fc.subarray([...KIT_PIECE_IDS], { maxLength: 5 }).chain((pieces) => fc.tuple(...pieces.map(lane))),
        chords: fc.array(chord, { maxLength: 6 }),
        sections: allowSections ? fc.option(sectionsArb(bars, barMultiple), { nil: [] as never[] }) : fc.constant([]),
        swing: allowSwing
          ? fc.option(fc.record({ unit: fc.constantFrom("1/8", "1/16"), ratio: fc.constantFrom(0.5, 0.6, 2 / 3, 0.75) }), { nil: undefined })
          : fc.constant(undefined),
        splitPitch: fc.integer({ min: 48, max: 72 }),
      }).map(({ lanes, chords, sections, swing, splitPitch }) => {
        const busy = new Map<number, [number, number][]>(); // pitch → [start, end) ticks taken
        const notes = [...chords].sort((a, b) => a.start - b.start).flatMap((c) =>
          c.pitches.flatMap((pitch) => {
            const taken = busy.get(pitch) ?? [];
            const end = c.start + c.len;
            if (taken.some(([s, e]) => s === c.start || (!overlaps && s < end && c.start < e))) return [];
            busy.set(pitch, [...taken, [c.start, end]]);
            return [{ at: q(grid).mul(c.start).toFraction(), duration: q(grid).mul(c.len).toFraction(), pitch, velocity: c.velocity }];
          }),
        );
        const input: GrooveDocumentInput = {
          schemaVersion: 1,
          meter,
          tempo: { bpm, beatNote: naturalBeatNote(meter) },
          grid: { step: grid },
          swing: swing ?? { unit: "1/8", ratio: 0.5 },
          bars,
          sections: [...sections],
          kit: { lanes: lanes as GrooveDocumentInput["kit"]["lanes"] },
          keys: { notes, splitPitch },
        };
        return assertGroove(input);
      });
    });
}

/** A straight loop (no sections, no swing, no overlapping notes of one pitch): the case where rotation applies. */
export function loopArb(options: GrooveArbOptions = {}): fc.Arbitrary<GrooveDocument> {
  return grooveArb({ sections: false, swing: false, overlaps: false, ...options });
}
