/**
 * Renotation transforms: rescale, displace, re-bar.
 * Sources: common practice (doubling the tempo and every duration, or re-barring 4/4 as 2/2 with half = the
 * old quarter tempo ÷ 2, leaves the sound unchanged); the project's own promises (exact inverses, 1 µs).
 */
import { fc, test } from "@fast-check/vitest";
import { describe, expect, it } from "vitest";
import {
  assertGroove,
  barLength,
  compareGrooves,
  compileSchedule,
  displace,
  displaceWithReport,
  doubleTime,
  emptyGroove,
  halfTime,
  playOrder,
  q,
  rebar,
  rescale,
  RhythmError,
  secondsPerWholeNote,
  setGrid,
  shiftKeepsSwing,
  writeOutRepeats,
  type GrooveDocument,
  type GrooveDocumentInput,
} from "../../../src/lib/rhythm";
import { grooveArb, loopArb } from "./arbitraries";
import { expectSameSound } from "./sound";

const straight = (d: GrooveDocument) => d.swing.ratio === 0.5;
const tiles = (d: GrooveDocument, unit: ReturnType<typeof q>) => barLength(d.meter).div(unit.mul(2)).d === 1n;

/** A shift in grid steps, within one groove length either way. */
const shiftFor = (d: GrooveDocument) => {
  const T = Number(barLength(d.meter).mul(d.bars).div(q(d.grid.step)).n);
  return fc.integer({ min: -T + 1, max: T - 1 }).map((t) => q(d.grid.step).mul(t).toFraction());
};

describe("rescale", () => {
  test.prop([grooveArb()])("×2 keeps every onset and duration in seconds (common practice: double time)", (d) => {
    const gridOk = barLength(d.meter).div(q(d.grid.step).mul(2)).d === 1n;
    const swingOk = straight(d) || (tiles(d, q(d.swing.unit)) && tiles(d, q(d.swing.unit).mul(2)));
    if (!gridOk || !swingOk) {
      expect(() => doubleTime(d)).toThrow(RhythmError);
      return;
    }
    const dd = doubleTime(d);
    expect(q(dd.tempo.bpm).equals(q(d.tempo.bpm).mul(2))).toBe(true);
    expect(dd.bars).toBe(d.bars * 2);
    expectSameSound(compileSchedule(d), compileSchedule(dd));
    expect(rescale(dd, "1/2")).toEqual(d); // exact inverse
  });

  test.prop([grooveArb({ barMultiple: 2 })])("×1/2 keeps the sound and ×2 brings the document back exactly", (d) => {
    const swingOk = straight(d) || (tiles(d, q(d.swing.unit)) && tiles(d, q(d.swing.unit).div(2)));
    if (!swingOk) {
      expect(() => halfTime(d)).toThrow(RhythmError);
      return;
    }
    const h = halfTime(d);
    expect(h.bars).toBe(d.bars / 2);
    expectSameSound(compileSchedule(d), compileSchedule(h));
    expect(doubleTime(h)).toEqual(d);
  });

  test.prop([grooveArb({ swing: false, maxBpm: 200 }), fc.constantFrom("3", "3/2", "4")])("other factors keep the sound when the result can be written", (d, k) => {
    let r: GrooveDocument;
    try {
      r = rescale(d, k);
    } catch (e) {
      expect(e).toBeInstanceOf(RhythmError);
      return;
    }
    expectSameSound(compileSchedule(d), compileSchedule(r));
    expect(rescale(r, q(1).div(q(k)))).toEqual(d);
  });

  it("refuses half time of an odd bar count with a clear reason", () => {
    const d = assertGroove({ ...emptyGroove(), bars: 3 });
    expect(() => halfTime(d)).toThrow("halving a 3-bar groove gives 1 1/2 bars; add a bar or re-bar first");
  });

  it("refuses a grid that would no longer divide the bar, and a section that would not be whole", () => {
    const d38 = assertGroove({ ...emptyGroove(), meter: { beatsPerBar: 3, beatUnit: 8 }, tempo: { bpm: 120, beatNote: "1/8" }, grid: { step: "1/8" } });
    expect(() => doubleTime(d38)).toThrow(/1\/4 steps, which do not divide a 3\/8 bar/);
    const song = assertGroove({ ...emptyGroove(), bars: 4, sections: [{ name: "Verse", startBar: 0, bars: 3, repeats: 1 }, { name: "Tag", startBar: 3, bars: 1, repeats: 1 }] });
    expect(() => halfTime(song)).toThrow(/section "Verse" \(3 bars\) last 1 1\/2 bars/);
  });
});

describe("displace: rotate (loops)", () => {
  test.prop([loopArb().chain((d) => fc.tuple(fc.constant(d), shiftFor(d)))])("the inverse rotation returns the document exactly", ([d, x]) => {
    const there = displace(d, x);
    expect(displace(there, q(x).neg())).toEqual(d);
  });

  test.prop([loopArb().chain((d) => fc.tuple(fc.constant(d), shiftFor(d)))])("a rotated loop sounds the same heard from another point", ([d, x]) => {
    const v = compareGrooves(d, displace(d, x));
    expect(["identical", "offset"]).toContain(v.verdict);
  });

  test.prop([loopArb({ swing: true }).chain((d) => fc.tuple(fc.constant(d), shiftFor(d)))])("with swing, it rotates only by whole swing pairs", ([d, x]) => {
    if (!shiftKeepsSwing(d.swing, d.meter, x)) {
      expect(() => displace(d, x)).toThrow(/changes the sound/);
      return;
    }
    expect(displace(displace(d, x), q(x).neg())).toEqual(d);
    expect(["identical", "offset"]).toContain(compareGrooves(d, displace(d, x)).verdict);
  });

  const loop = (): GrooveDocumentInput => ({
    ...emptyGroove(),
    tempo: { bpm: 120, beatNote: "1/4" },
    grid: { step: "1/8" },
    kit: { lanes: [{ piece: "snare", hits: [{ at: "1/4" }, { at: "3/4" }] }] },
    keys: { notes: [{ at: "3/4", duration: "1/4", pitch: 64, velocity: 80 }], splitPitch: 60 },
  });

  it("splits a note held across the seam, marks the piece at 0, and joins it back", () => {
    const d = assertGroove(loop());
    const r = displace(d, "1/8");
    expect(r.kit.lanes[0]!.hits.map((h) => h.at)).toEqual(["3/8", "7/8"]);
    expect(r.keys.notes).toEqual([
      { at: "0", duration: "1/8", pitch: 64, velocity: 80, tiedFromEnd: true },
      { at: "7/8", duration: "1/8", pitch: 64, velocity: 80 },
    ]);
    expect(assertGroove(r)).toEqual(r); // still a valid, normalised document
    expect(displace(r, "-1/8")).toEqual(d);
    const v = compareGrooves(d, r);
    expect(v).toMatchObject({ verdict: "offset", rotation: true, offsetNotes: "1/8" });
  });

  it("plays a split note as one held note when the loop repeats", () => {
    const r = displace(assertGroove({ ...loop(), sections: [{ name: "Loop", startBar: 0, bars: 1, repeats: 2 }] }), "1/8");
    const keys = compileSchedule(r).filter((e) => e.kind === "keys");
    // 120 bpm quarter: a whole note lasts 2 s. Pass 1: the piece at 0 (0.25 s) sounds, then the note at 7/8
    // (1.75 s) is held over the repeat for 1/8 + 1/8 (0.5 s) without a new attack.
    // Pass 2 ends the play order, so its last note stops at the end.
    expect(keys.map((e) => [e.time, e.duration])).toEqual([[0, 0.25], [1.75, 0.5], [3.75, 0.25]]);
  });

  test.prop([loopArb({ maxBars: 4 }).chain((d) => fc.tuple(fc.constant(d), shiftFor(d), fc.integer({ min: 2, max: 3 })))])(
    "a rotated loop that repeats plays the same when its repeats are written out",
    ([d, x, repeats]) => {
      const r = displace({ ...d, sections: [{ name: "Loop", startBar: 0, bars: d.bars, repeats }] }, x);
      const flat = writeOutRepeats(r);
      expect(flat.sections.every((s) => s.repeats === 1)).toBe(true);
      expectSameSound(compileSchedule(r), compileSchedule(flat));
      expect(assertGroove(flat)).toEqual(flat);
    },
  );

  it("rejects a tiedFromEnd mark away from the start", () => {
    expect(() => assertGroove({ ...loop(), keys: { notes: [{ at: "1/8", duration: "1/8", pitch: 60, tiedFromEnd: true }] } })).toThrow(/only a note at 0/);
  });

  it("keeps two repeated notes that meet at the seam as two notes", () => {
    const d = assertGroove({ ...loop(), keys: { notes: [{ at: "0", duration: "1/8", pitch: 60 }, { at: "7/8", duration: "1/8", pitch: 60 }], splitPitch: 60 } });
    const r = displace(d, "1/8");
    expect(r.keys.notes).toEqual([{ at: "0", duration: "1/8", pitch: 60, velocity: 90 }, { at: "1/8", duration: "1/8", pitch: 60, velocity: 90 }]);
    expect(displace(r, "-1/8")).toEqual(d);
  });

  it("refuses song forms and off-grid shifts", () => {
    const song = assertGroove({ ...loop(), bars: 2, sections: [{ name: "A", startBar: 0, bars: 1, repeats: 1 }, { name: "B", startBar: 1, bars: 1, repeats: 1 }] });
    expect(() => displace(song, "1/8")).toThrow(/rotation applies to a loop/);
    expect(() => displace(assertGroove(loop()), "1/16")).toThrow(/not a whole number of 1\/8 grid steps/);
  });
});

describe("displace: pad and trim (song form)", () => {
  test.prop([grooveArb().chain((d) => fc.tuple(fc.constant(d), shiftFor(d)))])("pad keeps the sound, moved by the shift plus any pickup bars", ([d, x]) => {
    if (!shiftKeepsSwing(d.swing, d.meter, x)) {
      expect(() => displace(d, x, "pad")).toThrow(RhythmError);
      return;
    }
    const r = displaceWithReport(d, x, "pad");
    const moved = q(x).add(barLength(d.meter).mul(r.addedBars.before));
    expectSameSound(compileSchedule(d), compileSchedule(r.doc), moved.valueOf() * secondsPerWholeNote(d.tempo));
    expect(assertGroove(r.doc)).toEqual(r.doc);
  });

  test.prop([grooveArb({ swing: false }).chain((d) => fc.tuple(fc.constant(d), shiftFor(d)))])("trim keeps what stays inside and reports the rest", ([d, x]) => {
    const r = displaceWithReport(d, x, "trim");
    const flat = writeOutRepeats(d);
    expect(r.doc.bars).toBe(flat.bars);
    const hits = (g: GrooveDocument) => g.kit.lanes.reduce((a, l) => a + l.hits.length, 0);
    expect(hits(r.doc) + r.dropped.hits.length).toBe(hits(flat));
    const end = barLength(d.meter).mul(flat.bars);
    const inside = (at: string) => q(at).add(q(x)).compare(0) >= 0 && q(at).add(q(x)).compare(end) < 0;
    for (const h of r.dropped.hits) expect(inside(h.at)).toBe(false);
    const spw = secondsPerWholeNote(d.tempo);
    const kit = (g: GrooveDocument, shift: number) => compileSchedule(g).filter((e) => e.kind === "kit").map((e) => ({ ...e, time: e.time + shift }));
    const expected = kit(flat, q(x).valueOf() * spw).filter((e) => e.time >= -1e-9 && e.time < end.valueOf() * spw - 1e-9);
    expectSameSound(expected, kit(r.doc, 0));
    expect(assertGroove(r.doc)).toEqual(r.doc);
  });

  it("adds a pickup bar when material moves before the start", () => {
    const d = assertGroove({
      ...emptyGroove(),
      bars: 2,
      sections: [{ name: "Verse", startBar: 0, bars: 2, repeats: 1 }],
      kit: { lanes: [{ piece: "kick", hits: [{ at: "0" }, { at: "1" }] }] },
    });
    const r = displaceWithReport(d, "-1/8", "pad");
    expect(r.addedBars).toEqual({ before: 1, after: 0 });
    expect(r.doc.bars).toBe(3);
    expect(r.doc.sections).toEqual([{ name: "Pickup", startBar: 0, bars: 1, repeats: 1 }, { name: "Verse", startBar: 1, bars: 2, repeats: 1 }]);
    expect(r.doc.kit.lanes[0]!.hits.map((h) => h.at)).toEqual(["7/8", "15/8"]);
  });

  it("writes out repeats, since moved material no longer lines up with them", () => {
    const d = assertGroove({ ...emptyGroove(), bars: 1, sections: [{ name: "A", startBar: 0, bars: 1, repeats: 3 }], kit: { lanes: [{ piece: "snare", hits: [{ at: "3/4" }] }] } });
    const r = displaceWithReport(d, "1/4", "trim");
    expect(r.repeatsWrittenOut).toBe(true);
    expect(r.doc.kit.lanes[0]!.hits.map((h) => h.at)).toEqual(["1", "2"]);
    expect(r.dropped.hits).toEqual([{ piece: "snare", at: "11/4", dynamic: "normal" }]);
  });
});

describe("rebar", () => {
  test.prop([grooveArb({ meters: [{ beatsPerBar: 4, beatUnit: 4 }] })])("4/4 ↔ 2/2 keeps the sound; quarter = n becomes half = n/2", (d) => {
    const cut = rebar(d, { beatsPerBar: 2, beatUnit: 2 });
    expect(cut.tempo).toEqual({ bpm: q(d.tempo.bpm).div(2).toFraction(), beatNote: "1/2" });
    expect(cut.bars).toBe(d.bars);
    expectSameSound(compileSchedule(d), compileSchedule(cut));
    expect(rebar(cut, { beatsPerBar: 4, beatUnit: 4 })).toEqual(d);
  });

  test.prop([grooveArb({ meters: [{ beatsPerBar: 4, beatUnit: 4 }], barMultiple: 2 })])("two bars of 4/4 ↔ one bar of 8/4", (d) => {
    const long = rebar(d, { beatsPerBar: 8, beatUnit: 4 });
    expect(long.bars).toBe(d.bars / 2);
    expectSameSound(compileSchedule(d), compileSchedule(long));
    expect(rebar(long, { beatsPerBar: 4, beatUnit: 4 })).toEqual(d);
  });

  test.prop([grooveArb({ meters: [{ beatsPerBar: 3, beatUnit: 4 }], swing: false })])("3/4 ↔ 6/8 keeps the sound; quarter = n becomes dotted quarter = 2n/3", (d) => {
    const six = rebar(d, { beatsPerBar: 6, beatUnit: 8, grouping: [3, 3] });
    expect(six.tempo).toEqual({ bpm: q(d.tempo.bpm).mul(2).div(3).toFraction(), beatNote: "3/8" });
    expectSameSound(compileSchedule(d), compileSchedule(six));
    expect(rebar(six, { beatsPerBar: 3, beatUnit: 4 })).toEqual(d);
  });

  it("refuses a meter the groove does not fill in whole bars", () => {
    const d = assertGroove({ ...emptyGroove(), bars: 3 });
    expect(() => rebar(d, { beatsPerBar: 8, beatUnit: 4 })).toThrow("3 bars of 4/4 make 1 1/2 bars of 8/4; add bars first so the groove fills whole bars");
    expect(() => rebar(d, { beatsPerBar: 7, beatUnit: 8, grouping: [2, 2, 2] })).toThrow(/does not add up/);
  });
});

describe("composition", () => {
  test.prop([loopArb({ meters: [{ beatsPerBar: 4, beatUnit: 4 }, { beatsPerBar: 3, beatUnit: 4 }, { beatsPerBar: 6, beatUnit: 8 }], grids: ["1/16"], maxBpm: 200 })])(
    "double time then an eighth of displacement sounds like the original heard an eighth later",
    (d) => {
      const c = displace(doubleTime(d), "1/8");
      const v = compareGrooves(d, c);
      expect(["identical", "offset"]).toContain(v.verdict);
      // Undo in reverse order: exact.
      expect(halfTime(displace(c, "-1/8"))).toEqual(d);
    },
  );

  test.prop([loopArb({ meters: [{ beatsPerBar: 4, beatUnit: 4 }], grids: ["1/8"], maxBpm: 200 })])("on a coarse grid, refine the grid first (setGrid)", (d) => {
    expect(() => displace(doubleTime(d), "1/8")).toThrow(/not a whole number of 1\/4 grid steps/);
    const c = displace(setGrid(doubleTime(d), "1/8"), "1/8");
    expect(["identical", "offset"]).toContain(compareGrooves(d, c).verdict);
    expect(setGrid(halfTime(displace(c, "-1/8")), d.grid.step)).toEqual(d);
  });
});

describe("compileSchedule on any valid document", () => {
  test.prop([grooveArb()])("never throws, stays sorted and inside the play order", (d) => {
    const events = compileSchedule(d);
    const order = playOrder(d);
    const passSeconds = barLength(d.meter).valueOf() * secondsPerWholeNote(d.tempo);
    events.forEach((e, i) => {
      if (i > 0) expect(e.time).toBeGreaterThanOrEqual(events[i - 1]!.time);
      expect(e.duration).toBeGreaterThan(0);
      expect(order[e.pass]).toBe(e.bar);
      expect(e.time).toBeGreaterThanOrEqual(e.pass * passSeconds - 1e-9);
      expect(e.time).toBeLessThan((e.pass + 1) * passSeconds);
    });
    const perPass = (kind: "kit" | "keys") => events.filter((e) => e.kind === kind).length;
    const barsPlayed = order.reduce((m, b) => m.set(b, (m.get(b) ?? 0) + 1), new Map<number, number>());
    const expectedHits = d.kit.lanes.flatMap((l) => l.hits).reduce((a, h) => a + (barsPlayed.get(Math.floor(q(h.at).div(barLength(d.meter)).valueOf())) ?? 0), 0);
    expect(perPass("kit")).toBe(expectedHits);
  });
});
