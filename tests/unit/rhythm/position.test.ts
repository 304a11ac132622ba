/**
 * Meter helpers and positions in words. Sources: common practice for counting ("1 e and a" for sixteenths,
 * "1 trip let" for triplets, compound meters counted in dotted beats, 7/8 as 2+2+3 counted by group); the
 * default groupings follow The Open University, "An introduction to music theory" (OpenLearn 2016), 3.6, and
 * E. Gould, "Behind Bars" (2011, from memory), as meter.ts says.
 */
import { describe, expect, it } from "vitest";
import {
  assertGroove,
  beatGrouping,
  beatLengths,
  beatStarts,
  describeInMeter,
  describePosition,
  emptyGroove,
  isCompound,
  metricalHierarchy,
  naturalBeatNote,
  spellGroove,
  timeSignature,
} from "../../../src/lib/rhythm";

const m44 = { beatsPerBar: 4, beatUnit: 4 as const };
const m68 = { beatsPerBar: 6, beatUnit: 8 as const };
const m78 = { beatsPerBar: 7, beatUnit: 8 as const, grouping: [2, 2, 3] };

describe("meter", () => {
  it("counts compound meters in dotted beats and odd meters by group", () => {
    expect([isCompound(m44), isCompound(m68), isCompound({ beatsPerBar: 12, beatUnit: 8 }), isCompound({ beatsPerBar: 3, beatUnit: 8 })]).toEqual([false, true, true, false]);
    expect(beatLengths(m68).map(String)).toEqual(["0.375", "0.375"]);
    expect(beatLengths(m78).map((f) => f.toFraction())).toEqual(["1/4", "1/4", "3/8"]);
    expect([naturalBeatNote(m44), naturalBeatNote(m68), naturalBeatNote({ beatsPerBar: 2, beatUnit: 2 })]).toEqual(["1/4", "3/8", "1/2"]);
    expect(timeSignature(m78)).toBe("7/8 (2+2+3)");
  });

  it("counts an ungrouped 5/8 or 7/8 by the default groups, 3/8 and 4/8 in eighths (common practice)", () => {
    const lengths = (beatsPerBar: number) => beatLengths({ beatsPerBar, beatUnit: 8 }).map((f) => f.toFraction());
    expect(lengths(7)).toEqual(["1/4", "1/4", "3/8"]); // 2+2+3, as the notation beams it
    expect(lengths(5)).toEqual(["1/4", "3/8"]); // 2+3
    expect(lengths(3)).toEqual(["1/8", "1/8", "1/8"]);
    expect(lengths(4)).toEqual(["1/8", "1/8", "1/8", "1/8"]);
    expect(describeInMeter({ beatsPerBar: 7, beatUnit: 8 }, "5/8").text).toBe("bar 1, beat 3 and");
  });

  it("uses one grouping for counting, notation and the metrical hierarchy", () => {
    // The same meter must not be grouped one way on the page and another way by the syncopation measures.
    for (const meter of [{ beatsPerBar: 7, beatUnit: 8 }, { beatsPerBar: 5, beatUnit: 8 }, { beatsPerBar: 6, beatUnit: 8 }, { beatsPerBar: 9, beatUnit: 8 }]) {
      const groups = beatGrouping(meter);
      const doc = assertGroove({ ...emptyGroove(), meter, tempo: { bpm: 120, beatNote: naturalBeatNote(meter) }, grid: { step: "1/8" } });
      expect(spellGroove(doc).meter.grouping, JSON.stringify(meter)).toEqual(groups);
      const starts = groups.slice(0, -1).reduce((acc, g) => [...acc, acc[acc.length - 1]! + g], [0]);
      expect(metricalHierarchy(meter, "1/8").levels, JSON.stringify(meter)).toContainEqual(starts);
      expect(beatStarts(meter).map((f) => Number(f.mul(8).valueOf())), JSON.stringify(meter)).toEqual(starts);
    }
  });
});

describe("describePosition", () => {
  const doc = emptyGroove();
  it.each([
    ["0", "bar 1, beat 1"],
    ["1/16", "bar 1, beat 1 e"],
    ["1/8", "bar 1, beat 1 and"],
    ["3/16", "bar 1, beat 1 a"],
    ["13/8", "bar 2, beat 3 and"],
    ["1/12", "bar 1, beat 1 trip"],
    ["1/6", "bar 1, beat 1 let"],
    ["1/32", "bar 1, beat 1 +1/32"],
  ])("4/4: %s whole notes is %s", (at, text) => {
    expect(describePosition(doc, at).text).toBe(text);
  });

  it("6/8 counts dotted beats: 1 and a 2 and a", () => {
    expect(["0", "1/8", "1/4", "3/8", "1/2", "7/8"].map((at) => describeInMeter(m68, at).text)).toEqual([
      "bar 1, beat 1",
      "bar 1, beat 1 and",
      "bar 1, beat 1 a",
      "bar 1, beat 2",
      "bar 1, beat 2 and",
      "bar 2, beat 1 and",
    ]);
  });

  it("7/8 (2+2+3) counts its three groups", () => {
    expect(["1/4", "1/2", "5/8", "3/4"].map((at) => describeInMeter(m78, at))).toEqual([
      { bar: 1, beat: 2, text: "bar 1, beat 2" },
      { bar: 1, beat: 3, text: "bar 1, beat 3" },
      { bar: 1, beat: 3, sub: "and", text: "bar 1, beat 3 and" },
      { bar: 1, beat: 3, sub: "a", text: "bar 1, beat 3 a" },
    ]);
  });
});
