/**
 * The reading finder. Sources: common practice (a rock beat has the snare on 2 and 4 and the kick on 1; the
 * re-barring twins 4/4 ↔ 2/2 and 3/4 ↔ 6/8; double and half time keep the sound); the usual tempo range
 * (60–180 bpm) from memory; the rest checks Tactus's own documented ranking (readings.ts: score, simplicity,
 * id) and its promise that every returned reading is proven equivalent.
 */
import { fc, test } from "@fast-check/vitest";
import { describe, expect, it, vi } from "vitest";
import {
  applySteps,
  compareGrooves,
  displace,
  findReadings,
  rebarTwins,
  rescale,
  valueWords,
  type GrooveDocument,
  type Transform,
} from "../../../src/lib/rhythm";
import { grooveArb, loopArb } from "./arbitraries";
import { groove, rockBeat } from "./grooves";


// The proof step is real (compareGrooves) unless a test asks it to reject some documents, to show that a
// candidate failing the proof is never returned.
const proof = vi.hoisted(() => ({ reject: null as null | ((b: GrooveDocument) => boolean) }));
vi.mock("../../../src/lib/rhythm/equivalence", async (importOriginal) => {
  const actual = await importOriginal<typeof import("../../../src/lib/rhythm/equivalence")>();
  return {
    ...actual,
    compareGrooves: (a: GrooveDocument, b: GrooveDocument) =>
      proof.reject?.(b) ? { verdict: "different", matched: 0, mismatches: [] } : actual.compareGrooves(a, b),
  };
});

describe("applySteps", () => {
  it("replays serialised steps exactly as the transforms compose", () => {
    const d = rockBeat({ bpm: "76", bars: 2 });
    const steps: Transform[] = JSON.parse(
      JSON.stringify([
        { op: "rescale", factor: "2" },
        { op: "displace", by: "1/8", mode: "rotate" },
        { op: "rebar", meter: { beatsPerBar: 2, beatUnit: 2 } },
      ]),
    );
    const out = applySteps(d, steps);
    expect(out.meter).toEqual({ beatsPerBar: 2, beatUnit: 2 });
    expect(applySteps(d, steps.slice(0, 2))).toEqual(displace(rescale(d, 2), "1/8", "rotate"));
    expect(applySteps(d, [])).toBe(d);
  });
});

describe("words", () => {
  it("names displacements in note values", () => {
    expect(["1/8", "-1/16", "3/16", "3/8", "5/16", "1/12", "1/4"].map(valueWords)).toEqual([
      "an eighth",
      "a sixteenth",
      "a dotted eighth",
      "a dotted quarter",
      "5 sixteenths",
      "an eighth-note triplet",
      "a quarter",
    ]);
  });

  it("offers the common re-barring of the same bar length (common practice: 4/4 ↔ 2/2, 3/4 ↔ 6/8)", () => {
    expect(rebarTwins({ beatsPerBar: 4, beatUnit: 4 })).toEqual([{ beatsPerBar: 2, beatUnit: 2 }]);
    expect(rebarTwins({ beatsPerBar: 6, beatUnit: 8 })).toEqual([{ beatsPerBar: 3, beatUnit: 4 }]);
    // 6/8 with its usual 3+3 written out is still plain 6/8; an unusual grouping has no twin.
    expect(rebarTwins({ beatsPerBar: 6, beatUnit: 8, grouping: [3, 3] })).toEqual([{ beatsPerBar: 3, beatUnit: 4 }]);
    expect(rebarTwins({ beatsPerBar: 4, beatUnit: 4, grouping: [2, 2] })).toEqual([]);
    expect(rebarTwins({ beatsPerBar: 7, beatUnit: 8, grouping: [2, 2, 3] })).toEqual([]);
  });
});

describe("findReadings", () => {
  it("keeps a plain rock beat as written, and says why", () => {
    const rs = findReadings(rockBeat({ bpm: "120", bars: 2 }));
    expect(rs[0]!.id).toBe("asis");
    expect(rs[0]!.label).toBe("As written");
    expect(rs[0]!.steps).toEqual([]);
    expect(rs[0]!.equivalence.verdict).toBe("identical");
    expect(rs[0]!.reasons).toEqual(["backbeat lands on 2 and 4", "kick on beat 1 of every bar", "tempo 120 is within the usual range (60–180)"]);
  });

  it("sorts by score, then simplicity, with unique ids and the score the sum of its parts", () => {
    const rs = findReadings(rockBeat({ bpm: "120", bars: 2 }), { limit: 40 });
    expect(rs.length).toBe(40);
    for (let i = 1; i < rs.length; i++) expect(rs[i]!.score).toBeGreaterThanOrEqual(rs[i - 1]!.score - 1e-9);
    expect(new Set(rs.map((r) => r.id)).size).toBe(rs.length);
    for (const r of rs) expect(r.score).toBeCloseTo(Object.values(r.scoreParts).reduce((a, b) => a + b, 0), 12);
  });

  it("says when a tempo leaves the usual range", () => {
    const half = findReadings(rockBeat({ bpm: "100", bars: 2 }), { factors: ["1/2"], limit: 1 })[0]!;
    expect(half.label).toMatch(/^Half time/);
    expect(half.reasons).toContain("tempo 50 is below the usual range (60–180)");
    expect(half.scoreParts.tempo).toBeGreaterThan(0);
  });

  it("skips candidates that cannot be written (halving three bars)", () => {
    const rs = findReadings(rockBeat({ bpm: "120", bars: 3 }), { limit: 500 });
    expect(rs.some((r) => r.steps.some((s) => s.op === "rescale" && s.factor === "1/2"))).toBe(false);
    expect(rs.some((r) => r.steps.some((s) => s.op === "rescale" && s.factor === "2"))).toBe(true);
  });

  it("with swing, displaces only by whole swing pairs (other moves would change the sound)", () => {
    const swung = { ...rockBeat({ bpm: "120", bars: 2 }), swing: { unit: "1/8", ratio: 2 / 3 } };
    const rs = findReadings(swung, { limit: 500, rebar: false });
    const moves = rs.flatMap((r) => r.steps.filter((s) => s.op === "displace").map((s) => (s as { by: string }).by));
    expect(moves.length).toBeGreaterThan(0);
    for (const r of rs.filter((x) => x.steps.length === 1 && x.steps[0]!.op === "displace"))
      expect(["1/4", "-1/4", "1/2"]).toContain((r.steps[0] as { by: string }).by);
  });

  it("honours limit and maxCandidates", () => {
    expect(findReadings(rockBeat(), { limit: 3 })).toHaveLength(3);
    const one = findReadings(rockBeat(), { maxCandidates: 1 });
    expect(one.map((r) => r.id)).toEqual(["asis"]);
  });

  it("never returns a candidate that fails the proof of equivalence", () => {
    proof.reject = (b) => b.tempo.bpm === "240";
    try {
      const rs = findReadings(rockBeat({ bpm: "120", bars: 2 }), { limit: 500 });
      expect(rs.length).toBeGreaterThan(0);
      expect(rs.some((r) => r.doc.tempo.bpm === "240")).toBe(false);
    } finally {
      proof.reject = null;
    }
    expect(findReadings(rockBeat({ bpm: "120", bars: 2 }), { limit: 500 }).some((r) => r.doc.tempo.bpm === "240")).toBe(true);
  });

  it("uses a pickup bar, not rotation, for a song form", () => {
    const song = groove({
      ...rockBeat({ bpm: "120", bars: 2 }),
      sections: [
        { name: "Verse", startBar: 0, bars: 1, repeats: 2 },
        { name: "Chorus", startBar: 1, bars: 1, repeats: 1 },
      ],
    });
    const rs = findReadings(song, { limit: 500 });
    const moves = rs.flatMap((r) => r.steps.filter((s) => s.op === "displace"));
    expect(moves.length).toBeGreaterThan(0);
    expect(moves.every((s) => s.op === "displace" && s.mode === "pad")).toBe(true);
  });
});

describe("findReadings properties", () => {
  // Small grooves (findReadings tries about a hundred candidates each), few runs: these are slow properties.
  test.prop([fc.oneof(loopArb({ maxBars: 2 }), grooveArb({ maxBars: 2 }))], { numRuns: 15 })(
    "is deterministic and every reading replays from its steps and sounds like the input",
    (d) => {
      const a = findReadings(d, { limit: 6 });
      const b = findReadings(structuredClone(d), { limit: 6 });
      expect(b).toEqual(a);
      expect(a.length).toBeGreaterThan(0); // the groove as written is always a candidate
      for (const r of a) {
        expect(["identical", "offset"]).toContain(compareGrooves(d, r.doc).verdict);
        expect(applySteps(d, r.steps)).toEqual(r.doc);
      }
    },
    120_000,
  );
});
