/**
 * The kit step grid: an ARIA grid with a bar header row, a count header row and one row per kit piece.
 * Pointer input is delegated to the grid element (one handler, not one per cell): press toggles and starts
 * painting a run, Shift+press steps the dynamic, right-click or a long touch opens the hit menu.
 */
import { memo, useEffect, useRef, useState, type PointerEvent as ReactPointerEvent } from "react";
import { useShallow } from "zustand/react/shallow";
import { useGestureEnd } from "./use-gesture-end";
import { KIT_PIECES, KIT_ROW_ORDER, type KitPieceId } from "../../lib/rhythm";
import type { GridColumn } from "../../stores/selectors";
import { useActions, useEditor, useEditorStore } from "./context";
import { Spacer } from "./Spacer";
import { HitMenu, type MenuTarget } from "./HitMenu";
import { KitLane, lineClass } from "./KitLane";

export interface StepGridProps {
  columns: GridColumn[];
  shade: boolean[];
  /** Rendered column window (inclusive). */
  first: number;
  last: number;
  /** Set by the parent so the keyboard shortcut can open the menu at the cursor. */
  menuRef?: React.MutableRefObject<(() => void) | null>;
}

/** How long a touch must rest on a cell to open the hit menu (ms); common long-press timing. */
const LONG_PRESS_MS = 500;

function cellOf(target: EventTarget | null, attr: string): HTMLElement | null {
  return ((target as HTMLElement | null)?.closest?.(`[${attr}]`) as HTMLElement | null) ?? null;
}

export function StepGrid({ columns, shade, first, last, menuRef }: StepGridProps) {
  const store = useEditorStore();
  const actions = useActions();
  const pieces = useEditor(useShallow((s) => s.doc.kit.lanes.map((l) => l.piece)));
  const bars = useEditor((s) => s.doc.bars);
  const selection = useEditor((s) => s.selection);
  const gridRef = useRef<HTMLDivElement>(null);
  const painting = useRef(false);
  const touch = useRef<{ row: number; col: number; timer: number; opened: boolean } | null>(null);
  const [menu, setMenu] = useState<MenuTarget | null>(null);

  useGestureEnd(painting, actions.endGesture);

  const openMenuAt = (row: number, col: number) => {
    const piece = store.getState().doc.kit.lanes[row]?.piece;
    const cell = gridRef.current?.querySelector<HTMLElement>(`[data-kcell][data-row="${row}"][data-col="${col}"]`);
    if (!piece || !cell) return;
    const r = cell.getBoundingClientRect();
    setMenu({ piece, col, row, x: r.left, y: r.bottom });
  };

  if (menuRef)
    menuRef.current = () => {
      const c = store.getState().cursor;
      if (c.area === "kit") openMenuAt(c.row, c.col);
    };

  const onPointerDown = (e: ReactPointerEvent) => {
    const cell = cellOf(e.target, "data-kcell");
    if (!cell) return;
    const row = Number(cell.dataset.row);
    const col = Number(cell.dataset.col);
    const piece = store.getState().doc.kit.lanes[row]?.piece;
    if (!piece) return;
    actions.setCursor({ area: "kit", row, col });
    if (e.button !== 0) return;
    if (e.pointerType === "touch") {
      // Touch: a tap toggles on release (so a swipe can scroll the grid); a long press opens the menu.
      const timer = window.setTimeout(() => {
        if (touch.current) touch.current.opened = true;
        openMenuAt(row, col);
      }, LONG_PRESS_MS);
      touch.current = { row, col, timer, opened: false };
      return;
    }
    e.preventDefault();
    cell.focus();
    performance.mark?.("tactus:edit");
    if (e.shiftKey) {
      actions.cycleDynamic(piece, col);
      return;
    }
    painting.current = true;
    actions.beginPaint(piece, col);
  };

  const onPointerOver = (e: ReactPointerEvent) => {
    if (!painting.current) return;
    const cell = cellOf(e.target, "data-kcell");
    if (cell) actions.paintTo(Number(cell.dataset.col));
  };

  const onPointerUp = (e: ReactPointerEvent) => {
    const t = touch.current;
    if (!t || e.pointerType !== "touch") return;
    window.clearTimeout(t.timer);
    touch.current = null;
    if (t.opened) return;
    const piece = store.getState().doc.kit.lanes[t.row]?.piece;
    if (piece) {
      performance.mark?.("tactus:edit");
      actions.toggleHit(piece, t.col);
    }
  };

  const cancelTouch = () => {
    if (touch.current) window.clearTimeout(touch.current.timer);
    touch.current = null;
  };

  const onContextMenu = (e: React.MouseEvent) => {
    const cell = cellOf(e.target, "data-kcell");
    if (!cell) return;
    e.preventDefault();
    cancelTouch();
    setMenu({ piece: store.getState().doc.kit.lanes[Number(cell.dataset.row)]!.piece, row: Number(cell.dataset.row), col: Number(cell.dataset.col), x: e.clientX, y: e.clientY });
  };

  // Bar header cells: one per bar, spanning its columns.
  const barStarts = columns.slice(first, last + 1).filter((c) => c.barStart);
  const perBar = columns.length / Math.max(1, bars);
  const unused = KIT_ROW_ORDER.filter((p) => !pieces.includes(p));

  return (
    <>
      <div
        ref={gridRef}
        role="grid"
        aria-label="Kit step grid"
        aria-rowcount={pieces.length + 2}
        aria-colcount={columns.length + 1}
        aria-multiselectable="true"
        className="tx-grid"
        onPointerDown={onPointerDown}
        onPointerOver={onPointerOver}
        onPointerUp={onPointerUp}
        onPointerCancel={cancelTouch}
        onContextMenu={onContextMenu}
        onFocus={(e) => {
          // Focus that arrives by Tab or script moves the cursor too, so keys act where the focus is.
          const c = cellOf(e.target, "data-kcell");
          if (c) actions.setCursor({ area: "kit", row: Number(c.dataset.row), col: Number(c.dataset.col) });
        }}
      >
        <div role="row" className="tx-row tx-barrow" aria-rowindex={1}>
          <div role="columnheader" className="tx-rowhead tx-corner">
            Bar
          </div>
          <Spacer count={first} />
          {barStarts.map((c) => {
            const selected = !!selection && c.bar >= selection.start && c.bar < selection.start + selection.count;
            return (
              <div
                key={c.col}
                role="columnheader"
                aria-colspan={perBar}
                className={`tx-barhead${selected ? " in-sel" : ""}`}
                style={{ width: `calc(var(--cell) * ${perBar})` }}
              >
                <button
                  type="button"
                  className="tx-barbtn"
                  aria-pressed={selected}
                  aria-label={`Bar ${c.bar + 1}: ${selected ? "selected" : "select"} (Shift to extend)`}
                  onClick={(e) => actions.selectBar(c.bar, e.shiftKey)}
                >
                  {c.bar + 1}
                </button>
              </div>
            );
          })}
        </div>
        <CountRow columns={columns} shade={shade} first={first} last={last} />
        {pieces.map((p, i) => (
          <KitLane key={p} row={i} columns={columns} shade={shade} first={first} last={last} />
        ))}
      </div>
      <div className="tx-addrow">
        <label className="tx-addlabel">
          <span>Add a kit piece</span>
          <select
            value=""
            disabled={unused.length === 0}
            onChange={(e) => {
              if (e.target.value) actions.addLane(e.target.value as KitPieceId);
            }}
          >
            <option value="">Choose…</option>
            {unused.map((p) => (
              <option key={p} value={p}>
                {KIT_PIECES[p].name}
              </option>
            ))}
          </select>
        </label>
      </div>
      {menu && <HitMenu target={menu} onClose={() => setMenu(null)} gridRef={gridRef} />}
      <FollowCursor gridRef={gridRef} />
    </>
  );
}

/**
 * Keeps DOM focus on the cursor cell while the grid has focus (roving tabindex). Its own component, so a
 * cursor move re-renders this alone and not the grid.
 */
function FollowCursor({ gridRef }: { gridRef: React.RefObject<HTMLDivElement | null> }) {
  const at = useEditor((s) => (s.cursor.area === "kit" ? `[data-kcell][data-row="${s.cursor.row}"][data-col="${s.cursor.col}"]` : null));
  useEffect(() => {
    const grid = gridRef.current;
    if (!grid || !at || !grid.closest(".tx-canvas")?.contains(document.activeElement)) return;
    const cell = grid.querySelector<HTMLElement>(at);
    if (cell && cell !== document.activeElement) cell.focus();
  }, [at, gridRef]);
  return null;
}

/** The count header ("1 e & a"): depends on the layout only, so it is memoised. */
const CountRow = memo(function CountRow({ columns, shade, first, last }: { columns: GridColumn[]; shade: boolean[]; first: number; last: number }) {
  return (
    <div role="row" className="tx-row tx-countrow" aria-rowindex={2}>
      <div role="columnheader" className="tx-rowhead tx-corner">
        Count
      </div>
      <Spacer count={first} />
      {columns.slice(first, last + 1).map((c) => (
        <div
          key={c.col}
          role="columnheader"
          aria-label={c.where}
          className={`tx-count${lineClass(c)}${c.beatStart ? " is-num" : ""}${shade[c.col] ? " is-shade" : ""}`}
        >
          {c.count}
        </div>
      ))}
      <Spacer count={columns.length - 1 - last} />
    </div>
  );
});
