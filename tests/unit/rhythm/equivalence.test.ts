/**
 * Proof of equivalence. Sources: common practice (double time with every value doubled sounds the same;
 * a pickup of an eighth note delays everything by an eighth), the project's 1 µs tolerance.
 */
import { describe, expect, it } from "vitest";
import {
  assertGroove,
  compareGrooves,
  displace,
  doubleTime,
  emptyGroove,
  rebar,
  type GrooveDocumentInput,
} from "../../../src/lib/rhythm";

const base = (patch: Partial<GrooveDocumentInput> = {}) =>
  assertGroove({
    ...emptyGroove(),
    tempo: { bpm: 120, beatNote: "1/4" },
    bars: 2,
    kit: {
      lanes: [
        { piece: "kick", hits: [{ at: "0" }, { at: "3/8" }, { at: "1" }, { at: "11/8" }] },
        { piece: "snare", hits: [{ at: "1/4" }, { at: "3/4", dynamic: "accent" }, { at: "5/4" }, { at: "3/2" }, { at: "7/4" }] },
      ],
    },
    keys: { notes: [{ at: "7/8", duration: "3/8", pitch: 64, velocity: 80 }, { at: "7/8", duration: "3/8", pitch: 67, velocity: 80 }], splitPitch: 60 },
    ...patch,
  });

describe("compareGrooves", () => {
  it("identical: the same groove written in double time", () => {
    const d = base();
    expect(compareGrooves(d, doubleTime(d))).toEqual({ verdict: "identical", matched: 11 });
    expect(compareGrooves(d, rebar(d, { beatsPerBar: 2, beatUnit: 2 }))).toMatchObject({ verdict: "identical" });
  });

  it("offset: a pickup of an eighth delays everything by 1/8, 250 ms at quarter = 120", () => {
    const v = compareGrooves(base(), displace(base(), "1/8", "pad"));
    expect(v).toMatchObject({ verdict: "offset", offsetNotes: "1/8", rotation: false, matched: 11 });
    if (v.verdict === "offset") {
      expect(v.offsetSeconds).toBeCloseTo(0.25, 9);
      expect(v.offsetMs).toBeCloseTo(250, 6);
    }
  });

  it("offset in a's note values when b is written at another tempo", () => {
    const a = base({ tempo: { bpm: 75, beatNote: "1/4" } });
    const b = displace(doubleTime(a), "1/8", "pad"); // an eighth at 150 is a sixteenth at 75
    const v = compareGrooves(a, b);
    expect(v).toMatchObject({ verdict: "offset", offsetNotes: "1/16" });
    if (v.verdict === "offset") expect(v.offsetMs).toBeCloseTo(200, 6); // a whole note lasts 3.2 s at quarter = 75
  });

  it("offset: a loop rotated by an eighth is the same loop heard from another point", () => {
    const d = base({ sections: [] });
    const v = compareGrooves(d, displace(d, "-1/8"));
    expect(v).toMatchObject({ verdict: "offset", rotation: true, offsetNotes: "-1/8" });
  });

  it("different: names the first mismatch in bars, beats and pieces", () => {
    const a = base();
    const b = assertGroove({ ...a, kit: { lanes: [a.kit.lanes[0]!, { piece: "snare", hits: a.kit.lanes[1]!.hits.filter((h) => h.at !== "3/2") }] } });
    const v = compareGrooves(a, b);
    expect(v.verdict).toBe("different");
    if (v.verdict !== "different") return;
    expect(v.matched).toBe(10);
    expect(v.mismatches).toHaveLength(1);
    expect(v.mismatches[0]).toMatchObject({ side: "a", bar: 2, beat: 3, piece: "snare", text: "bar 2, beat 3: snare only in a" });
    expect(v.mismatches[0]!.time).toBeCloseTo(3, 9);
  });

  it("different: a changed dynamic or note length counts, on both sides", () => {
    const a = base();
    const b = assertGroove({ ...a, keys: { ...a.keys, notes: a.keys.notes.map((n) => ({ ...n, duration: n.pitch === 67 ? "1/4" : n.duration })) } });
    const v = compareGrooves(a, b);
    expect(v.verdict).toBe("different");
    if (v.verdict === "different") expect(v.mismatches.map((m) => [m.side, m.pitch, m.text])).toEqual([
      ["a", 67, "bar 1, beat 4 and: pitch 67 (velocity 80) only in a"],
      ["b", 67, "bar 1, beat 4 and: pitch 67 (velocity 80) only in b"],
    ]);
  });

  it("uses a tolerance of 1 microsecond", () => {
    // Bar 2 beat 4 sits at 3.5 s; a tempo off by 1e-7 moves it by 0.35 µs, by 1e-5 by 35 µs.
    const a = base();
    const near = assertGroove({ ...a, tempo: { bpm: 120 * (1 + 1e-7), beatNote: "1/4" } });
    const far = assertGroove({ ...a, tempo: { bpm: 120 * (1 + 1e-5), beatNote: "1/4" } });
    expect(compareGrooves(a, near).verdict).toBe("identical");
    expect(compareGrooves(a, far).verdict).toBe("different");
  });

  it("lists at most ten mismatches", () => {
    const a = base({ kit: { lanes: [{ piece: "hihat-closed", hits: Array.from({ length: 32 }, (_, i) => ({ at: `${i}/16` })) }] } });
    const b = base({ kit: { lanes: [{ piece: "ride", hits: Array.from({ length: 32 }, (_, i) => ({ at: `${i}/16` })) }] } });
    const v = compareGrooves(a, b);
    expect(v.verdict === "different" && v.mismatches.length).toBe(10);
  });
});
