// @vitest-environment jsdom
import { act, cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import GrooveEditor from "../../../src/components/editor/GrooveEditor";
import { clockText, formSeconds } from "../../../src/components/editor/SectionsPanel";
import { velocityOpacity } from "../../../src/components/editor/NoteVelocity";
import { emptyGroove, type GrooveDocument } from "../../../src/lib/rhythm";
import { addKeyNote, insertBar } from "../../../src/lib/rhythm/editing";

beforeEach(() => {
  localStorage.clear();
  vi.stubGlobal("ResizeObserver", class { observe() {} disconnect() {} unobserve() {} });
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const renderEditor = (doc: GrooveDocument) => render(<GrooveEditor doc={doc} grooveId={null} baseVersionId={null} />);
const panel = () => screen.getByRole("region", { name: "Song form" });
const strip = () => screen.getByRole("group", { name: "Song form" });
const bands = () => within(strip()).getAllByRole("button").map((b) => b.textContent);
/** Type into a field that commits on Enter. */
const typeAndEnter = (el: HTMLElement, value: string) => {
  fireEvent.change(el, { target: { value } });
  fireEvent.keyDown(el, { key: "Enter" });
};
const keyCell = (pitch: number, col: number) => document.querySelector<HTMLElement>(`[data-pcell][data-pitch="${pitch}"][data-col="${col}"]`)!;

// Each test renders the whole editor in jsdom; on a busy 2-core machine that can take a few seconds.
describe("song form panel and strip", { timeout: 30_000 }, () => {
  it("names sections, splits at the selected bar, sets repeats, and shows them above the bars", () => {
    renderEditor({ ...insertBar(emptyGroove(), 1, 3), grid: { step: "1/8" } }); // 4 bars of 4/4 at 96 bpm, eighth grid
    expect(screen.queryByRole("group", { name: "Song form" })).toBeNull(); // no strip without sections
    expect(within(panel()).getByText(/No sections yet: the 4 bars play once/)).toBeTruthy();

    fireEvent.click(within(panel()).getByRole("button", { name: "Make the groove one section" }));
    expect(bands()).toEqual(["A"]);
    // Select bar 3 by its header, then start a new section there.
    fireEvent.click(screen.getByRole("button", { name: /^Bar 3/ }));
    fireEvent.click(within(panel()).getByRole("button", { name: "New section from bar 3" }));
    expect(bands()).toEqual(["A", "B"]);

    typeAndEnter(within(panel()).getByLabelText("Name of section 1"), "Verse");
    typeAndEnter(within(panel()).getByLabelText("Name of section 2"), "Chorus");
    fireEvent.click(within(panel()).getByRole("button", { name: "Play Chorus once more" }));
    fireEvent.click(within(panel()).getByRole("button", { name: "Play Chorus once more" }));
    expect(bands()).toEqual(["Verse", "Chorus×3"]);
    // Each band spans its bars: 8 eighth-note columns per bar, the second band starting after two bars.
    const chorus = within(strip()).getByRole("button", { name: /^Section Chorus, bars 3–4, played 3 times/ });
    expect(chorus.style.left).toBe("calc(var(--head) + var(--cell) * 16)");
    expect(chorus.style.width).toBe("calc(var(--cell) * 16)");
    // 2 + 2 × 3 = 8 bars heard; 8 bars × 4 beats at 96 bpm = 20 s.
    expect(panel().querySelector(".tx-section-summary")!.textContent).toBe("2 sections, 4 written bars; plays 8 bars in all (0:20).");

    // The band selects the section's bars, so the bar tools act on the whole section.
    fireEvent.click(chorus);
    expect(screen.getByRole("toolbar", { name: "Bars" }).textContent).toContain("Selected: bars 3–4");

    // Moving the boundary, then undo one step at a time.
    typeAndEnter(within(panel()).getByLabelText("Section Chorus starts at bar"), "2");
    expect(within(strip()).getByRole("button", { name: /^Section Chorus, bars 2–4/ })).toBeTruthy();
    fireEvent.click(screen.getByRole("button", { name: "Undo" }));
    expect(within(strip()).getByRole("button", { name: /^Section Chorus, bars 3–4/ })).toBeTruthy();
    fireEvent.click(screen.getByRole("button", { name: "Undo" }));
    expect(bands()).toEqual(["Verse", "Chorus×2"]);
  });

  it("refuses an impossible boundary in the notice bar and shows the section's start again", () => {
    const doc = { ...insertBar(emptyGroove(), 1, 3), sections: [{ name: "A", startBar: 0, bars: 2, repeats: 1 }, { name: "B", startBar: 2, bars: 2, repeats: 1 }] };
    renderEditor(doc);
    const start = within(panel()).getByLabelText("Section B starts at bar") as HTMLInputElement;
    typeAndEnter(start, "9");
    expect(screen.getByText(/section "B" can start from bar 2 to bar 4/)).toBeTruthy();
    expect(start.value).toBe("3");
  });

  it("adds a section of new bars at the end and removes one into its neighbour", () => {
    renderEditor(emptyGroove());
    const form = within(panel()).getByRole("form", { name: "Add a section at the end" });
    fireEvent.change(within(form).getByLabelText("New section name"), { target: { value: "Build" } });
    fireEvent.change(within(form).getByLabelText("Bars"), { target: { value: "2" } });
    fireEvent.click(within(form).getByRole("button", { name: "Add section at end" }));
    expect(bands()).toEqual(["A", "Build"]);
    expect(screen.getByRole("toolbar", { name: "Bars" }).textContent).toContain("of 3");
    fireEvent.click(within(panel()).getByRole("button", { name: /^Remove section A/ }));
    expect(bands()).toEqual(["Build"]);
    expect(within(strip()).getByRole("button", { name: /bars 1–3/ })).toBeTruthy();
  });

  it("works out the form's playing time from bars heard, meter and tempo", () => {
    // Common practice: at 120 quarter notes a minute a 4/4 bar lasts 2 s; 6/8 with the dotted quarter at 60 lasts 2 s.
    const doc = { ...insertBar(emptyGroove(), 1, 3), tempo: { bpm: "120", beatNote: "1/4" }, sections: [{ name: "A", startBar: 0, bars: 4, repeats: 2 }] };
    expect(formSeconds(doc)).toBe(16);
    expect(formSeconds({ ...doc, meter: { beatsPerBar: 6, beatUnit: 8 }, tempo: { bpm: "60", beatNote: "3/8" }, sections: [] })).toBe(8);
    expect(clockText(65.4)).toBe("1:05");
  });
});

describe("keys note velocity", { timeout: 30_000 }, () => {
  it("right-click on a note opens its menu; the velocity is set in one step and drawn as shade", () => {
    renderEditor(addKeyNote(emptyGroove(), { at: "0", pitch: 60, duration: "1/8" }));
    const span = () => keyCell(60, 0).querySelector<HTMLElement>(".tx-note")!;
    expect(span().style.opacity).toBe(String(velocityOpacity(90)));
    fireEvent.contextMenu(keyCell(60, 1)); // the held part of the note
    const menu = screen.getByRole("dialog", { name: "C4 note, bar 1, beat 1" });
    expect(document.activeElement).toBe(within(menu).getByLabelText("Velocity of the C4 note (1 to 127)"));
    typeAndEnter(within(menu).getByLabelText("Velocity number of the C4 note"), "30");
    expect(keyCell(60, 0).getAttribute("aria-label")).toBe("Keys C4, bar 1, beat 1: note, 2 steps long, velocity 30");
    expect(span().style.opacity).toBe(String(velocityOpacity(30)));
    expect(velocityOpacity(30)).toBeLessThan(velocityOpacity(90));

    // A slider drag moves freely and makes one undo step when released.
    const slider = within(menu).getByLabelText("Velocity of the C4 note (1 to 127)") as HTMLInputElement;
    fireEvent.change(slider, { target: { value: "70" } });
    fireEvent.change(slider, { target: { value: "110" } });
    expect(keyCell(60, 0).getAttribute("aria-label")).toMatch(/velocity 30$/);
    fireEvent.pointerUp(slider);
    expect(keyCell(60, 0).getAttribute("aria-label")).toMatch(/velocity 110$/);
    fireEvent.click(within(menu).getByRole("button", { name: "Done" }));
    expect(screen.queryByRole("dialog")).toBeNull();
    fireEvent.click(screen.getByRole("button", { name: "Undo" }));
    expect(keyCell(60, 0).getAttribute("aria-label")).toMatch(/velocity 30$/);
    fireEvent.click(screen.getByRole("button", { name: "Undo" }));
    expect(keyCell(60, 0).getAttribute("aria-label")).toBe("Keys C4, bar 1, beat 1: note, 2 steps long");
  });

  it("the lane's toolbar edits the note at the keys cursor, and is off elsewhere", () => {
    renderEditor(addKeyNote(emptyGroove(), { at: "1/4", pitch: 64 }));
    const field = () => screen.getByLabelText(/^Velocity number of the/) as HTMLInputElement;
    expect(field().disabled).toBe(true);
    act(() => keyCell(64, 4).focus());
    expect(field().disabled).toBe(false);
    expect(field().value).toBe("90");
    typeAndEnter(field(), "127");
    expect(keyCell(64, 4).getAttribute("aria-label")).toMatch(/velocity 127$/);
    typeAndEnter(field(), "0"); // MIDI note-on velocity 0 means note-off: refused, and said so
    expect(screen.getByText("velocity 0 is not from 1 to 127")).toBeTruthy();
    expect(field().value).toBe("127");
  });
});
