/**
 * The schedule compiler and swing, checked against facts from outside the project:
 * - common practice: quarter = 60 bpm lasts one second; in 6/8 the dotted quarter carries the beat;
 *   triplet swing (ratio 2/3) puts the off-beat eighth on the third triplet eighth, 2/3 of the beat;
 * - @tonaljs/duration-value, a general-purpose music-theory package, as an oracle for note values.
 */
import { get as tonalDuration } from "@tonaljs/duration-value";
import { describe, expect, it } from "vitest";
import {
  assertGroove,
  compileSchedule,
  doubleTime,
  emptyGroove,
  halfTime,
  KIT_HIT_SECONDS,
  scheduleLength,
  secondsPerWholeNote,
  swingPosition,
  type GrooveDocumentInput,
} from "../../../src/lib/rhythm";

const groove = (patch: Partial<GrooveDocumentInput>) => assertGroove({ ...emptyGroove(), tempo: { bpm: 60, beatNote: "1/4" }, ...patch });
const close = (x: number, y: number) => expect(Math.abs(x - y)).toBeLessThan(1e-9);

describe("seconds from note values", () => {
  it("quarter = 60 bpm lasts one second (common practice)", () => {
    const d = groove({
      kit: { lanes: [{ piece: "kick", hits: [{ at: "0" }, { at: "1/4" }, { at: "3/4" }] }] },
      keys: { notes: [{ at: "0", duration: "1/4", pitch: 60 }], splitPitch: 60 },
    });
    const events = compileSchedule(d);
    expect(events.filter((e) => e.kind === "kit").map((e) => e.time)).toEqual([0, 1, 3]);
    expect(events.find((e) => e.kind === "keys")!.duration).toBe(1);
    expect(scheduleLength(d)).toBe(4);
    expect(secondsPerWholeNote(d.tempo)).toBe(4);
  });

  it("in 6/8 with the dotted quarter at 60 bpm, a bar lasts 2 s and an eighth 1/3 s (common practice)", () => {
    const d = groove({
      meter: { beatsPerBar: 6, beatUnit: 8, grouping: [3, 3] },
      tempo: { bpm: 60, beatNote: "3/8" },
      grid: { step: "1/8" },
      kit: { lanes: [{ piece: "kick", hits: [{ at: "0" }, { at: "1/8" }, { at: "3/8" }] }] },
    });
    expect(scheduleLength(d)).toBe(2);
    const times = compileSchedule(d).map((e) => e.time);
    close(times[1]!, 1 / 3);
    close(times[2]!, 1);
  });

  it("the same tempo marking on another beat note scales time (quarter = 120 is half = 60)", () => {
    const q120 = groove({ tempo: { bpm: 120, beatNote: "1/4" } });
    const h60 = groove({ tempo: { bpm: 60, beatNote: "1/2" } });
    expect(scheduleLength(q120)).toBe(2);
    expect(scheduleLength(h60)).toBe(2);
  });

  it.each([
    ["whole", "1"],
    ["half", "1/2"],
    ["quarter", "1/4"],
    ["eighth", "1/8"],
    ["sixteenth", "1/16"],
    ["q.", "3/8"],
    ["e.", "3/16"],
  ])("a %s note lasts its @tonaljs/duration-value value × 4 s at quarter = 60", (name, ours) => {
    const tonal = tonalDuration(name);
    expect(tonal.empty).toBe(false);
    // The oracle's value is in whole notes, like ours.
    expect(tonal.fraction[0] / tonal.fraction[1]).toBe(tonal.value);
    const d = groove({ keys: { notes: [{ at: "0", duration: ours, pitch: 60 }], splitPitch: 60 } });
    close(compileSchedule(d)[0]!.duration, tonal.value * 4);
  });

  it("double time turns each note value into the next longer one (checked with @tonaljs/duration-value)", () => {
    const pairs: [string, string][] = [["eighth", "quarter"], ["sixteenth", "eighth"], ["q.", "h."], ["e.", "q."], ["half", "whole"]];
    for (const [short, long] of pairs) {
      const [n, dd] = tonalDuration(short).fraction;
      const d = groove({ bars: 2, grid: { step: "1/16" }, keys: { notes: [{ at: "0", duration: `${n}/${dd}`, pitch: 60 }], splitPitch: 60 } });
      const doubled = doubleTime(d).keys.notes[0]!.duration;
      const [ln, ld] = tonalDuration(long).fraction;
      expect(doubled).toBe(ld === 1 ? `${ln}` : `${ln}/${ld}`);
      expect(halfTime(doubleTime(d)).keys.notes[0]!.duration).toBe(`${n}/${dd}`);
    }
  });
});

describe("swing", () => {
  const swung = (ratio: number, unit = "1/8") =>
    groove({
      swing: { unit, ratio },
      grid: { step: "1/16" },
      kit: { lanes: [{ piece: "hihat-closed", hits: ["0", "1/16", "1/8", "1/4", "3/8"].map((at) => ({ at })) }] },
      keys: { notes: [{ at: "0", duration: "1/8", pitch: 60 }], splitPitch: 60 },
    });

  it("triplet swing (2/3) puts the off-beat eighth at 2/3 of the beat (common practice)", () => {
    const hats = compileSchedule(swung(2 / 3)).filter((e) => e.kind === "kit");
    close(hats[2]!.time, 2 / 3); // the "and" of beat 1
    close(hats[3]!.time, 1); // beat 2 stays
    close(hats[4]!.time, 1 + 2 / 3); // the "and" of beat 2
    close(hats[1]!.time, 1 / 3); // a sixteenth inside the long first eighth: linear, 1/16 ↦ 1/3 of the beat
  });

  it("applies to both ends of keys notes: a swung first eighth lasts 2/3 of the beat", () => {
    const note = compileSchedule(swung(2 / 3)).find((e) => e.kind === "keys")!;
    close(note.duration, 2 / 3);
  });

  it("ratio 1/2 is straight", () => {
    const hats = compileSchedule(swung(0.5)).filter((e) => e.kind === "kit");
    expect(hats.map((e) => e.time)).toEqual([0, 0.25, 0.5, 1, 1.5]);
  });

  it("sixteenth swing works on pairs of sixteenths", () => {
    const hats = compileSchedule(swung(2 / 3, "1/16")).filter((e) => e.kind === "kit");
    close(hats[1]!.time, 1 / 3); // 2/3 of an eighth (0.5 s)
    close(hats[2]!.time, 0.5);
  });

  it("leaves an incomplete pair at the end of a 7/8 bar straight", () => {
    const meter = { beatsPerBar: 7, beatUnit: 8 as const, grouping: [2, 2, 3] };
    const s = { unit: "1/8", ratio: 2 / 3 };
    close(swingPosition("1/8", s, meter), 1 / 6);
    close(swingPosition("6/8", s, meter), 6 / 8);
    close(swingPosition("7/8", s, meter), 7 / 8); // next bar's downbeat
    close(swingPosition("1", s, meter), 7 / 8 + 1 / 6); // the second eighth of bar 2 is swung again
  });
});

describe("play order and event order", () => {
  it("plays sections with repeats, numbering passes, and lets a note ring into the next pass", () => {
    const d = groove({
      bars: 2,
      sections: [
        { name: "A", startBar: 0, bars: 1, repeats: 2 },
        { name: "B", startBar: 1, bars: 1, repeats: 1 },
      ],
      kit: { lanes: [{ piece: "snare", hits: [{ at: "1/4" }, { at: "5/4" }] }] },
      keys: { notes: [{ at: "3/4", duration: "1/2", pitch: 60 }], splitPitch: 60 },
    });
    const events = compileSchedule(d);
    expect(events.filter((e) => e.kind === "kit").map((e) => [e.time, e.bar, e.pass])).toEqual([[1, 0, 0], [5, 0, 1], [9, 1, 2]]);
    expect(events.filter((e) => e.kind === "keys").map((e) => [e.time, e.duration, e.pass])).toEqual([[3, 2, 0], [7, 2, 1]]);
    expect(scheduleLength(d)).toBe(12);
  });

  it("orders simultaneous events: kit before keys, kit pieces in table order, pitches low to high", () => {
    const d = groove({
      kit: { lanes: [{ piece: "hihat-closed", hits: [{ at: "0" }] }, { piece: "snare", hits: [{ at: "0", dynamic: "accent" }] }, { piece: "kick", hits: [{ at: "0", dynamic: "ghost" }] }] },
      keys: { notes: [{ at: "0", duration: "1/4", pitch: 67 }, { at: "0", duration: "1/4", pitch: 60, velocity: 70 }], splitPitch: 60 },
    });
    const events = compileSchedule(d);
    expect(events.map((e) => e.piece ?? e.pitch)).toEqual(["kick", "snare", "hihat-closed", 60, 67]);
    // DYNAMIC_VELOCITY for kit hits, the note's own velocity for keys; kit hits last a nominal time.
    expect(events.map((e) => e.velocity)).toEqual([40, 120, 90, 70, 90]);
    expect(events[0]!.duration).toBe(KIT_HIT_SECONDS);
    expect(compileSchedule(d)).toEqual(events); // deterministic
  });
});
