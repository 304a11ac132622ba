import { describe, expect, it } from "vitest";
import { createEditorStore, cursorBar, hasUnsavedChanges } from "../../../src/stores/editor-store";
import { emptyGroove, parseGroove } from "../../../src/lib/rhythm";
import { hitAt } from "../../../src/lib/rhythm/editing";
import { gridColumns, keysRows, kitCellLabel, pitchName } from "../../../src/stores/selectors";

const make = () => createEditorStore({ doc: emptyGroove(), grooveId: null, baseVersionId: null });
const hats = (s: ReturnType<typeof make>) => s.getState().doc.kit.lanes.find((l) => l.piece === "hihat-closed")!.hits.map((h) => h.at);

describe("editor store", () => {
  it("edits the document through core functions and undoes/redoes them", () => {
    const s = make();
    const a = s.getState().actions;
    a.toggleHit("snare", 4);
    a.toggleHit("snare", 12);
    expect(s.getState().doc.kit.lanes.find((l) => l.piece === "snare")!.hits.map((h) => h.at)).toEqual(["1/4", "3/4"]);
    a.undo();
    expect(hitAt(s.getState().doc, "snare", "3/4")).toBeUndefined();
    expect(hitAt(s.getState().doc, "snare", "1/4")).toBeDefined();
    a.redo();
    expect(hitAt(s.getState().doc, "snare", "3/4")).toBeDefined();
  });

  it("keeps only the document in history: cursor moves and notices make no undo steps", () => {
    const s = make();
    const a = s.getState().actions;
    a.moveCursor(1, 3);
    a.notify({ tone: "info", title: "hello", lines: [], undoable: false });
    a.selectBar(0);
    expect(s.temporal.getState().pastStates).toHaveLength(0);
    a.toggleAtCursor();
    expect(s.temporal.getState().pastStates).toHaveLength(1);
    expect(Object.keys(s.temporal.getState().pastStates[0]!)).toEqual(["doc"]);
  });

  it("a drag-paint is one history entry, and dragging back shortens the run", () => {
    const s = make();
    const a = s.getState().actions;
    a.beginPaint("hihat-closed", 0);
    for (let c = 1; c <= 7; c++) a.paintTo(c);
    a.paintTo(3);
    a.endGesture();
    expect(hats(s)).toEqual(["0", "1/16", "1/8", "3/16"]);
    expect(s.temporal.getState().pastStates).toHaveLength(1);
    // Starting on a hit erases.
    a.beginPaint("hihat-closed", 1);
    a.paintTo(2);
    a.endGesture();
    expect(hats(s)).toEqual(["0", "3/16"]);
    a.undo();
    expect(hats(s)).toEqual(["0", "1/16", "1/8", "3/16"]);
    a.undo();
    expect(hats(s)).toEqual([]);
  });

  it("a key press-and-drag makes one stretched note; a press on a note without moving removes it", () => {
    const s = make();
    const a = s.getState().actions;
    a.beginNote(60, 2);
    a.noteTo(3);
    a.noteTo(5);
    a.endGesture();
    expect(s.getState().doc.keys.notes).toEqual([{ at: "1/8", duration: "1/4", pitch: 60, velocity: 90 }]);
    // Chord: another pitch at the same step.
    a.beginNote(64, 2);
    a.endGesture();
    expect(s.getState().doc.keys.notes.map((n) => n.pitch)).toEqual([60, 64]);
    // Grab the held part of the first note and stretch it further.
    a.beginNote(60, 4);
    a.noteTo(9);
    a.endGesture();
    expect(s.getState().doc.keys.notes[0]!.duration).toBe("1/2");
    a.beginNote(60, 3);
    a.endGesture();
    expect(s.getState().doc.keys.notes.map((n) => n.pitch)).toEqual([64]);
    expect(s.temporal.getState().pastStates).toHaveLength(4);
  });

  it("reports what a meter change could not keep, and undo brings it back", () => {
    const s = make();
    const a = s.getState().actions;
    a.toggleHit("snare", 12); // beat 4
    a.toggleHit("kick", 0);
    a.changeMeter({ beatsPerBar: 3, beatUnit: 4 });
    const n = s.getState().notice!;
    expect(n.tone).toBe("loss");
    expect(n.undoable).toBe(true);
    expect(n.lines).toEqual(["Snare, bar 1, beat 4: it lies beyond the end of a 3/4 bar"]);
    expect(s.getState().doc.meter.beatsPerBar).toBe(3);
    a.undo();
    expect(s.getState().doc.meter.beatsPerBar).toBe(4);
    expect(hitAt(s.getState().doc, "snare", "3/4")).toBeDefined();
  });

  it("refused edits become an error notice and change nothing", () => {
    const s = make();
    const a = s.getState().actions;
    a.changeGrid("1/12");
    const before = s.getState().doc;
    a.changeMeter({ beatsPerBar: 5, beatUnit: 16 });
    expect(s.getState().notice!.tone).toBe("error");
    expect(s.getState().doc).toBe(before);
    a.deleteBars({ start: 0, count: 1 });
    expect(s.getState().notice!.lines).toEqual(["A groove keeps at least one bar."]);
  });

  it("copies the cursor's bar and pastes at the selection; deleting bars reports the count", () => {
    const s = make();
    const a = s.getState().actions;
    a.toggleHit("snare", 4);
    a.insertBars(1, 2);
    a.copyBars();
    expect(s.getState().clipboard?.bars).toBe(1);
    a.selectBar(2);
    a.pasteBars();
    expect(hitAt(s.getState().doc, "snare", "9/4")).toBeDefined();
    expect(s.getState().selection).toEqual({ start: 2, count: 1 });
    a.selectBar(0);
    a.selectBar(2, true);
    expect(s.getState().selection).toEqual({ start: 0, count: 3 });
    a.duplicateBars({ start: 0, count: 1 });
    expect(s.getState().doc.bars).toBe(4);
    a.deleteBars({ start: 0, count: 2 });
    expect(s.getState().doc.bars).toBe(2);
    expect(s.getState().notice!.title).toBe("Bars 1–2 deleted: 2 items removed");
    expect(parseGroove(s.getState().doc).ok).toBe(true);
  });

  it("moves the cursor across kit rows into the keys rows and back, clamped to the groove", () => {
    const s = make();
    const a = s.getState().actions;
    a.moveCursor(0, -5);
    expect(s.getState().cursor).toEqual({ area: "kit", row: 0, col: 0 });
    a.moveCursor(2, 20);
    expect(s.getState().cursor).toEqual({ area: "kit", row: 2, col: 15 });
    a.moveCursor(1, 0);
    expect(s.getState().cursor).toEqual({ area: "keys", pitch: 71, col: 15 });
    a.moveCursor(-1, 0);
    expect(s.getState().cursor).toEqual({ area: "kit", row: 2, col: 15 });
    a.cursorToBarEdge("home");
    expect(cursorBar(s.getState())).toBe(0);
    // Cursor follows the document when it shrinks (undo of an added bar).
    a.insertBars(1);
    a.cursorToBarEdge("end");
    expect(s.getState().cursor.col).toBe(31);
    a.undo();
    expect(s.getState().cursor.col).toBe(15);
  });

  it("loading a document (a restored draft) clears history; saving marks it clean", () => {
    const s = make();
    const a = s.getState().actions;
    a.toggleHit("kick", 0);
    const restored = { ...emptyGroove(), bars: 2 };
    a.loadDocument(restored);
    expect(s.getState().doc).toBe(restored);
    expect(s.temporal.getState().pastStates).toHaveLength(0);
    expect(hasUnsavedChanges(s.getState())).toBe(true);
    a.markSaved("g1", "v1");
    expect(hasUnsavedChanges(s.getState())).toBe(false);
    expect(s.getState().grooveId).toBe("g1");
  });

  it("applying a renotated document is one undoable step", () => {
    const s = make();
    const a = s.getState().actions;
    const other = { ...emptyGroove(), tempo: { bpm: "150", beatNote: "1/4" } };
    a.applyDocument(other, "Double time applied");
    expect(s.getState().doc.tempo.bpm).toBe("150");
    a.undo();
    expect(s.getState().doc.tempo.bpm).toBe("96");
  });
});

describe("selectors", () => {
  it("lays out bar and beat lines and counts (common practice counting: 1 e & a)", () => {
    const cols = gridColumns({ ...emptyGroove(), bars: 2 });
    expect(cols).toHaveLength(32);
    expect(cols.slice(0, 5).map((c) => c.count)).toEqual(["1", "e", "&", "a", "2"]);
    expect(cols.filter((c) => c.barStart).map((c) => c.col)).toEqual([0, 16]);
    expect(cols.filter((c) => c.beatStart).length).toBe(8);
    // 7/8 as 2+2+3 is counted in three beats; 6/8 in two dotted-quarter beats with lighter eighth lines.
    const seven = gridColumns({ meter: { beatsPerBar: 7, beatUnit: 8, grouping: [2, 2, 3] }, grid: { step: "1/8" }, bars: 1 });
    expect(seven.filter((c) => c.beatStart).map((c) => c.col)).toEqual([0, 2, 4]);
    const six = gridColumns({ meter: { beatsPerBar: 6, beatUnit: 8 }, grid: { step: "1/16" }, bars: 1 });
    expect(six.filter((c) => c.beatStart).map((c) => c.col)).toEqual([0, 6]);
    expect(six.filter((c) => c.unitStart).map((c) => c.col)).toEqual([2, 4, 8, 10]);
    expect(six.slice(0, 3).map((c) => c.count)).toEqual(["1", "·", "&"]);
  });

  it("names cells for screen readers with piece, bar, beat and state", () => {
    const doc = emptyGroove();
    expect(kitCellLabel(doc, "snare", "1/4", { at: "1/4", dynamic: "accent", articulation: "flam" })).toBe("Snare, bar 1, beat 2: accent, flam");
    expect(kitCellLabel(doc, "kick", "3/16", undefined)).toBe("Kick, bar 1, beat 1 a: empty");
  });

  it("names pitches with middle C = C4 (MIDI 60, scientific pitch notation) and widens the keys range to fit notes", () => {
    expect(pitchName(60)).toBe("C4");
    expect(pitchName(69)).toBe("A4"); // A440 is MIDI 69 (MIDI tuning standard)
    const doc = { keys: { notes: [{ at: "0", duration: "1/4", pitch: 40, velocity: 90 }], splitPitch: 60 } };
    const rows = keysRows(doc, { low: 48, high: 71 });
    expect(rows[0]).toBe(71);
    expect(rows[rows.length - 1]).toBe(36);
  });
});
