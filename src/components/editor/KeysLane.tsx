/**
 * The keys lane: one row per pitch (highest first), one cell per grid step. Notes have length: press and
 * drag right to stretch; several pitches at one step make a chord. A press on a note without moving
 * removes it. Touch: a tap adds or removes; the Longer / Shorter buttons change the note at the cursor.
 */
import { memo, useCallback, useEffect, useId, useMemo, useRef, useState, type PointerEvent as ReactPointerEvent } from "react";
import { useShallow } from "zustand/react/shallow";
import { useGestureEnd } from "./use-gesture-end";
import { q, type KeyNote } from "../../lib/rhythm";
import { keyNoteAt } from "../../lib/rhythm/editing";
import { keysRows, pitchName, type GridColumn } from "../../stores/selectors";
import { useActions, useEditor, useEditorStore } from "./context";
import { Spacer } from "./Spacer";
import { lineClass } from "./KitLane";
import { NoteMenu, type NoteMenuTarget } from "./NoteMenu";
import { DEFAULT_VELOCITY, NoteVelocity, velocityOpacity } from "./NoteVelocity";

/** How long a touch must rest on a note to open the note menu (ms); common long-press timing. */
const LONG_PRESS_MS = 500;

const BLACK = new Set([1, 3, 6, 8, 10]);

type Part = "" | "single" | "start" | "held" | "end";

const KeyCell = memo(function KeyCell(props: {
  pitch: number;
  col: GridColumn;
  part: Part;
  steps: number;
  velocity: number;
  cursor: boolean;
  shade: boolean;
  label: string;
}) {
  const { pitch, col, part, steps, velocity, cursor, shade, label } = props;
  // The default velocity is not announced, as a normal kit hit is just "hit".
  const vel = velocity === DEFAULT_VELOCITY ? "" : `, velocity ${velocity}`;
  const state = part === "" ? "empty" : part === "single" || part === "start" ? `note, ${steps} ${steps === 1 ? "step" : "steps"} long${vel}` : "note held";
  return (
    <div
      role="gridcell"
      data-pcell=""
      data-pitch={pitch}
      data-col={col.col}
      aria-colindex={col.col + 2}
      tabIndex={cursor ? 0 : -1}
      aria-label={`Keys ${label}, ${col.where}: ${state}`}
      className={`tx-cell tx-kcell${lineClass(col)}${cursor ? " is-cursor" : ""}${shade ? " is-shade" : ""}`}
    >
      {part && <span className="tx-note" data-part={part} aria-hidden="true" style={{ opacity: velocityOpacity(velocity) }} />}
    </div>
  );
});

const KeyRow = memo(function KeyRow(props: {
  pitch: number;
  index: number;
  columns: GridColumn[];
  shade: boolean[];
  split: boolean;
  first: number;
  last: number;
}) {
  const { pitch, index, columns, shade, split, first, last } = props;
  const notes = useEditor(useShallow((s) => s.doc.keys.notes.filter((n) => n.pitch === pitch)));
  const step = useEditor((s) => s.doc.grid.step);
  const cursorCol = useEditor((s) => (s.cursor.area === "keys" && s.cursor.pitch === pitch ? s.cursor.col : -1));
  const parts = useMemo(() => {
    const out: { part: Part; steps: number; velocity: number }[] = columns.map(() => ({ part: "", steps: 0, velocity: 0 }));
    const st = q(step);
    for (const n of notes as KeyNote[]) {
      const first = Number(q(n.at).div(st).valueOf());
      const len = Number(q(n.duration).div(st).valueOf());
      for (let i = 0; i < len && first + i < out.length; i++)
        out[first + i] = { part: len === 1 ? "single" : i === 0 ? "start" : i === len - 1 ? "end" : "held", steps: len, velocity: n.velocity };
    }
    return out;
  }, [notes, step, columns]);
  const label = pitchName(pitch);
  const black = BLACK.has(pitch % 12);
  return (
    <div role="row" className={`tx-row tx-krow${black ? " is-black" : ""}${split ? " is-split" : ""}`} aria-rowindex={index + 1}>
      <div role="rowheader" aria-colindex={1} className={`tx-rowhead tx-pitch${pitch % 12 === 0 ? " is-c" : ""}`}>
        {label}
      </div>
      <Spacer count={first} />
      {columns.slice(first, last + 1).map((c) => (
        <KeyCell
          key={c.col}
          pitch={pitch}
          col={c}
          part={parts[c.col]!.part}
          steps={parts[c.col]!.steps}
          velocity={parts[c.col]!.velocity}
          cursor={c.col === cursorCol}
          shade={shade[c.col]!}
          label={label}
        />
      ))}
      <Spacer count={columns.length - 1 - last} />
    </div>
  );
});

export function KeysLane({ columns, shade, first, last }: { columns: GridColumn[]; shade: boolean[]; first: number; last: number }) {
  const store = useEditorStore();
  const actions = useActions();
  const range = useEditor((s) => s.keysRange);
  const rows = useEditor(useShallow((s) => keysRows(s.doc, s.keysRange)));
  const splitPitch = useEditor((s) => s.doc.keys.splitPitch);
  // The keys cursor only (pitch:col), so a click in the kit grid does not re-render the keys lane.
  const keysCursor = useEditor((s) => (s.cursor.area === "keys" ? `${s.cursor.pitch}:${s.cursor.col}` : ""));
  const cursorNote = useEditor((s) => (s.cursor.area === "keys" ? keyNoteAt(s.doc, s.cursor.pitch, columnsAt(s.doc.grid.step, s.cursor.col)) : undefined));
  const gridRef = useRef<HTMLDivElement>(null);
  const dragging = useRef(false);
  const touch = useRef<{ pitch: number; col: number; timer: number; opened: boolean } | null>(null);
  const [menu, setMenu] = useState<NoteMenuTarget | null>(null);
  const closeMenu = useCallback(() => setMenu(null), []);
  const open = useEditor((s) => s.keysOpen);
  const gridId = useId();

  useEffect(() => {
    const grid = gridRef.current;
    // Follow the cursor when the focus is anywhere in the grids (arrow keys cross from the kit into the keys).
    if (!grid || !keysCursor || !grid.closest(".tx-canvas")?.contains(document.activeElement)) return;
    if (document.activeElement?.closest(".tx-menu")) return; // the note menu keeps the focus it took
    const [pitch, col] = keysCursor.split(":");
    const cell = grid.querySelector<HTMLElement>(`[data-pcell][data-pitch="${pitch}"][data-col="${col}"]`);
    if (cell && cell !== document.activeElement) cell.focus();
  }, [keysCursor]);

  useGestureEnd(dragging, actions.endGesture);

  const cellOf = (t: EventTarget | null) => (t as HTMLElement | null)?.closest?.("[data-pcell]") as HTMLElement | null;

  const onPointerDown = (e: ReactPointerEvent) => {
    const cell = cellOf(e.target);
    if (!cell || e.button !== 0) return;
    const pitch = Number(cell.dataset.pitch);
    const col = Number(cell.dataset.col);
    actions.setCursor({ area: "keys", pitch, col });
    if (e.pointerType === "touch") {
      // A tap adds or removes on release; a long press on a note opens the note menu.
      const timer = window.setTimeout(() => {
        if (!touch.current || !keyNoteAt(store.getState().doc, pitch, columnsAt(store.getState().doc.grid.step, col))) return;
        touch.current.opened = true;
        const r = cell.getBoundingClientRect();
        setMenu({ pitch, col, x: r.left, y: r.bottom });
      }, LONG_PRESS_MS);
      touch.current = { pitch, col, timer, opened: false };
      return;
    }
    e.preventDefault();
    cell.focus();
    performance.mark?.("tactus:edit");
    dragging.current = true;
    actions.beginNote(pitch, col);
  };
  const onPointerOver = (e: ReactPointerEvent) => {
    if (!dragging.current) return;
    const cell = cellOf(e.target);
    if (cell) actions.noteTo(Number(cell.dataset.col));
  };
  const onPointerUp = (e: ReactPointerEvent) => {
    const t = touch.current;
    touch.current = null;
    if (t) window.clearTimeout(t.timer);
    if (t && !t.opened && e.pointerType === "touch") actions.toggleNote(t.pitch, t.col);
  };
  const cancelTouch = () => {
    if (touch.current) window.clearTimeout(touch.current.timer);
    touch.current = null;
  };
  // Right-click on a note: put the cursor there and open the note menu (a plain press would remove it).
  const onContextMenu = (e: React.MouseEvent) => {
    const cell = cellOf(e.target);
    if (!cell) return;
    e.preventDefault();
    cancelTouch();
    const pitch = Number(cell.dataset.pitch);
    const col = Number(cell.dataset.col);
    actions.setCursor({ area: "keys", pitch, col });
    if (keyNoteAt(store.getState().doc, pitch, columnsAt(store.getState().doc.grid.step, col))) setMenu({ pitch, col, x: e.clientX, y: e.clientY });
  };

  const shift = (semitones: number) => {
    const low = Math.max(0, Math.min(127 - 23, range.low + semitones));
    actions.setKeysRange({ low, high: low + (range.high - range.low) });
  };

  const [cursorPitch, cursorCol] = keysCursor ? keysCursor.split(":").map(Number) : [null, 0];
  const resizeAtCursor = (steps: number) => {
    const c = store.getState().cursor;
    if (c.area === "keys") actions.resizeNoteBy(c.pitch, c.col, steps);
  };
  return (
    <div className="tx-keys">
      <div className="tx-keys-tools">
        <span className="tx-keys-title">Keys</span>
        <button type="button" className="tx-btn is-small is-quiet" aria-expanded={open} aria-controls={gridId} onClick={() => actions.setKeysOpen(!open)}>
          {open ? "Hide the keys lane" : "Show the keys lane"}
        </button>
        <button type="button" className="tx-btn is-small" onClick={() => shift(12)} disabled={range.high >= 127}>
          Octave up
        </button>
        <button type="button" className="tx-btn is-small" onClick={() => shift(-12)} disabled={range.low <= 0}>
          Octave down
        </button>
        <button
          type="button"
          className="tx-btn is-small"
          disabled={!cursorNote}
          onClick={() => resizeAtCursor(1)}
        >
          Longer
        </button>
        <button
          type="button"
          className="tx-btn is-small"
          disabled={!cursorNote}
          onClick={() => resizeAtCursor(-1)}
        >
          Shorter
        </button>
        <NoteVelocity pitch={cursorPitch ?? null} col={cursorCol ?? 0} />
      </div>
      <div
        ref={gridRef}
        id={gridId}
        hidden={!open}
        role="grid"
        aria-label="Keys lane: one row per pitch"
        aria-rowcount={rows.length}
        aria-colcount={columns.length + 1}
        className="tx-grid tx-keysgrid"
        onPointerDown={onPointerDown}
        onPointerOver={onPointerOver}
        onPointerUp={onPointerUp}
        onPointerCancel={cancelTouch}
        onContextMenu={onContextMenu}
        onFocus={(e) => {
          const c = cellOf(e.target);
          if (c) actions.setCursor({ area: "keys", pitch: Number(c.dataset.pitch), col: Number(c.dataset.col) });
        }}
      >
        {rows.map((p, i) => (
          <KeyRow key={p} pitch={p} index={i} columns={columns} shade={shade} split={p === splitPitch} first={first} last={last} />
        ))}
      </div>
      {menu && <NoteMenu target={menu} onClose={closeMenu} gridRef={gridRef} />}
    </div>
  );
}

function columnsAt(step: string, col: number): string {
  return q(step).mul(col).toFraction();
}
