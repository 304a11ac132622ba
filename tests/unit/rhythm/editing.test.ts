/**
 * Edit operations. Sources: common practice (a 4/4 bar holds 16 sixteenths; counting "1 e and a"),
 * @tonaljs/duration-value as an oracle for note values, MIDI 1.0 (7-bit note numbers and velocities); the rest
 * checks Tactus's own editing rules (editing.ts: nothing is dropped silently, sections keep tiling the bars,
 * every edit returns a valid document).
 */
import { describe, expect, it } from "vitest";
import { fc, test } from "@fast-check/vitest";
import { fraction as tonalFraction } from "@tonaljs/duration-value";
import {
  addKeyNote,
  addLane,
  atOfStep,
  changeGrid,
  changeMeter,
  changeSwing,
  changeTempo,
  copyBars,
  cycleDynamic,
  deleteBar,
  describeAt,
  describeDropped,
  duplicateBar,
  hitAt,
  insertBar,
  keyNoteAt,
  paintRun,
  pasteBars,
  removeKeyNote,
  setKeyNoteVelocity,
  removeLane,
  resizeKeyNote,
  setArticulation,
  stepCount,
  toggleHit,
} from "../../../src/lib/rhythm/editing";
import { emptyGroove, parseGroove, type GrooveDocument } from "../../../src/lib/rhythm/document";
import { KIT_PIECE_IDS } from "../../../src/lib/rhythm/kit";
import { valid } from "./grooves";

/** Duration value of a note name as "n/d" whole notes, from @tonaljs/duration-value (an outside oracle). */
const tonal = (name: string) => {
  const [n, d] = tonalFraction(name);
  return `${n}/${d}`;
};


/** A two-bar 4/4 groove: hi-hat eighths, snare on 2 and 4, kick on 1 and the "and" of 3, one keys chord. */
function rockBeat(): GrooveDocument {
  let doc = insertBar(emptyGroove(), 1);
  for (let bar = 0; bar < 2; bar++) {
    const b = bar;
    for (let e = 0; e < 8; e++) doc = toggleHit(doc, "hihat-closed", `${b * 8 + e}/8`);
    doc = toggleHit(doc, "snare", `${b * 4 + 1}/4`);
    doc = toggleHit(doc, "snare", `${b * 4 + 3}/4`);
    doc = toggleHit(doc, "kick", `${b}`);
    doc = toggleHit(doc, "kick", `${b * 8 + 5}/8`);
  }
  doc = addKeyNote(doc, { at: "0", pitch: 60, duration: "1/2" });
  doc = addKeyNote(doc, { at: "0", pitch: 64, duration: "1/2" });
  return valid(doc);
}

describe("grid geometry", () => {
  it("a 4/4 bar on a sixteenth grid has 16 steps (common practice)", () => {
    expect(stepCount(emptyGroove())).toBe(16);
    // Step 4 is beat 2: a quarter note is four sixteenths (@tonaljs/duration-value).
    expect(atOfStep(emptyGroove(), 4)).toBe(tonal("quarter"));
  });

  it("names positions with the counting words musicians use (common practice: 1 e and a)", () => {
    const doc = emptyGroove();
    expect(describeAt(doc, "0")).toBe("bar 1, beat 1");
    expect(describeAt(doc, "5/4")).toBe("bar 2, beat 2");
    expect(describeAt(doc, "7/16")).toBe("bar 1, beat 2 a");
  });
});

describe("kit hits", () => {
  it("toggles a hit on and off and keeps the lane sorted", () => {
    let doc = emptyGroove();
    doc = toggleHit(doc, "snare", "3/4");
    doc = toggleHit(doc, "snare", "1/4");
    expect(doc.kit.lanes.find((l) => l.piece === "snare")!.hits).toEqual([
      { at: "1/4", dynamic: "normal" },
      { at: "3/4", dynamic: "normal" },
    ]);
    doc = toggleHit(doc, "snare", "1/4");
    expect(hitAt(doc, "snare", "1/4")).toBeUndefined();
    valid(doc);
  });

  it("leaves other lanes untouched (same objects), so a UI can re-render only what changed", () => {
    const doc = rockBeat();
    const next = toggleHit(doc, "snare", "1/16");
    expect(next.kit.lanes.find((l) => l.piece === "kick")).toBe(doc.kit.lanes.find((l) => l.piece === "kick"));
    expect(next.kit.lanes.find((l) => l.piece === "snare")).not.toBe(doc.kit.lanes.find((l) => l.piece === "snare"));
  });

  it("adds the row when a hit lands on a piece not yet in use", () => {
    const doc = toggleHit(emptyGroove(), "ride", "0");
    expect(doc.kit.lanes.map((l) => l.piece)).toContain("ride");
    valid(doc);
  });

  it("rejects positions off the grid or outside the groove", () => {
    expect(() => toggleHit(emptyGroove(), "snare", "1/32")).toThrow(/not on the 1\/16 grid/);
    expect(() => toggleHit(emptyGroove(), "snare", "1")).toThrow(/outside the groove/);
  });

  it("cycles the dynamic ghost → normal → accent → ghost", () => {
    let doc = cycleDynamic(emptyGroove(), "snare", "1/4");
    const seen = [hitAt(doc, "snare", "1/4")!.dynamic];
    for (let i = 0; i < 3; i++) {
      doc = cycleDynamic(doc, "snare", "1/4");
      seen.push(hitAt(doc, "snare", "1/4")!.dynamic);
    }
    expect(seen).toEqual(["normal", "accent", "ghost", "normal"]);
  });

  it("sets and clears articulations without touching the dynamic", () => {
    let doc = toggleHit(emptyGroove(), "hihat-closed", "1/8", "accent");
    doc = setArticulation(doc, "hihat-closed", "1/8", "open");
    expect(hitAt(doc, "hihat-closed", "1/8")).toEqual({ at: "1/8", dynamic: "accent", articulation: "open" });
    doc = setArticulation(doc, "hihat-closed", "1/8", null);
    expect(hitAt(doc, "hihat-closed", "1/8")).toEqual({ at: "1/8", dynamic: "accent" });
    valid(doc);
  });

  it("paints a run in either direction and erases one", () => {
    let doc = paintRun(emptyGroove(), "hihat-closed", "7/16", "1/16", "on");
    const lane = () => doc.kit.lanes.find((l) => l.piece === "hihat-closed")!.hits.map((h) => h.at);
    expect(lane()).toEqual(["1/16", "1/8", "3/16", "1/4", "5/16", "3/8", "7/16"]);
    doc = setArticulation(doc, "hihat-closed", "1/4", "open");
    doc = paintRun(doc, "hihat-closed", "0", "1/2", "on");
    expect(hitAt(doc, "hihat-closed", "1/4")!.articulation).toBe("open"); // painting over keeps what was there
    doc = paintRun(doc, "hihat-closed", "1/8", "1/4", "off");
    expect(lane()).toEqual(["0", "1/16", "5/16", "3/8", "7/16", "1/2"]);
    valid(doc);
  });
});

describe("lanes", () => {
  it("adds rows in kit order (cymbals, drums, feet) and never twice", () => {
    let doc = addLane(emptyGroove(), "crash");
    doc = addLane(doc, "tom-floor");
    expect(addLane(doc, "crash")).toBe(doc);
    expect(doc.kit.lanes.map((l) => l.piece)).toEqual(["crash", "hihat-closed", "snare", "tom-floor", "kick"]);
    expect(() => addLane(doc, "gong" as never)).toThrow(/unknown kit piece/);
  });

  it("removing a row reports its hits", () => {
    const { doc, dropped } = removeLane(rockBeat(), "snare");
    expect(doc.kit.lanes.map((l) => l.piece)).not.toContain("snare");
    expect(dropped).toHaveLength(4);
    expect(describeDropped(dropped[0]!)).toBe("Snare, bar 1, beat 2: the Snare row was removed");
  });
});

describe("keys notes", () => {
  it("stacks chords and finds the note held at a step", () => {
    const doc = rockBeat();
    expect(doc.keys.notes.filter((n) => n.at === "0").map((n) => n.pitch)).toEqual([60, 64]);
    expect(keyNoteAt(doc, 64, "3/8")?.at).toBe("0");
    expect(keyNoteAt(doc, 64, "1/2")).toBeUndefined();
  });

  it("shortens a same-pitch note still sounding where a new one starts", () => {
    const doc = addKeyNote(rockBeat(), { at: "1/4", pitch: 60 });
    expect(doc.keys.notes.filter((n) => n.pitch === 60)).toEqual([
      { at: "0", duration: "1/4", pitch: 60, velocity: 90 },
      { at: "1/4", duration: "1/16", pitch: 60, velocity: 90 },
    ]);
    valid(doc);
  });

  it("resizes on the grid, at least one step, never into the next same-pitch note or past the end", () => {
    let doc = addKeyNote(emptyGroove(), { at: "0", pitch: 67 });
    doc = addKeyNote(doc, { at: "3/4", pitch: 67 });
    expect(resizeKeyNote(doc, "0", 67, "5/32").keys.notes[0]!.duration).toBe("1/8"); // floor to the grid
    expect(resizeKeyNote(doc, "0", 67, "0").keys.notes[0]!.duration).toBe("1/16");
    expect(resizeKeyNote(doc, "0", 67, "2").keys.notes[0]!.duration).toBe("3/4");
    expect(resizeKeyNote(doc, "3/4", 67, "2").keys.notes[1]!.duration).toBe("1/4");
    expect(() => resizeKeyNote(doc, "1/16", 67, "1/8")).toThrow(/no note/);
  });

  it("removes a note by start and pitch", () => {
    const doc = removeKeyNote(rockBeat(), "0", 60);
    expect(doc.keys.notes.map((n) => n.pitch)).toEqual([64]);
  });

  it("sets a note's velocity inside MIDI's 1–127 (MIDI 1.0 note-on velocity is 7-bit; 0 means note-off)", () => {
    const before = rockBeat();
    const doc = valid(setKeyNoteVelocity(before, "0", 64, 40));
    expect(doc.keys.notes.map((n) => [n.pitch, n.velocity])).toEqual([[60, 90], [64, 40]]);
    expect(doc.kit).toBe(before.kit);
    expect(setKeyNoteVelocity(doc, "0", 64, 40)).toBe(doc); // no change, no new document
    expect(() => setKeyNoteVelocity(before, "0", 64, 0)).toThrow(/1 to 127/);
    expect(() => setKeyNoteVelocity(before, "0", 64, 128)).toThrow(/1 to 127/);
    expect(() => setKeyNoteVelocity(before, "1/16", 64, 50)).toThrow(/no note/);
  });

  it("rejects pitches outside MIDI's 0–127 (MIDI 1.0 note numbers are 7-bit)", () => {
    expect(() => addKeyNote(emptyGroove(), { at: "0", pitch: 128 })).toThrow(/0–127/);
  });
});

describe("bars", () => {
  it("inserts an empty bar and moves later material", () => {
    const doc = valid(insertBar(rockBeat(), 1));
    expect(doc.bars).toBe(3);
    expect(doc.kit.lanes.find((l) => l.piece === "snare")!.hits.map((h) => h.at)).toEqual(["1/4", "3/4", "9/4", "11/4"]);
  });

  it("deletes bars and reports what they held", () => {
    const { doc, dropped, adjusted } = deleteBar(rockBeat(), 0);
    valid(doc);
    expect(doc.bars).toBe(1);
    expect(doc.kit.lanes.find((l) => l.piece === "snare")!.hits.map((h) => h.at)).toEqual(["1/4", "3/4"]);
    expect(dropped.filter((d) => d.kind === "hit")).toHaveLength(12); // 8 hi-hats, 2 snares, 2 kicks
    expect(dropped.filter((d) => d.kind === "note")).toHaveLength(2);
    expect(adjusted).toEqual([]);
    expect(() => deleteBar(doc, 0)).toThrow(/at least one bar/);
  });

  it("cuts a note held into deleted bars", () => {
    let doc = insertBar(emptyGroove(), 1);
    doc = addKeyNote(doc, { at: "1/2", pitch: 48, duration: "1" });
    const r = deleteBar(doc, 1);
    expect(r.doc.keys.notes[0]!.duration).toBe("1/2");
    expect(r.adjusted).toHaveLength(1);
  });

  it("duplicates a bar right after itself", () => {
    const one = deleteBar(rockBeat(), 1).doc;
    const two = valid(duplicateBar(one, 0));
    expect(two).toEqual(rockBeatWithChordInBothBars());
  });

  it("copies and pastes a bar range, growing the groove at the end", () => {
    const src = rockBeat();
    const clip = copyBars(src, 0, 2);
    const { doc, dropped } = pasteBars(src, clip, 1);
    valid(doc);
    expect(doc.bars).toBe(3);
    // Bar 2's old material was pasted over and is reported.
    expect(dropped.every((d) => d.reason === "it was pasted over")).toBe(true);
    expect(dropped).toHaveLength(12);
    expect(doc.keys.notes.map((n) => n.at)).toEqual(["0", "0", "1", "1"]);
  });

  it("pasting 4/4 bars into 3/4 reports the fourth beats", () => {
    const clip = copyBars(rockBeat(), 0);
    const target = changeMeter(emptyGroove(), { beatsPerBar: 3, beatUnit: 4 }).doc;
    const { doc, dropped } = pasteBars(target, clip, 0);
    valid(doc);
    expect(dropped.map((d) => (d.kind === "hit" ? `${d.piece}@${d.where}` : ""))).toEqual([
      "hihat-closed@copied bar 1, beat 4",
      "hihat-closed@copied bar 1, beat 4 and",
      "snare@copied bar 1, beat 4",
    ]);
  });

  it("keeps song-form sections tiling the bars", () => {
    let doc: GrooveDocument = {
      ...rockBeat(),
      bars: 2,
      sections: [
        { name: "Verse", startBar: 0, bars: 1, repeats: 2 },
        { name: "Lift", startBar: 1, bars: 1, repeats: 1 },
      ],
    };
    doc = valid(insertBar(doc, 1));
    expect(doc.sections.map((s) => [s.startBar, s.bars])).toEqual([[0, 1], [1, 2]]);
    doc = valid(insertBar(doc, 3));
    expect(doc.sections.map((s) => [s.startBar, s.bars])).toEqual([[0, 1], [1, 3]]);
    doc = valid(deleteBar(doc, 0).doc);
    expect(doc.sections).toEqual([{ name: "Lift", startBar: 0, bars: 3, repeats: 1 }]);
  });
});

function rockBeatWithChordInBothBars(): GrooveDocument {
  let doc = rockBeat();
  doc = addKeyNote(doc, { at: "1", pitch: 60, duration: "1/2" });
  return addKeyNote(doc, { at: "1", pitch: 64, duration: "1/2" });
}

describe("meter, grid, tempo and swing changes", () => {
  it("4/4 → 3/4 keeps each bar's first three beats and reports beat 4", () => {
    const { doc, dropped } = changeMeter(rockBeat(), { beatsPerBar: 3, beatUnit: 4 });
    valid(doc);
    expect(doc.kit.lanes.find((l) => l.piece === "snare")!.hits.map((h) => h.at)).toEqual(["1/4", "1"]);
    expect(dropped.map((d) => describeDropped(d))).toContain("Snare, bar 2, beat 4: it lies beyond the end of a 3/4 bar");
    expect(dropped).toHaveLength(6); // per bar: two hi-hats and one snare on beat 4
  });

  it("refuses a meter the grid cannot divide, asking for another grid first", () => {
    const triplets = changeGrid(emptyGroove(), "1/12").doc;
    expect(() => changeMeter(triplets, { beatsPerBar: 5, beatUnit: 16 })).toThrow(/choose another grid first/);
  });

  it("sixteenths → eighth-note triplets keeps the beats and reports the rest", () => {
    // Eighth-note triplet = 1/12 whole note, sixteenth = 1/16 (@tonaljs/duration-value for the sixteenth).
    expect(tonal("sixteenth")).toBe("1/16");
    let doc = toggleHit(rockBeat(), "snare", "7/16", "ghost");
    const { doc: t, dropped, adjusted } = changeGrid(doc, "1/12");
    valid(t);
    expect(t.grid.step).toBe("1/12");
    // Quarter-note beats lie on both grids; the eighth off-beats (1/8, 3/8…) and the ghost at 7/16 do not.
    expect(dropped.filter((d) => d.kind === "hit" && d.piece === "hihat-closed")).toHaveLength(8);
    expect(dropped.find((d) => d.kind === "hit" && d.piece === "snare")!.where).toBe("bar 1, beat 2 a");
    expect(adjusted).toEqual([]); // half notes are six triplet eighths
    doc = addKeyNote(t, { at: "1/4", pitch: 72, duration: "1/12" });
    const back = changeGrid(doc, "1/16");
    expect(back.adjusted).toEqual([{ pitch: 72, at: "1/4", from: "1/12", to: "1/16", reason: "its length is not a whole number of 1/16 steps" }]);
  });

  it("tempo and swing never move or lose anything", () => {
    const doc = rockBeat();
    const t = changeTempo(doc, { bpm: 75.5 });
    expect(t.doc.tempo.bpm).toBe("151/2");
    expect(t.doc.kit).toBe(doc.kit);
    expect(t.dropped).toEqual([]);
    expect(() => changeTempo(doc, { bpm: 5 })).toThrow(/outside/);
    const s = changeSwing(doc, { ratio: 2 / 3 });
    expect(s.doc.swing).toEqual({ unit: "1/8", ratio: 2 / 3 });
    expect(() => changeSwing(doc, { ratio: 0.9 })).toThrow(/between/);
  });
});

describe("properties", () => {
  const pieces = fc.constantFrom(...KIT_PIECE_IDS);
  const op = fc.oneof(
    fc.record({ k: fc.constant("toggle" as const), piece: pieces, step: fc.nat(63) }),
    fc.record({ k: fc.constant("cycle" as const), piece: pieces, step: fc.nat(63) }),
    fc.record({ k: fc.constant("paint" as const), piece: pieces, a: fc.nat(63), b: fc.nat(63), on: fc.boolean() }),
    fc.record({ k: fc.constant("note" as const), step: fc.nat(63), pitch: fc.integer({ min: 36, max: 84 }), len: fc.integer({ min: 1, max: 20 }) }),
    fc.record({ k: fc.constant("insert" as const), bar: fc.nat(4) }),
    fc.record({ k: fc.constant("delete" as const), bar: fc.nat(4) }),
    fc.record({ k: fc.constant("dup" as const), bar: fc.nat(4) }),
    fc.record({ k: fc.constant("meter" as const), beats: fc.integer({ min: 2, max: 7 }) }),
    fc.record({ k: fc.constant("grid" as const), step: fc.constantFrom("1/8", "1/16", "1/12", "1/24", "1/32") }),
  );

  test.prop([fc.array(op, { maxLength: 25 })], { numRuns: 150 })("any sequence of edits yields a valid document", (ops) => {
    let doc = insertBar(emptyGroove(), 1, 3);
    for (const o of ops) {
      const steps = stepCount(doc);
      const at = (s: number) => atOfStep(doc, s % steps);
      try {
        if (o.k === "toggle") doc = toggleHit(doc, o.piece, at(o.step));
        else if (o.k === "cycle") doc = cycleDynamic(doc, o.piece, at(o.step));
        else if (o.k === "paint") doc = paintRun(doc, o.piece, at(o.a), at(o.b), o.on ? "on" : "off");
        else if (o.k === "note") doc = addKeyNote(doc, { at: at(o.step), pitch: o.pitch, duration: atOfStep(doc, o.len) });
        else if (o.k === "insert") doc = insertBar(doc, o.bar % (doc.bars + 1));
        else if (o.k === "delete" && doc.bars > 1) doc = deleteBar(doc, o.bar % doc.bars).doc;
        else if (o.k === "dup") doc = duplicateBar(doc, o.bar % doc.bars);
        else if (o.k === "meter") doc = changeMeter(doc, { beatsPerBar: o.beats, beatUnit: 4 }).doc;
        else if (o.k === "grid") doc = changeGrid(doc, o.step).doc;
      } catch (e) {
        // Only the documented refusals are allowed.
        expect(String(e)).toMatch(/does not divide|at most/);
      }
      const r = parseGroove(doc);
      expect(r.ok ? [] : r.issues).toEqual([]);
    }
  });

  test.prop([fc.array(fc.record({ piece: pieces, step: fc.nat(31) }), { maxLength: 30 }), fc.integer({ min: 2, max: 6 })])(
    "changing the meter conserves hits: kept + dropped = before",
    (hits, beats) => {
      let doc = insertBar(emptyGroove(), 1);
      for (const h of hits) doc = toggleHit(doc, h.piece, atOfStep(doc, h.step));
      const count = (d: GrooveDocument) => d.kit.lanes.reduce((a, l) => a + l.hits.length, 0);
      const r = changeMeter(doc, { beatsPerBar: beats, beatUnit: 4 });
      expect(count(r.doc) + r.dropped.length).toBe(count(doc));
    },
  );
});
