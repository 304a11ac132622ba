/**
 * Keyboard shortcuts: the table shown on the shortcut sheet and the one handler that applies them.
 * Keys typed into text fields are left alone; grid keys (arrows, Enter…) act only with focus in a grid.
 */
import { cursorBar, type EditorStore } from "../../stores/editor-store";

export interface ShortcutRow {
  keys: string[];
  what: string;
}

export interface ShortcutGroup {
  title: string;
  rows: ShortcutRow[];
}

/** What the sheet lists. `Mod` is shown as Ctrl, or ⌘ on Apple keyboards. */
export const SHORTCUTS: ShortcutGroup[] = [
  {
    title: "Moving around the grid",
    rows: [
      { keys: ["←", "→", "↑", "↓"], what: "Move the cursor one step or one row" },
      { keys: ["[", "]"], what: "Jump to the previous or next bar" },
      { keys: ["Home", "End"], what: "Jump to the first or last step" },
    ],
  },
  {
    title: "Writing",
    rows: [
      { keys: ["Enter"], what: "Put a hit or note at the cursor, or take it away" },
      { keys: ["X"], what: "Same as Enter" },
      { keys: ["D"], what: "Next dynamic for the hit: ghost → normal → accent" },
      { keys: ["M"], what: "Hit menu: dynamic, open, flam, choke (also Shift+F10)" },
      { keys: ["Delete"], what: "Clear the step at the cursor" },
      { keys: ["Shift+→", "Shift+←"], what: "Keys: make the note at the cursor one step longer or shorter" },
      { keys: ["Shift+click"], what: "Next dynamic for the clicked hit" },
      { keys: ["drag"], what: "Paint a run of hits (starting on a hit erases), or stretch a keys note" },
      { keys: ["right-click"], what: "Keys: note menu, with the note's velocity (a long touch on a touch screen)" },
    ],
  },
  {
    title: "Bars",
    rows: [
      { keys: ["B"], what: "Select the bar under the cursor" },
      { keys: ["Shift+B"], what: "Extend the selection to the bar under the cursor" },
      { keys: ["Mod+C"], what: "Copy the selected bars (or the cursor's bar)" },
      { keys: ["Mod+V"], what: "Paste over the selected bars (or from the cursor's bar)" },
    ],
  },
  {
    title: "Everything else",
    rows: [
      { keys: ["Mod+Z"], what: "Undo" },
      { keys: ["Mod+Shift+Z", "Mod+Y"], what: "Redo" },
      { keys: ["Space"], what: "Play or stop" },
      { keys: ["T"], what: "Tap the tempo" },
      { keys: ["?"], what: "Show this list" },
      { keys: ["Esc"], what: "Close a menu or this list; clear the bar selection" },
    ],
  },
];

export interface ShortcutContext {
  store: EditorStore;
  togglePlay(): void;
  tap(): void;
  /** Open the hit menu at the cursor cell. */
  openMenu(): void;
}

const TEXT_INPUT = /^(INPUT|TEXTAREA|SELECT)$/;

function isTyping(target: EventTarget | null): boolean {
  const el = target as HTMLElement | null;
  if (!el || !el.tagName) return false;
  if (el.isContentEditable) return true;
  if (!TEXT_INPUT.test(el.tagName)) return false;
  const type = (el as HTMLInputElement).type;
  // Range sliders and checkboxes do not take text.
  return !(el.tagName === "INPUT" && /^(range|checkbox|radio|button)$/.test(type));
}

function activates(target: EventTarget | null): boolean {
  const el = target as HTMLElement | null;
  return !!el?.closest?.("button, a[href], [role=menuitem], [role=menuitemradio], summary, input, select");
}

/**
 * Apply a key press to the editor; returns true when it was handled (the caller then prevents the default).
 * @example root.onkeydown = (e) => { if (handleEditorKey(e, ctx)) e.preventDefault(); }
 */
export function handleEditorKey(e: KeyboardEvent | React.KeyboardEvent, ctx: ShortcutContext): boolean {
  if (e.defaultPrevented) return false;
  const s = ctx.store.getState();
  const a = s.actions;
  const mod = e.ctrlKey || e.metaKey;
  const key = e.key;
  const lower = key.length === 1 ? key.toLowerCase() : key;

  if (key === "Escape") {
    if (s.sheetOpen) a.setSheetOpen(false);
    else if (s.selection) a.clearSelection();
    else return false;
    return true;
  }
  if (isTyping(e.target)) return false;

  if (mod && !e.altKey) {
    if (lower === "z" && !e.shiftKey) return a.undo(), true;
    if ((lower === "z" && e.shiftKey) || lower === "y") return a.redo(), true;
    const selectingText = typeof window !== "undefined" && (window.getSelection?.()?.toString() ?? "") !== "";
    if (lower === "c" && !selectingText) return a.copyBars(), true;
    if (lower === "v") return a.pasteBars(), true;
    return false;
  }
  if (e.altKey) return false;

  if (key === "?") return a.setSheetOpen(!s.sheetOpen), true;
  if (key === " " && !activates(e.target)) return ctx.togglePlay(), true;
  if (lower === "t" && !e.shiftKey) return ctx.tap(), true;

  const inGrid = !!(e.target as HTMLElement | null)?.closest?.("[role=grid]");
  if (!inGrid) return false;
  const c = s.cursor;
  switch (key) {
    case "ArrowLeft":
      if (e.shiftKey && c.area === "keys") return a.resizeNoteBy(c.pitch, c.col, -1), true;
      return a.moveCursor(0, -1), true;
    case "ArrowRight":
      if (e.shiftKey && c.area === "keys") return a.resizeNoteBy(c.pitch, c.col, 1), true;
      return a.moveCursor(0, 1), true;
    case "ArrowUp":
      return a.moveCursor(-1, 0), true;
    case "ArrowDown":
      return a.moveCursor(1, 0), true;
    case "[":
      return a.cursorToBarEdge("prev"), true;
    case "]":
      return a.cursorToBarEdge("next"), true;
    case "Home":
      return a.cursorToBarEdge("home"), true;
    case "End":
      return a.cursorToBarEdge("end"), true;
    case "Enter":
      return a.toggleAtCursor(), true;
    case "Delete":
    case "Backspace":
      return a.clearAtCursor(), true;
    case "ContextMenu":
      return ctx.openMenu(), true;
    case "F10":
      if (e.shiftKey) return ctx.openMenu(), true;
      return false;
  }
  switch (lower) {
    case "x":
      return a.toggleAtCursor(), true;
    case "d":
      return a.cycleAtCursor(), true;
    case "m":
      return ctx.openMenu(), true;
    case "b":
      return a.selectBar(cursorBar(s), e.shiftKey), true;
  }
  return false;
}
