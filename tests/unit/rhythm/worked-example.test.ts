/**
 * A worked example of our own invention (invented data, no real song): "Harbour Lights", a groove by the
 * invented band The Lamplight Ferry, as a transcriber first wrote it down.
 *
 * The transcriber tapped 76 bpm and felt the beat a sixteenth late, so everything on the page sits one
 * sixteenth EARLY of where a reader expects it: the snare lands on the "e" of each beat instead of on
 * 2 and 4, and the keys chords anticipate the beat. Written in double time (152 bpm, every value doubled)
 * and moved an eighth later, the same sound reads plainly: backbeat on 2 and 4, kick on 1, keys on the beat.
 *
 * How the original is built, so the arithmetic is visible. Think of the reading a drummer would write:
 * 4 bars of 4/4 at 152 bpm, counted in eighths E = 0..31 (E/8 whole notes from the start; beats on even E).
 *   hi-hat  every beat            E = 0, 2, 4, …, 30
 *   snare   beats 2 and 4         E = 2, 6, 10, 14, 18, 22, 26, 30
 *   kick    1 and the "and" of 3  E = 0, 5 | 8, 11, 12 | 16, 21 | 24, 27, 28
 *   keys    chords on the beat    E(duration in eighths) = 0(1), 4(3) | 8(4), 12(2), 14(2) | 16(4), 20(4) | 24(2), 26(2), 28(3)
 * The original moves that an eighth EARLIER (E − 1, wrapping E = 0 to 31: it is a loop) and halves every
 * value and the tempo: an eighth at 152 bpm lasts as long as a sixteenth at 76 bpm. So the original, in
 * sixteenths S = E − 1 (S/16 whole notes) over 2 bars of 4/4 at 76 bpm, has every onset at S = E − 1 and every
 * duration, in sixteenths, equal to the reading's duration in eighths.
 */
import { describe, expect, it } from "vitest";
import { assertGroove, compareGrooves, findReadings, readabilityFigures, type GrooveDocument } from "../../../src/lib/rhythm";

const E = (...eighths: number[]) => eighths;
const toS = (e: number) => (e - 1 + 32) % 32; // E − 1, wrapping inside the 32-sixteenth loop
const at16 = (s: number) => `${s}/16`;

const HIHAT = E(0, 2, 4, 6, 8, 10, 12, 14, 16, 18, 20, 22, 24, 26, 28, 30);
const SNARE = E(2, 6, 10, 14, 18, 22, 26, 30);
const KICK = E(0, 5, 8, 11, 12, 16, 21, 24, 27, 28);
const CHORDS: [number, number][] = [[0, 1], [4, 3], [8, 4], [12, 2], [14, 2], [16, 4], [20, 4], [24, 2], [26, 2], [28, 3]];
const VOICING = [57, 60, 64]; // an A minor triad, A3 C4 E4

/** The original as the transcriber wrote it: 2 bars at 76 bpm on a sixteenth grid. */
function harbourLightsAsTapped(): GrooveDocument {
  return assertGroove({
    schemaVersion: 1,
    meter: { beatsPerBar: 4, beatUnit: 4 },
    tempo: { bpm: "76", beatNote: "1/4" },
    grid: { step: "1/16" },
    bars: 2,
    kit: {
      lanes: [
        // Hi-hat on every odd sixteenth: S = 31, 1, 3, …, 29.
        { piece: "hihat-closed", hits: HIHAT.map((e) => ({ at: at16(toS(e)) })) },
        // Snare on the "e" of every beat: S = 1, 5, 9, …, 29 (off-beat sixteenths).
        { piece: "snare", hits: SNARE.map((e) => ({ at: at16(toS(e)), dynamic: "accent" as const })) },
        // Kick S = 31, 4, 7, 10, 11, 15, 20, 23, 26, 27: never on a downbeat (S = 0 or 16).
        { piece: "kick", hits: KICK.map((e) => ({ at: at16(toS(e)) })) },
      ],
    },
    keys: {
      // Chords at S = 31(1), 3(3), 7(4), 11(2), 13(2), 15(4), 19(4), 23(2), 25(2), 27(3), in sixteenths.
      // Eight of the ten start a sixteenth before a beat and are still sounding on it: anticipations.
      notes: CHORDS.flatMap(([e, d]) => VOICING.map((pitch) => ({ at: at16(toS(e)), duration: at16(d), pitch, velocity: 80 }))),
      splitPitch: 60,
    },
  });
}

/** The reading a drummer would write: 4 bars at 152 bpm on an eighth grid (the arithmetic's starting point). */
function harbourLightsAsRead(): GrooveDocument {
  const at8 = (e: number) => `${e}/8`;
  return assertGroove({
    schemaVersion: 1,
    meter: { beatsPerBar: 4, beatUnit: 4 },
    tempo: { bpm: "152", beatNote: "1/4" },
    grid: { step: "1/8" },
    swing: { unit: "1/4", ratio: 0.5 }, // doubling carries the (straight) swing unit from an eighth to a quarter
    bars: 4,
    kit: {
      lanes: [
        { piece: "hihat-closed", hits: HIHAT.map((e) => ({ at: at8(e) })) },
        { piece: "snare", hits: SNARE.map((e) => ({ at: at8(e), dynamic: "accent" as const })) },
        { piece: "kick", hits: KICK.map((e) => ({ at: at8(e) })) },
      ],
    },
    keys: { notes: CHORDS.flatMap(([e, d]) => VOICING.map((pitch) => ({ at: at8(e), duration: at8(d), pitch, velocity: 80 }))), splitPitch: 60 },
  });
}

describe("worked example: a 76 bpm loop read as 152 bpm, displaced by an eighth", () => {
  const original = harbourLightsAsTapped();
  const readings = findReadings(original);
  const top = readings[0]!;

  it("has the everyday problem on the page", () => {
    const f = readabilityFigures(original);
    expect(f.tempo.bpm).toBe(76);
    expect(f.backbeat.share).toBe(0); // the snare is never on 2 and 4
    expect(f.downbeatKick.share).toBe(0); // nor the kick on 1
    expect(f.parts.keys.anticipations).toBe(8); // counted by hand above
  });

  it("ranks double time displaced by an eighth first", () => {
    expect(top.label).toBe("Double time, displaced by an eighth");
    expect(top.steps).toEqual([
      { op: "rescale", factor: "2" },
      { op: "displace", by: "1/8", mode: "rotate" },
    ]);
    expect(top.doc.tempo).toEqual({ bpm: "152", beatNote: "1/4" });
    expect(top.doc.bars).toBe(4);
  });

  it("gives the backbeat on 2 and 4, the kick on 1, and keys on the beat as reasons", () => {
    expect(top.figures.backbeat).toMatchObject({ beats: [2, 4], share: 1 });
    expect(top.figures.downbeatKick.share).toBe(1);
    expect(top.figures.parts.keys.anticipations).toBe(0);
    expect(top.reasons).toContain("backbeat lands on 2 and 4");
    expect(top.reasons).toContain("keys anticipations drop from 8 to 0");
    expect(top.reasons).toContain("tempo 152 is within the usual range (60–180)");
  });

  it("is exactly the reading the arithmetic started from", () => {
    const expected = harbourLightsAsRead();
    expect(top.doc.kit).toEqual(expected.kit);
    expect(top.doc.keys).toEqual(expected.keys);
  });

  it("is proven to sound the same as the original", () => {
    expect(["identical", "offset"]).toContain(top.equivalence.verdict);
    const again = compareGrooves(original, top.doc);
    expect(again.verdict).toBe(top.equivalence.verdict);
  });
});
