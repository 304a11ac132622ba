/**
 * Published syncopation measures, checked against the worked values of their papers: Longuet-Higgins & Lee
 * (1984), figure 9, as reproduced by H. Honing's published implementation; Gómez, Melvin, Rappaport &
 * Toussaint (2005), figure 8 (REFERENCES.md). Anticipations are Tactus's own count, checked by hand.
 */
import { describe, expect, it } from "vitest";
import {
  anticipations,
  lhlSyncopation,
  metricalHierarchy,
  offBeatness,
  weightsFromDivisions,
  wnbd,
} from "../../../src/lib/rhythm";

/**
 * LHL write a rhythm as inter-onset intervals and a meter as the factors that divide the bar, top down:
 * "(1 3) in (2 2)" is a bar cut in two halves, each cut in two (4 pulses, weights 0 −2 −1 −2), holding a
 * note of 1 pulse then a note of 3 pulses. The onsets are the running sums of the intervals: 0 and 1.
 * The last note lasts to the bar line, where the next bar's downbeat begins (the published implementation
 * appends an onset there); played as a loop, the wrap to pulse 0 is that same downbeat.
 */
function figure9(iois: number[], divisions: number[]) {
  const weights = weightsFromDivisions(divisions);
  const cycle = weights.length;
  const total = iois.reduce((a, b) => a + b, 0);
  if (cycle % total !== 0) throw new Error("the meter cannot hold the rhythm");
  const scale = cycle / total; // the implementation scales a short rhythm up to fill the grid
  const onsets: number[] = [];
  let at = 0;
  for (const d of iois) {
    onsets.push(at);
    at += d * scale;
  }
  return lhlSyncopation(onsets, cycle, (p) => weights[p]!);
}

describe("metrical weights (Longuet-Higgins & Lee 1984)", () => {
  it("builds LHL's own meters from their division lists", () => {
    // Values from the paper's scheme as listed in H. Honing's published LHL implementation (comments of lh-metric-salience).
    expect(weightsFromDivisions([2, 2, 2])).toEqual([0, -3, -2, -3, -1, -3, -2, -3]); // 4/4 in eighths
    expect(weightsFromDivisions([3, 2])).toEqual([0, -2, -1, -2, -1, -2]); // 3/4 in eighths
    expect(weightsFromDivisions([2, 3])).toEqual([0, -2, -2, -1, -2, -2]); // 6/8 in eighths
    expect(weightsFromDivisions([2, 2, 3])).toEqual([0, -3, -3, -2, -3, -3, -1, -3, -3, -2, -3, -3]); // 12/8
  });

  it("derives the same hierarchy from a document's meter and grid", () => {
    // REFERENCES.md: 4/4 on an eighth grid reads 0 −3 −2 −3 −1 −3 −2 −3.
    expect(metricalHierarchy({ beatsPerBar: 4, beatUnit: 4 }, "1/8").weights).toEqual([0, -3, -2, -3, -1, -3, -2, -3]);
    expect(metricalHierarchy({ beatsPerBar: 3, beatUnit: 4 }, "1/8").weights).toEqual(weightsFromDivisions([3, 2]));
    expect(metricalHierarchy({ beatsPerBar: 6, beatUnit: 8 }, "1/8", "3/8").weights).toEqual(weightsFromDivisions([2, 3]));
    expect(metricalHierarchy({ beatsPerBar: 12, beatUnit: 8 }, "1/8", "3/8").weights).toEqual(weightsFromDivisions([2, 2, 3]));
    expect(metricalHierarchy({ beatsPerBar: 3, beatUnit: 2 }, "1/8").weights).toEqual(weightsFromDivisions([3, 2, 2]));
    expect(metricalHierarchy({ beatsPerBar: 4, beatUnit: 4 }, "1/16").weights).toEqual(weightsFromDivisions([2, 2, 2, 2]));
  });

  it("follows a given grouping in odd meters and places triplet grids under the beat", () => {
    const seven = metricalHierarchy({ beatsPerBar: 7, beatUnit: 8, grouping: [2, 2, 3] }, "1/8");
    expect(seven.weights).toEqual([0, -2, -1, -2, -1, -2, -2]);
    expect(seven.beats).toEqual([0, 2, 4]); // the felt beats are the groups
    // Without a grouping, 7/8 takes the same default groups as the notation beams (2+2+3, see meter.ts).
    expect(metricalHierarchy({ beatsPerBar: 7, beatUnit: 8 }, "1/8").weights).toEqual(seven.weights);
    // Eighth-note triplets: each quarter divides in three.
    expect(metricalHierarchy({ beatsPerBar: 2, beatUnit: 4 }, "1/12").weights).toEqual(weightsFromDivisions([2, 3]));
  });

  it("finds the felt beat and the backbeat positions", () => {
    const fourFour = metricalHierarchy({ beatsPerBar: 4, beatUnit: 4 }, "1/16", "1/4");
    expect(fourFour.beats).toEqual([0, 4, 8, 12]);
    expect(fourFour.weakBeats).toEqual([4, 12]); // beats 2 and 4 (common practice)
    expect(metricalHierarchy({ beatsPerBar: 3, beatUnit: 4 }, "1/8", "1/4").weakBeats).toEqual([2, 4]); // 2 and 3
    expect(metricalHierarchy({ beatsPerBar: 6, beatUnit: 8 }, "1/8", "3/8").weakBeats).toEqual([3]); // second dotted quarter
    expect(metricalHierarchy({ beatsPerBar: 12, beatUnit: 8 }, "1/8", "3/8").weakBeats).toEqual([3, 9]);
    expect(metricalHierarchy({ beatsPerBar: 4, beatUnit: 4 }, "1/8", "1/2").beats).toEqual([0, 4]); // felt in two
  });
});

describe("Longuet-Higgins & Lee syncopation, the paper's figure 9", () => {
  // Worked values of figure 9 of Longuet-Higgins & Lee (1984), as reproduced by H. Honing's published
  // implementation of the measure (REFERENCES.md).
  it("(1 3) in (2 2) → 1: the note on pulse 1 (−2) sounds through the half bar (−1)", () => {
    const r = figure9([1, 3], [2, 2]);
    expect(r.total).toBe(1);
    expect(r.syncopations).toEqual([{ note: 1, rest: 2, noteWeight: -2, restWeight: -1, strength: 1 }]);
  });

  it("(2 1 3 2) in (2 2 2) → 2: the note on pulse 3 (−3) is held over the half bar (−1)", () => {
    // Onsets 0, 2, 3, 6 of 8 pulses; weights 0 −3 −2 −3 −1 −3 −2 −3.
    const r = figure9([2, 1, 3, 2], [2, 2, 2]);
    expect(r.total).toBe(2);
    expect(r.syncopations.map((s) => s.note)).toEqual([3]);
  });

  it("(3 1) in (2 2) → no syncopation: nothing weaker is held over something stronger", () => {
    expect(figure9([3, 1], [2, 2]).total).toBeNull();
  });

  it("(1 2) in (3) → 0: a syncopation of strength zero, which is not the same as none", () => {
    // Three pulses, weights 0 −1 −1: the note on pulse 1 is followed by silence of equal weight.
    const r = figure9([1, 2], [3]);
    expect(r.total).toBe(0);
    expect(r.syncopations).toHaveLength(1);
    // Its mirror (2 1) in (3) has no syncopation at all (same source).
    expect(figure9([2, 1], [3]).total).toBeNull();
  });

  it("pairs a note with the strongest silent pulse before the next onset", () => {
    // Further examples of the same published implementation: (1 2 1) in (2 2) → strength 1;
    // (1 4 3) in (2 2 2) → 2 + 1 (its listed values are strengths + 1: (3 2)).
    expect(figure9([1, 2, 1], [2, 2]).total).toBe(1);
    expect(figure9([1, 4, 3], [2, 2, 2]).total).toBe(3);
  });
});

describe("WNBD and off-beatness (Gómez, Melvin, Rappaport & Toussaint 2005)", () => {
  const pattern = (s: string) => [...s].flatMap((c, i) => (c === "x" ? [i] : []));
  const beats = [0, 4, 8, 12]; // 16 pulses, a beat every 4
  // The paper's figure 8 values for the six 16-pulse rhythms (REFERENCES.md; verified in a published implementation).
  it.each([
    ["shiko", "x...x.x...x.x...", 1.2, 0],
    ["son", "x..x..x...x.x...", 2.8, 1],
    ["rumba", "x..x...x..x.x...", 3.6, 2],
    ["soukous", "x..x..x...xx....", 3.6, 2],
    ["gahu", "x..x..x...x...x.", 3.6, 1],
    ["bossa-nova", "x..x..x...x..x..", 4.0, 2],
  ])("%s %s → WNBD %d, off-beatness %d", (_name, p, w, off) => {
    expect(wnbd(pattern(p), 16, beats)).toBeCloseTo(w, 12);
    expect(offBeatness(pattern(p), 16)).toBe(off);
  });

  it("uses 'strictly before' the beat after next (with 'at or before', soukous would give 4.4)", () => {
    // Soukous' onset on pulse 11 lasts to pulse 16, exactly the beat after next: it scores 1/T = 4, not 2/T = 8.
    const soukous = pattern("x..x..x...xx....");
    expect(wnbd(soukous, 16, beats)).toBeCloseTo(3.6, 12);
    expect(wnbd(soukous, 16, beats)).not.toBeCloseTo(4.4, 6);
  });

  it("scores zero for onsets on the beat", () => {
    expect(wnbd([0, 4, 8, 12], 16, beats)).toBe(0);
    expect(wnbd([], 16, beats)).toBe(0);
  });
});

describe("anticipations", () => {
  it("counts off-beat notes held over the next beat", () => {
    // Eighth pulses of one 4/4 bar, beats on 0 2 4 6: a note on 3 held to 5 crosses beat 3 (pulse 4).
    expect(anticipations([0, 3, 5], 8, [0, 2, 4, 6])).toBe(2); // 3 over 4, and 5 over 6
    expect(anticipations([0, 3, 4, 5, 6], 8, [0, 2, 4, 6])).toBe(0);
    // The last note of a loop wraps: pulse 7 held into the next downbeat.
    expect(anticipations([7], 8, [0, 2, 4, 6])).toBe(1);
  });
});
