// @vitest-environment jsdom
import { act, cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import GrooveEditor from "../../../src/components/editor/GrooveEditor";
import { proofText } from "../../../src/components/editor/proof";
import { compareGrooves, displace, doubleTime, emptyGroove, type GrooveDocument } from "../../../src/lib/rhythm";
import { toggleHit } from "../../../src/lib/rhythm/editing";
import { draftKey } from "../../../src/lib/client/drafts";
import type { TransportHandle } from "../../../src/components/editor/transport-port";

// jsdom lacks these browser APIs; the editor only needs them to exist.
beforeEach(() => {
  localStorage.clear();
  vi.stubGlobal("ResizeObserver", class { observe() {} disconnect() {} unobserve() {} });
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
  vi.useRealTimers();
});

const kitGrid = () => screen.getByRole("grid", { name: "Kit step grid" });
const cell = (row: number, col: number) => kitGrid().querySelector<HTMLElement>(`[data-kcell][data-row="${row}"][data-col="${col}"]`)!;
const keyCell = (pitch: number, col: number) => document.querySelector<HTMLElement>(`[data-pcell][data-pitch="${pitch}"][data-col="${col}"]`)!;
/** A mouse press and release on an element (the editor acts on pointerdown, ends gestures on pointerup). */
const click = (el: HTMLElement, init: Partial<PointerEventInit> = {}) => {
  fireEvent.pointerDown(el, { button: 0, pointerType: "mouse", ...init });
  fireEvent.pointerUp(window, { button: 0, pointerType: "mouse" });
};
const key = (k: string, init: Partial<KeyboardEventInit> = {}) => fireEvent.keyDown(document.activeElement ?? document.body, { key: k, ...init });

function renderEditor(doc: GrooveDocument = emptyGroove(), extra: Partial<Parameters<typeof GrooveEditor>[0]> = {}) {
  return render(<GrooveEditor doc={doc} grooveId={null} baseVersionId={null} {...extra} />);
}

describe("step grid", () => {
  it("is an ARIA grid whose cells announce piece, bar, beat and state", () => {
    renderEditor(toggleHit(emptyGroove(), "snare", "1/4"));
    const grid = kitGrid();
    expect(within(grid).getAllByRole("row")).toHaveLength(5); // bar header, count header, three kit rows
    expect(within(grid).getByRole("rowheader", { name: /Snare/ })).toBeTruthy();
    expect(cell(1, 4).getAttribute("role")).toBe("gridcell");
    expect(cell(1, 4).getAttribute("aria-label")).toBe("Snare, bar 1, beat 2: hit");
    expect(cell(2, 6).getAttribute("aria-label")).toBe("Kick, bar 1, beat 2 and: empty");
    // Exactly one cell is in the tab order (roving tabindex), the cursor.
    expect(grid.querySelectorAll('[role=gridcell][tabindex="0"]')).toHaveLength(1);
  });

  it("click toggles, Shift+click steps the dynamic, drag paints a run as one undo step", () => {
    renderEditor();
    click(cell(1, 4));
    expect(cell(1, 4).getAttribute("aria-label")).toMatch(/: hit$/);
    click(cell(1, 4), { shiftKey: true });
    expect(cell(1, 4).getAttribute("aria-label")).toMatch(/: accent$/);
    click(cell(1, 4), { shiftKey: true });
    expect(cell(1, 4).getAttribute("aria-label")).toMatch(/: ghost$/);
    click(cell(1, 4));
    expect(cell(1, 4).getAttribute("aria-label")).toMatch(/: empty$/);

    fireEvent.pointerDown(cell(0, 0), { button: 0, pointerType: "mouse" });
    for (const c of [1, 2, 3]) fireEvent.pointerOver(cell(0, c), { pointerType: "mouse" });
    fireEvent.pointerUp(window, { pointerType: "mouse" });
    expect([0, 1, 2, 3].map((c) => cell(0, c).getAttribute("aria-label")!.endsWith(": hit"))).toEqual([true, true, true, true]);
    fireEvent.click(screen.getByRole("button", { name: "Undo" }));
    expect([0, 1, 2, 3].some((c) => cell(0, c).getAttribute("aria-label")!.endsWith(": hit"))).toBe(false);
  });

  it("the keyboard moves a visible cursor and writes (arrows, Enter, X, D, Delete, undo, redo)", () => {
    renderEditor();
    cell(0, 0).focus();
    key("ArrowDown");
    key("ArrowRight");
    key("ArrowRight");
    key("ArrowRight");
    key("ArrowRight");
    expect(document.activeElement).toBe(cell(1, 4));
    expect(cell(1, 4).className).toContain("is-cursor");
    key("Enter");
    expect(cell(1, 4).getAttribute("aria-label")).toMatch(/: hit$/);
    key("d");
    expect(cell(1, 4).getAttribute("aria-label")).toMatch(/: accent$/);
    key("]");
    key("x");
    expect(cell(1, 15).getAttribute("aria-label")).toMatch(/: hit$/); // one bar: "]" stops at the last step
    key("Delete");
    expect(cell(1, 15).getAttribute("aria-label")).toMatch(/: empty$/);
    key("z", { ctrlKey: true });
    expect(cell(1, 15).getAttribute("aria-label")).toMatch(/: hit$/);
    key("z", { ctrlKey: true, shiftKey: true });
    expect(cell(1, 15).getAttribute("aria-label")).toMatch(/: empty$/);
  });

  it("the hit menu sets articulations and is keyboard-operable", () => {
    renderEditor(toggleHit(emptyGroove(), "hihat-closed", "1/8"));
    fireEvent.contextMenu(cell(0, 2));
    const menu = screen.getByRole("menu", { name: "Hi-hat hit" });
    expect(document.activeElement?.textContent).toBe("Ghost note");
    fireEvent.click(within(menu).getByRole("menuitemradio", { name: "Open (hi-hat)" }));
    expect(screen.queryByRole("menu")).toBeNull();
    expect(cell(0, 2).getAttribute("aria-label")).toBe("Hi-hat, bar 1, beat 1 and: hit, open");
    // Keyboard: M opens at the cursor, Esc closes.
    cell(0, 2).focus();
    act(() => {
      fireEvent.pointerDown(cell(0, 2), { button: 2, pointerType: "mouse" });
    });
    key("m");
    expect(screen.getByRole("menu")).toBeTruthy();
    fireEvent.keyDown(screen.getByRole("menu"), { key: "Escape" });
    expect(screen.queryByRole("menu")).toBeNull();
  });

  it("adds and removes kit rows", () => {
    renderEditor();
    fireEvent.change(screen.getByLabelText("Add a kit piece"), { target: { value: "ride" } });
    expect(within(kitGrid()).getByRole("rowheader", { name: /Ride/ })).toBeTruthy();
    fireEvent.click(screen.getByRole("button", { name: "Remove the Snare row" }));
    expect(within(kitGrid()).queryByRole("rowheader", { name: /^Snare/ })).toBeNull();
  });
});

describe("keys lane", () => {
  it("arrow keys cross from the kit rows into the keys rows, where Enter and Shift+→ write a note", () => {
    renderEditor();
    cell(2, 0).focus();
    key("ArrowDown");
    expect(document.activeElement).toBe(keyCell(71, 0));
    key("ArrowDown");
    key("Enter");
    key("ArrowRight", { shiftKey: true });
    key("ArrowRight", { shiftKey: true });
    expect(keyCell(70, 0).getAttribute("aria-label")).toBe("Keys A♯4, bar 1, beat 1: note, 3 steps long");
    key("ArrowUp");
    key("ArrowUp");
    expect(document.activeElement).toBe(cell(2, 0));
    // A hidden keys lane is skipped.
    fireEvent.click(screen.getByRole("button", { name: "Hide the keys lane" }));
    key("ArrowDown");
    expect(document.activeElement).toBe(cell(2, 0));
  });

  it("press-and-drag writes a note with length; chords stack; a press on a note removes it", () => {
    renderEditor();
    fireEvent.pointerDown(keyCell(60, 0), { button: 0, pointerType: "mouse" });
    fireEvent.pointerOver(keyCell(60, 3), { pointerType: "mouse" });
    fireEvent.pointerUp(window, { pointerType: "mouse" });
    expect(keyCell(60, 0).getAttribute("aria-label")).toBe("Keys C4, bar 1, beat 1: note, 4 steps long");
    expect(keyCell(60, 3).getAttribute("aria-label")).toMatch(/note held$/);
    click(keyCell(64, 0));
    click(keyCell(67, 0));
    expect(keyCell(67, 0).getAttribute("aria-label")).toMatch(/note, 1 step long$/);
    click(keyCell(60, 2)); // on the held part: removes the whole note
    expect(keyCell(60, 0).getAttribute("aria-label")).toMatch(/empty$/);
  });
});

describe("changes that can lose hits", () => {
  it("a meter change lists what did not fit, and Undo in the notice brings it back", () => {
    renderEditor(toggleHit(emptyGroove(), "snare", "3/4"));
    fireEvent.change(screen.getByLabelText("Beats per bar"), { target: { value: "3" } });
    fireEvent.click(screen.getByRole("button", { name: "Change meter" }));
    const status = screen.getByText(/did not fit/);
    expect(status.textContent).toBe("Meter changed to 3/4: 1 item did not fit and was taken out");
    expect(screen.getByText("Snare, bar 1, beat 4: it lies beyond the end of a 3/4 bar")).toBeTruthy();
    expect(kitGrid().querySelectorAll("[data-kcell][data-row='1']")).toHaveLength(12);
    fireEvent.click(within(status.closest(".tx-notice") as HTMLElement).getByRole("button", { name: "Undo" }));
    expect(cell(1, 12).getAttribute("aria-label")).toBe("Snare, bar 1, beat 4: hit");
  });

  it("grid changes keep what fits: sixteenths to eighth-note triplets", () => {
    renderEditor(toggleHit(toggleHit(emptyGroove(), "snare", "1/4"), "snare", "3/8"));
    fireEvent.change(screen.getByLabelText("Grid"), { target: { value: "1/12" } });
    expect(screen.getByText("Snare, bar 1, beat 2 and: it is not on the new 1/12 grid")).toBeTruthy();
    expect(cell(1, 3).getAttribute("aria-label")).toBe("Snare, bar 1, beat 2: hit");
  });
});

describe("bars", () => {
  it("copy and paste a bar with the keyboard, select bars from the bar header", () => {
    renderEditor(toggleHit(emptyGroove(), "kick", "0"));
    fireEvent.click(screen.getByRole("button", { name: "Add bar at end" }));
    fireEvent.click(screen.getByRole("button", { name: "Add bar at end" }));
    cell(0, 0).focus();
    key("c", { ctrlKey: true });
    fireEvent.click(screen.getByRole("button", { name: /^Bar 3/ }));
    key("v", { ctrlKey: true });
    expect(cell(2, 32).getAttribute("aria-label")).toBe("Kick, bar 3, beat 1: hit");
    fireEvent.click(screen.getByRole("button", { name: /^Delete bar 3/ }));
    expect(kitGrid().querySelectorAll("[data-kcell][data-row='2']")).toHaveLength(32);
  });
});

describe("tap tempo, shortcuts, transport", () => {
  it("T taps the tempo and shows bpm and steadiness; the tempo can be taken over", () => {
    let now = 1000;
    vi.spyOn(performance, "now").mockImplementation(() => now);
    renderEditor();
    for (let i = 0; i < 5; i++) {
      fireEvent.keyDown(document.body, { key: "t" });
      now += 500;
    }
    expect(document.querySelector(".tx-tapout")!.textContent).toContain("120.0 bpm");
    expect(document.querySelector(".tx-tapout")!.textContent).toContain("steady");
    fireEvent.click(screen.getByRole("button", { name: "Use 120 bpm" }));
    expect((screen.getByLabelText("Tempo (bpm)") as HTMLInputElement).value).toBe("120");
  });

  it("? opens the shortcut sheet as a modal dialog; Esc closes it", () => {
    renderEditor();
    fireEvent.keyDown(document.body, { key: "?" });
    const dialog = screen.getByRole("dialog", { name: "Keyboard shortcuts" });
    expect(dialog.getAttribute("aria-modal")).toBe("true");
    expect(within(dialog).getByText("Undo")).toBeTruthy();
    fireEvent.keyDown(dialog, { key: "Escape" });
    expect(screen.queryByRole("dialog")).toBeNull();
  });

  it("space plays and stops through the transport seam, with the loop and click settings", async () => {
    const calls: string[] = [];
    const handle: TransportHandle = {
      play: (doc, o) => void calls.push(`play ${doc.bars} loop=${JSON.stringify(o.loop)} click=${o.metronome}`),
      stop: () => void calls.push("stop"),
      update: () => void calls.push("update"),
      setVolume: (db) => void calls.push(`volume ${db}`),
      dispose: () => void calls.push("dispose"),
    };
    renderEditor(emptyGroove(), { loadTransport: async () => handle });
    fireEvent.click(screen.getByLabelText("Click"));
    await act(async () => {
      fireEvent.keyDown(document.body, { key: " " });
    });
    expect(screen.getByRole("button", { name: /Stop/ }).getAttribute("aria-pressed")).toBe("true");
    click(cell(2, 0)); // an edit while playing is passed on
    await act(async () => {
      fireEvent.keyDown(document.body, { key: " " });
    });
    expect(calls).toEqual(['play 1 loop={"startBar":0,"endBar":1} click=true', "update", "stop"]);
  });
});

describe("drafts", () => {
  it("restores the browser draft after a reload and offers to discard it", () => {
    const first = renderEditor();
    click(cell(2, 0));
    // The draft is written shortly after the change; unmounting flushes it.
    first.unmount();
    expect(localStorage.getItem(draftKey(null))).toContain('"kick"');
    renderEditor();
    expect(cell(2, 0).getAttribute("aria-label")).toMatch(/: hit$/);
    expect(screen.getByText(/Restored your unsaved changes/)).toBeTruthy();
    fireEvent.click(screen.getByRole("button", { name: "Start over" }));
    expect(cell(2, 0).getAttribute("aria-label")).toMatch(/: empty$/);
    expect(localStorage.getItem(draftKey(null))).toBeNull();
  });
});

describe("drafts of saved grooves", () => {
  it("a draft made on an older version keeps that base, so saving reports the conflict instead of overwriting", async () => {
    const drafted = toggleHit(emptyGroove(), "kick", "0");
    localStorage.setItem(draftKey("g1"), JSON.stringify({ v: 1, grooveId: "g1", baseVersionId: "v1", doc: drafted, savedAt: Date.now() }));
    const latest = { id: "v2", number: 2, message: "", author: null, createdAt: "2026-01-01T00:00:00Z", contentHash: "x", document: emptyGroove() };
    const fetchMock = vi
      .fn()
      .mockResolvedValueOnce(new Response(JSON.stringify({ error: { code: "version_conflict", message: "Version 2 was saved after yours." }, latest }), { status: 409 }))
      .mockResolvedValueOnce(new Response(JSON.stringify({ id: "v3", number: 3 }), { status: 201 }));
    vi.stubGlobal("fetch", fetchMock);
    render(<GrooveEditor doc={emptyGroove()} grooveId="g1" baseVersionId="v2" />);
    expect(screen.getByText(/made on an earlier version/)).toBeTruthy();
    expect(cell(2, 0).getAttribute("aria-label")).toMatch(/: hit$/);
    await act(async () => {
      fireEvent.click(screen.getByRole("button", { name: "Save version" }));
    });
    const body = JSON.parse((fetchMock.mock.calls[0] as unknown as [string, RequestInit])[1].body as string);
    expect(body.baseVersionId).toBe("v1");
    expect(screen.getByText("Version 2 was saved after yours.")).toBeTruthy();
    // Nothing is lost by saving on top: version 2 stays in the history.
    await act(async () => {
      fireEvent.click(screen.getByRole("button", { name: "Save mine on top of version 2" }));
    });
    expect(JSON.parse((fetchMock.mock.calls[1] as unknown as [string, RequestInit])[1].body as string).baseVersionId).toBe("v2");
    expect(screen.getByText("Saved as version 3.")).toBeTruthy();
  });
});

describe("proof wording", () => {
  it("states the equivalence verdict from compareGrooves in plain words", () => {
    let doc = emptyGroove();
    for (const at of ["0", "1/4", "1/2", "3/4"]) doc = toggleHit(doc, "kick", at);
    doc = toggleHit(doc, "snare", "1/4");
    expect(proofText(compareGrooves(doc, doubleTime(doc))).text).toBe("Same sound: 5 onsets match at the same times.");
    // At 96 bpm a quarter lasts 625 ms, so an eighth is 312.5 ms (common practice: 60,000 / bpm per beat).
    const shifted = proofText(compareGrooves(doc, displace(doc, "1/8", "pad")));
    expect(shifted.same).toBe(true);
    expect(shifted.text).toBe("Same sound: 5 onsets match, start offset 1/8 (an eighth) = 312.5 ms later.");
    const other = proofText(compareGrooves(doc, toggleHit(doc, "snare", "3/4")));
    expect(other.same).toBe(false);
    expect(other.details[0]).toMatch(/bar 1, beat 4: snare/);
  });
});
