/**
 * Engraving rules of notation spelling, checked on small hand-written grooves.
 *
 * Sources, named beside each check:
 * - [OU] The Open University, "An introduction to music theory" (OpenLearn, 2016), sections 3.6 (beaming)
 *   and 4.2 (rests), as verified in the project's reference notes.
 * - [Gould] E. Gould, "Behind Bars" (Faber, 2011): FROM MEMORY, not re-read for this project.
 * - [PAS] N. Weinberg, "Guide to Standardized Drumset Notation" (Percussive Arts Society, 1998), as followed by
 *   published teaching texts (verified in the reference notes).
 * - [common practice] facts of the trade.
 */
import { describe, expect, it } from "vitest";
import {
  assertGroove,
  spellGroove,
  type GrooveDocumentInput,
  type KeysHead,
  type KitHead,
  type NoteEvent,
  type VoiceEvent,
} from "../../../src/lib/rhythm";

type Patch = Partial<Omit<GrooveDocumentInput, "kit" | "keys" | "meter">> & {
  meter?: { beatsPerBar: number; beatUnit: number; grouping?: number[] };
  kit?: Record<string, (string | { at: string; dynamic?: "ghost" | "normal" | "accent"; articulation?: "flam" | "open" | "choke" })[]>;
  keys?: { at: string; duration: string; pitch: number }[];
  splitPitch?: number;
};

function groove(p: Patch) {
  const { kit = {}, keys = [], splitPitch = 60, ...rest } = p;
  return assertGroove({
    schemaVersion: 1,
    meter: { beatsPerBar: 4, beatUnit: 4 },
    tempo: { bpm: "96", beatNote: "1/4" },
    grid: { step: "1/16" },
    bars: 1,
    ...rest,
    kit: { lanes: Object.entries(kit).map(([piece, hits]) => ({ piece, hits: hits.map((h) => (typeof h === "string" ? { at: h } : h)) })) },
    keys: { notes: keys.map((n) => ({ ...n, velocity: 90 })), splitPitch },
  } as GrooveDocumentInput);
}

const SHORT: Record<string, string> = { whole: "w", half: "h", quarter: "q", eighth: "8", "16th": "16", "32nd": "32", "64th": "64" };

/** A voice as tokens: [tuplet "3:"] value [dots] ["r" for rests] ["~" when tied on]; "M" for a whole-bar rest. */
function tokens(events: readonly VoiceEvent[]): string[] {
  return events.map((e) => {
    if (e.kind === "rest" && e.measure) return "M";
    const tup = e.tuplet ? `${e.tuplet.actual}:` : "";
    const tie = e.kind === "note" && e.heads.some((h) => h.tieStart) ? "~" : "";
    return `${tup}${SHORT[e.value.type] ?? e.value.type}${".".repeat(e.value.dots)}${e.kind === "rest" ? "r" : ""}${tie}`;
  });
}

const beams = (events: readonly VoiceEvent[]) => events.filter((e): e is NoteEvent => e.kind === "note").map((e) => e.beam ?? 0);
const bar0 = (p: Patch) => spellGroove(groove(p)).bars[0]!;
const treble = (p: Patch) => bar0(p).keys!.treble;

describe("beat 3 stays visible in 4/4 [OU 4.2; Gould, from memory]", () => {
  it("splits a half note on beat 2 into tied quarters", () => {
    expect(tokens(treble({ keys: [{ at: "1/4", duration: "1/2", pitch: 72 }] }))).toEqual(["qr", "q~", "q", "qr"]);
  });

  it("splits a dotted quarter starting on the off-beat eighth before beat 3", () => {
    expect(tokens(treble({ keys: [{ at: "3/8", duration: "3/8", pitch: 72 }] }))).toEqual(["qr", "8r", "8~", "q", "qr"]);
  });

  it("splits a dotted quarter on beat 2 but keeps dotted quarters on beats 1 and 3", () => {
    expect(tokens(treble({ keys: [{ at: "1/4", duration: "3/8", pitch: 72 }] }))).toEqual(["qr", "q~", "8", "8r", "qr"]);
    const ok = [
      { at: "0", duration: "3/8", pitch: 72 },
      { at: "1/2", duration: "3/8", pitch: 72 },
    ];
    expect(tokens(treble({ keys: ok }))).toEqual(["q.", "8r", "q.", "8r"]);
  });

  it("keeps half notes on beats 1 and 3 and a whole note filling the bar", () => {
    const halves = [
      { at: "0", duration: "1/2", pitch: 72 },
      { at: "1/2", duration: "1/2", pitch: 74 },
    ];
    expect(tokens(treble({ keys: halves }))).toEqual(["h", "h"]);
    expect(tokens(treble({ keys: [{ at: "0", duration: "1", pitch: 72 }] }))).toEqual(["w"]);
  });

  it("splits a dotted half on beat 1, which would hide beat 3", () => {
    expect(tokens(treble({ keys: [{ at: "0", duration: "3/4", pitch: 72 }] }))).toEqual(["h~", "q", "qr"]);
  });

  it("ties a syncopated quarter across the beat inside a beat pair (the beat stays visible)", () => {
    expect(tokens(treble({ keys: [{ at: "1/8", duration: "1/4", pitch: 72 }] }))).toEqual(["8r", "8~", "8", "8r", "hr"]);
  });

  it("allows a dotted quarter on beat 1 and a half note on beat 2 of 3/4, which have no middle to hide [Gould, from memory]", () => {
    const meter = { beatsPerBar: 3, beatUnit: 4 };
    expect(tokens(treble({ meter, keys: [{ at: "0", duration: "3/8", pitch: 72 }] }))).toEqual(["q.", "8r", "qr"]);
    expect(tokens(treble({ meter, keys: [{ at: "1/4", duration: "1/2", pitch: 72 }] }))).toEqual(["qr", "h"]);
  });

  it("ties a note across the bar line [common practice: durations never cross a bar line]", () => {
    const s = spellGroove(groove({ bars: 2, keys: [{ at: "3/4", duration: "1/2", pitch: 72 }] }));
    expect(tokens(s.bars[0]!.keys!.treble)).toEqual(["hr", "qr", "q~"]);
    expect(tokens(s.bars[1]!.keys!.treble)).toEqual(["q", "qr", "hr"]);
    const head = (s.bars[1]!.keys!.treble[0] as NoteEvent).heads[0] as KeysHead;
    expect(head.tieStop).toBe(true);
  });

  it("keeps quarter–eighth and a whole-group dotted quarter in 6/8 [Gould, from memory]", () => {
    const meter = { beatsPerBar: 6, beatUnit: 8 };
    const keys = [
      { at: "0", duration: "1/4", pitch: 72 },
      { at: "1/4", duration: "1/8", pitch: 74 },
      { at: "3/8", duration: "3/8", pitch: 76 },
    ];
    expect(tokens(treble({ meter, tempo: { bpm: "60", beatNote: "3/8" }, keys }))).toEqual(["q", "8", "q."]);
  });
});

describe("rests [OU 4.2]", () => {
  it("writes a half rest on beats 3–4 of 4/4, never on beats 2–3", () => {
    expect(tokens(bar0({ kit: { kick: ["0"] } }).kit.down)).toEqual(["q", "qr", "hr"]);
    expect(tokens(treble({ keys: [{ at: "1/2", duration: "1/2", pitch: 72 }] }))).toEqual(["hr", "h"]);
  });

  it("separates quarters on beats 1 and 4 with two quarter rests", () => {
    expect(tokens(bar0({ kit: { kick: ["0", "3/4"] } }).kit.down)).toEqual(["q", "qr", "qr", "q"]);
  });

  it("groups rests shorter than a beat by half beat, never dotted in simple time", () => {
    expect(tokens(treble({ keys: [{ at: "0", duration: "1/16", pitch: 72 }] }))).toEqual(["16", "16r", "8r", "qr", "hr"]);
    expect(tokens(treble({ meter: { beatsPerBar: 2, beatUnit: 4 }, keys: [{ at: "0", duration: "1/8", pitch: 72 }] }))).toEqual(["8", "8r", "qr"]);
  });

  it("writes a whole-bar rest as a whole rest in any meter", () => {
    for (const meter of [
      { beatsPerBar: 4, beatUnit: 4 },
      { beatsPerBar: 3, beatUnit: 4 },
      { beatsPerBar: 5, beatUnit: 4 },
      { beatsPerBar: 6, beatUnit: 8 },
      { beatsPerBar: 7, beatUnit: 8, grouping: [2, 2, 3] },
    ]) {
      const bar = bar0({ meter, grid: { step: "1/8" }, keys: [{ at: "0", duration: "1/8", pitch: 40 }] });
      expect(bar.keys!.treble).toHaveLength(1);
      const rest = bar.keys!.treble[0]!;
      expect(rest.kind === "rest" && rest.measure, JSON.stringify(meter)).toBe(true);
      expect(rest.value).toEqual({ type: "whole", dots: 0 });
      expect(rest.duration).toBe(bar.length);
    }
  });

  it("shows an empty kit bar as one whole-bar rest, the second voice hidden", () => {
    const bar = bar0({ kit: { kick: [] } });
    expect(bar.kit.up).toEqual([expect.objectContaining({ kind: "rest", measure: true })]);
    expect(bar.kit.down).toEqual([expect.objectContaining({ kind: "rest", measure: true, hidden: true })]);
  });

  it("allows a dotted rest for a whole dotted beat in compound time [Gould, from memory]", () => {
    const meter = { beatsPerBar: 6, beatUnit: 8 };
    expect(tokens(treble({ meter, keys: [{ at: "0", duration: "1/8", pitch: 72 }] }))).toEqual(["8", "8r", "8r", "q.r"]);
  });
});

describe("beams follow the meter [OU 3.6]", () => {
  it("beams eighths in 4/4 beat by beat, never across the middle of the bar", () => {
    const bar = bar0({ kit: { "hihat-closed": ["0", "1/8", "1/4", "3/8", "1/2", "5/8", "3/4", "7/8"] } });
    expect(tokens(bar.kit.up)).toEqual(Array(8).fill("8"));
    expect(beams(bar.kit.up)).toEqual([1, 1, 2, 2, 3, 3, 4, 4]);
  });

  it("beams sixteenths in 4/4 in fours, one beat each", () => {
    const bar = bar0({ kit: { "hihat-closed": Array.from({ length: 16 }, (_, i) => `${i}/16`) } });
    expect(beams(bar.kit.up)).toEqual([1, 1, 1, 1, 2, 2, 2, 2, 3, 3, 3, 3, 4, 4, 4, 4]);
  });

  it("beams six eighths in 6/8 as two groups of three", () => {
    const bar = bar0({
      meter: { beatsPerBar: 6, beatUnit: 8 },
      tempo: { bpm: "60", beatNote: "3/8" },
      kit: { "hihat-closed": ["0", "1/8", "1/4", "3/8", "1/2", "5/8"] },
    });
    expect(beams(bar.kit.up)).toEqual([1, 1, 1, 2, 2, 2]);
  });

  it("beams 12/8 in four groups of three", () => {
    const bar = bar0({ meter: { beatsPerBar: 12, beatUnit: 8 }, kit: { ride: Array.from({ length: 12 }, (_, i) => `${i}/8`) } });
    expect(beams(bar.kit.up)).toEqual([1, 1, 1, 2, 2, 2, 3, 3, 3, 4, 4, 4]);
  });

  it("beams 7/8 by its grouping 2+2+3", () => {
    const bar = bar0({
      meter: { beatsPerBar: 7, beatUnit: 8, grouping: [2, 2, 3] },
      kit: { "hihat-closed": Array.from({ length: 7 }, (_, i) => `${i}/8`) },
    });
    expect(beams(bar.kit.up)).toEqual([1, 1, 2, 2, 3, 3, 3]);
    expect(spellGroove(groove({ meter: { beatsPerBar: 7, beatUnit: 8, grouping: [2, 2, 3] } })).meter.grouping).toEqual([2, 2, 3]);
  });

  it("keeps a rest inside a beat under the beam, but a quarter note breaks it", () => {
    const keys = [
      { at: "0", duration: "1/16", pitch: 72 },
      { at: "1/8", duration: "1/16", pitch: 72 },
      { at: "3/16", duration: "1/16", pitch: 72 },
      { at: "1/4", duration: "1/4", pitch: 72 },
      { at: "5/8", duration: "1/8", pitch: 72 },
      { at: "3/4", duration: "1/16", pitch: 72 },
      { at: "13/16", duration: "1/16", pitch: 72 },
    ];
    const t = treble({ keys });
    // beat 1: 16th, 16th rest, two 16ths under one beam; beat 2: a quarter; beat 3: eighth rest and a lone
    // eighth (a flag, no beam); beat 4: two 16ths beamed, then an eighth rest.
    expect(tokens(t)).toEqual(["16", "16r", "16", "16", "q", "8r", "8", "16", "16", "8r"]);
    expect(beams(t)).toEqual([1, 1, 1, 0, 0, 2, 2]);
  });
});

describe("triplet grids become tuplets inside the beat", () => {
  it("writes three eighth-triplet hits as one 3:2 group per beat", () => {
    const bar = bar0({ grid: { step: "1/12" }, kit: { ride: ["0", "1/12", "1/6", "1/4"] } });
    expect(tokens(bar.kit.up)).toEqual(["3:8", "3:8", "3:8", "q", "hr"]);
    expect(bar.kit.up.slice(0, 3).map((e) => e.tuplet)).toEqual([
      { actual: 3, normal: 2, group: 1, position: "start" },
      { actual: 3, normal: 2, group: 1, position: "middle" },
      { actual: 3, normal: 2, group: 1, position: "end" },
    ]);
  });

  it("writes the shuffle as triplet quarter + triplet eighth", () => {
    const bar = bar0({ grid: { step: "1/12" }, kit: { ride: ["0", "1/6", "1/4", "5/12"] } });
    expect(tokens(bar.kit.up).slice(0, 4)).toEqual(["3:q", "3:8", "3:q", "3:8"]);
    expect(new Set(bar.kit.up.slice(0, 4).map((e) => e.tuplet!.group)).size).toBe(2);
  });

  it("splits sixteenth triplets into half-beat groups when nothing crosses the half beat", () => {
    const bar = bar0({ grid: { step: "1/24" }, kit: { snare: Array.from({ length: 6 }, (_, i) => `${i}/24`) } });
    expect(tokens(bar.kit.up).slice(0, 6)).toEqual(Array(6).fill("3:16"));
    expect(bar.kit.up.slice(0, 6).map((e) => e.tuplet!.group)).toEqual([1, 1, 1, 2, 2, 2]);
  });

  it("ties a keys note held across a beat of triplets, each beat its own tuplet", () => {
    const keys = [
      { at: "0", duration: "1/6", pitch: 72 },
      { at: "1/6", duration: "1/6", pitch: 74 },
      { at: "1/3", duration: "1/6", pitch: 76 },
    ];
    const t = treble({ grid: { step: "1/12" }, keys });
    expect(tokens(t)).toEqual(["3:q", "3:8~", "3:8", "3:q", "hr"]);
    expect(t[0]!.tuplet!.group).not.toBe(t[2]!.tuplet!.group);
  });

  it("writes quintuplet sixteenths on a 1/20 grid as 5:4", () => {
    const bar = bar0({ grid: { step: "1/20" }, kit: { snare: ["0", "1/20", "1/10", "3/20", "1/5"] } });
    expect(tokens(bar.kit.up).slice(0, 5)).toEqual(Array(5).fill("5:16"));
  });
});

describe("the kit in two voices [PAS]", () => {
  const bar = bar0({
    kit: {
      "hihat-closed": ["0", "1/8", "1/4", { at: "3/8", articulation: "open" }],
      snare: [{ at: "1/4", dynamic: "accent" }, { at: "5/16", dynamic: "ghost" }, { at: "3/4", articulation: "flam" }],
      kick: ["0", "1/2"],
      "hihat-foot": ["1/4", "3/4"],
    },
  });

  it("writes hands with stems up and feet with stems down", () => {
    const up = bar.kit.up.filter((e): e is NoteEvent => e.kind === "note");
    const down = bar.kit.down.filter((e): e is NoteEvent => e.kind === "note");
    expect(up.every((e) => e.stem === "up" && e.heads.every((h) => ["hihat-closed", "snare"].includes((h as KitHead).piece)))).toBe(true);
    expect(down.every((e) => e.stem === "down" && e.heads.every((h) => ["kick", "hihat-foot"].includes((h as KitHead).piece)))).toBe(true);
  });

  it("merges hits at the same position into a chord, lowest staff position first", () => {
    const beat2 = bar.kit.up.find((e) => e.at === "1/4") as NoteEvent;
    expect(beat2.heads.map((h) => (h as KitHead).piece)).toEqual(["snare", "hihat-closed"]);
  });

  it("writes a hit up to the next onset but never past its beat, then rests [PAS practice: short values]", () => {
    expect(tokens(bar.kit.down)).toEqual(["q", "q", "q", "q"]);
    const lone = bar0({ kit: { kick: ["1/8"] } });
    expect(tokens(lone.kit.down)).toEqual(["8r", "8", "qr", "hr"]);
  });

  it("writes kit notes no longer than a quarter, even where the beat is a half note", () => {
    const cut = bar0({ meter: { beatsPerBar: 2, beatUnit: 2 }, tempo: { bpm: "60", beatNote: "1/2" }, kit: { snare: ["0"] } });
    expect(tokens(cut.kit.up)).toEqual(["q", "qr", "hr"]);
  });

  it("marks accents, ghost notes, flams and the open hi-hat", () => {
    const heads = bar.kit.up.flatMap((e) => (e.kind === "note" ? (e.heads as KitHead[]) : []));
    expect(heads.find((h) => h.piece === "snare" && h.dynamic === "accent")!.display.accent).toBe(true);
    expect(heads.find((h) => h.piece === "snare" && h.dynamic === "ghost")!.display.ghost).toBe(true);
    expect(heads.find((h) => h.piece === "snare" && h.articulation === "flam")!.display.flam).toBe(true);
    expect(heads.find((h) => h.articulation === "open")!.display.open).toBe(true);
    expect(heads.filter((h) => h.piece === "hihat-closed" && !h.articulation).every((h) => !h.display.open)).toBe(true);
  });
});

describe("keys on a grand staff", () => {
  it("splits by pitch: splitPitch and above on the treble staff", () => {
    const bar = bar0({ keys: [{ at: "0", duration: "1/4", pitch: 60 }, { at: "0", duration: "1/4", pitch: 59 }] });
    expect(((bar.keys!.treble[0] as NoteEvent).heads[0] as KeysHead).midi).toBe(60);
    expect(((bar.keys!.bass[0] as NoteEvent).heads[0] as KeysHead).midi).toBe(59);
  });

  it("merges notes of equal length starting together into one chord", () => {
    const keys = [60, 64, 67].map((pitch) => ({ at: "0", duration: "1/4", pitch }));
    const t = treble({ keys });
    expect(tokens(t)).toEqual(["q", "qr", "hr"]);
    expect((t[0] as NoteEvent).heads.map((h) => (h as KeysHead).midi)).toEqual([60, 64, 67]);
  });

  it("writes notes of different lengths starting together as the shortest, the longer tied on (Tactus's rule)", () => {
    const t = treble({ keys: [{ at: "0", duration: "1/2", pitch: 60 }, { at: "0", duration: "1/4", pitch: 67 }] });
    expect(tokens(t)).toEqual(["q~", "q", "hr"]);
    const [first, second] = t as NoteEvent[];
    expect(first!.heads.map((h) => [(h as KeysHead).midi, h.tieStart])).toEqual([[60, true], [67, false]]);
    expect(second!.heads.map((h) => [(h as KeysHead).midi, h.tieStop])).toEqual([[60, true]]);
  });

  it("turns stems down for notes above the middle line and beams a group one way [common practice]", () => {
    const t = treble({ keys: [{ at: "0", duration: "1/8", pitch: 84 }, { at: "1/8", duration: "1/8", pitch: 67 }, { at: "1/4", duration: "1/4", pitch: 62 }] });
    expect((t as NoteEvent[]).slice(0, 3).map((e) => e.stem)).toEqual(["down", "down", "up"]);
  });

  it("prints accidentals that last to the bar line [common practice]", () => {
    const s = spellGroove(
      groove({
        bars: 2,
        keys: [
          { at: "0", duration: "1/4", pitch: 61 },
          { at: "1/4", duration: "1/4", pitch: 61 },
          { at: "1/2", duration: "1/4", pitch: 60 },
          { at: "3/4", duration: "1/4", pitch: 64 },
          { at: "1", duration: "1/4", pitch: 61 },
          { at: "5/4", duration: "1/4", pitch: 62 },
          { at: "3/2", duration: "1/4", pitch: 66 },
        ],
      }),
    );
    const acc = s.bars.flatMap((b) => b.keys!.treble.flatMap((e) => (e.kind === "note" ? e.heads.map((h) => (h as KeysHead).accidental ?? "-") : [])));
    expect(acc).toEqual(["sharp", "-", "natural", "-", "sharp", "-", "sharp"]);
  });
});
