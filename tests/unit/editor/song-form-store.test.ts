import { describe, expect, it } from "vitest";
import { createEditorStore } from "../../../src/stores/editor-store";
import { emptyGroove, parseGroove, playOrder } from "../../../src/lib/rhythm";
import { addKeyNote, insertBar } from "../../../src/lib/rhythm/editing";

const make = (doc = insertBar(emptyGroove(), 1, 7)) => createEditorStore({ doc, grooveId: null, baseVersionId: null });
const shape = (s: ReturnType<typeof make>) => s.getState().doc.sections.map((x) => `${x.name}:${x.startBar}+${x.bars}×${x.repeats}`);
const past = (s: ReturnType<typeof make>) => s.temporal.getState().pastStates.length;

describe("song form in the editor store", () => {
  it("each section edit is one undo step, and undo walks back through them", () => {
    const s = make();
    const a = s.getState().actions;
    a.startSongForm("Verse");
    a.splitSection(4, "Chorus");
    a.setSectionRepeats(1, 3);
    a.renameSection(0, "Intro");
    a.moveSectionStart(1, 2);
    a.addSection({ name: "Tag", bars: 2 });
    expect(shape(s)).toEqual(["Intro:0+2×1", "Chorus:2+6×3", "Tag:8+2×1"]);
    expect(parseGroove(s.getState().doc).ok).toBe(true);
    expect(playOrder(s.getState().doc)).toHaveLength(2 + 6 * 3 + 2);
    expect(past(s)).toBe(6);
    a.mergeSectionWithNext(0);
    expect(shape(s)).toEqual(["Intro:0+8×1", "Tag:8+2×1"]);
    a.removeSection(1);
    expect(shape(s)).toEqual(["Intro:0+10×1"]);
    expect(past(s)).toBe(8);
    a.undo();
    a.undo();
    expect(shape(s)).toEqual(["Intro:0+2×1", "Chorus:2+6×3", "Tag:8+2×1"]);
    a.undo();
    expect(s.getState().doc.bars).toBe(8);
    a.redo();
    expect(s.getState().doc.bars).toBe(10);
  });

  it("a refused section edit leaves the document and history as they were and says why", () => {
    const s = make();
    const a = s.getState().actions;
    a.splitSection(4);
    const before = s.getState().doc;
    a.setSectionRepeats(0, 100);
    a.renameSection(1, "   ");
    a.moveSectionStart(1, 0);
    expect(s.getState().doc).toBe(before);
    expect(past(s)).toBe(1);
    expect(s.getState().notice).toMatchObject({ tone: "error", lines: [expect.stringMatching(/can start from bar 2 to bar 8/)] });
  });

  it("sets the velocity of the note at a cell (held part included) as one undo step", () => {
    const s = make(addKeyNote(emptyGroove(), { at: "0", pitch: 60, duration: "1/4" }));
    const a = s.getState().actions;
    a.setNoteVelocity(60, 2, 30); // column 2 is inside the note held from column 0
    expect(s.getState().doc.keys.notes[0]).toMatchObject({ at: "0", velocity: 30 });
    expect(past(s)).toBe(1);
    a.setNoteVelocity(60, 5, 100); // no note there: nothing happens
    a.setNoteVelocity(60, 0, 0); // refused: velocity 0 is a note-off in MIDI
    expect(s.getState().doc.keys.notes[0]!.velocity).toBe(30);
    expect(past(s)).toBe(1);
    a.undo();
    expect(s.getState().doc.keys.notes[0]!.velocity).toBe(90);
  });
});
