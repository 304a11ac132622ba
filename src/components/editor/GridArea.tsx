/**
 * The scrolling work area: the kit grid and the keys lane share one horizontal scroll, so their columns
 * stay aligned, with the playhead drawn over both while the groove plays.
 *
 * Only the columns near the visible part are in the DOM (whole bars, plus a margin, plus the cursor's
 * column), with spacers standing in for the rest: a long song form stays as quick to edit as one bar.
 */
import { useCallback, useEffect, useLayoutEffect, useMemo, useRef, useState } from "react";
import { useShallow } from "zustand/react/shallow";
import { gridColumns } from "../../stores/selectors";
import { useEditor, useEditorStore } from "./context";
import { KeysLane } from "./KeysLane";
import { SectionStrip } from "./SectionStrip";
import { StepGrid } from "./StepGrid";

/** The rendered column window, inclusive. */
export interface ColumnWindow {
  first: number;
  last: number;
}

/** Columns kept rendered beyond each edge of the view. */
const OVERSCAN = 24;

interface View {
  left: number;
  width: number;
  cell: number;
  head: number;
}

/**
 * Which columns to render: the visible ones and a margin, widened to whole bars and to the cursor.
 * Without a measured view (server rendering, tests without layout) every column is rendered.
 */
export function columnWindow(view: View | null, total: number, perBar: number, cursorCol: number): ColumnWindow {
  if (!view || view.width <= 0 || view.cell <= 0) return { first: 0, last: total - 1 };
  let first = Math.floor(view.left / view.cell) - OVERSCAN;
  let last = Math.ceil((view.left + view.width - view.head) / view.cell) + OVERSCAN;
  first = Math.max(0, Math.min(first, cursorCol - 1));
  last = Math.min(total - 1, Math.max(last, cursorCol + 1));
  first = Math.floor(first / perBar) * perBar;
  last = Math.min(total - 1, Math.ceil((last + 1) / perBar) * perBar - 1);
  return { first, last };
}

export function GridArea({ menuRef }: { menuRef: React.MutableRefObject<(() => void) | null> }) {
  const [meter, grid, bars] = useEditor(useShallow((s) => [s.doc.meter, s.doc.grid, s.doc.bars] as const));
  const columns = useMemo(() => gridColumns({ meter, grid, bars }), [meter, grid, bars]);
  // Every other counted beat is shaded, so beats read at a glance.
  const shade = useMemo(() => {
    let beat = -1;
    return columns.map((c) => {
      if (c.beatStart) beat++;
      return beat % 2 === 1;
    });
  }, [columns]);
  const playhead = useEditor((s) => s.playhead);
  const span = useMemo(() => {
    if (!playhead) return null;
    const inBeat = columns.filter((c) => c.bar === playhead.bar && c.beat === playhead.beat);
    if (inBeat.length === 0) return null;
    return { first: inBeat[0]!.col, count: inBeat.length };
  }, [playhead, columns]);

  const store = useEditorStore();
  const scrollRef = useRef<HTMLDivElement>(null);
  const cellProbe = useRef<HTMLDivElement>(null);
  const headProbe = useRef<HTMLDivElement>(null);
  /** The measured view and the cursor column at that time. */
  const [view, setView] = useState<{ view: View; cursor: number } | null>(null);
  const frame = useRef(0);
  const measure = useCallback(() => {
    const el = scrollRef.current;
    if (!el) return;
    const next = { left: el.scrollLeft, width: el.clientWidth, cell: cellProbe.current?.offsetWidth ?? 0, head: headProbe.current?.offsetWidth ?? 0 };
    const cursor = store.getState().cursor.col;
    setView((v) =>
      v && v.view.left === next.left && v.view.width === next.width && v.view.cell === next.cell && v.view.head === next.head && v.cursor === cursor
        ? v
        : { view: next, cursor },
    );
  }, [store]);
  useLayoutEffect(() => {
    measure();
    const el = scrollRef.current;
    if (!el || typeof ResizeObserver === "undefined") return;
    const ro = new ResizeObserver(measure);
    ro.observe(el);
    return () => ro.disconnect();
  }, [measure]);
  useEffect(() => () => cancelAnimationFrame(frame.current), []);
  const onScroll = () => {
    cancelAnimationFrame(frame.current);
    frame.current = requestAnimationFrame(measure);
  };

  const perBar = Math.max(1, columns.length / Math.max(1, bars));
  // The window grows at once to reach the cursor, but shrinks only when the view is measured again (on
  // scroll or resize): a click that moves the cursor then never unmounts the columns the old cursor kept,
  // which cost more than the edit itself. Only a change of window re-renders the grids, not every cursor move.
  const [first, last] = useEditor(
    useShallow((s) => {
      const now = columnWindow(view?.view ?? null, columns.length, perBar, s.cursor.col);
      const kept = columnWindow(view?.view ?? null, columns.length, perBar, view?.cursor ?? s.cursor.col);
      return [Math.min(now.first, kept.first), Math.max(now.last, kept.last)] as const;
    }),
  );

  return (
    <div ref={scrollRef} className="tx-scroll" tabIndex={-1} onScroll={onScroll}>
      <div className="tx-canvas">
        <div ref={cellProbe} className="tx-probe tx-probe-cell" aria-hidden="true" />
        <div ref={headProbe} className="tx-probe tx-probe-head" aria-hidden="true" />
        <SectionStrip perBar={perBar} />
        <StepGrid columns={columns} shade={shade} first={first} last={last} menuRef={menuRef} />
        <KeysLane columns={columns} shade={shade} first={first} last={last} />
        {span && (
          <div
            className="tx-playhead"
            aria-hidden="true"
            style={{ left: `calc(var(--head) + var(--cell) * ${span.first})`, width: `calc(var(--cell) * ${span.count})` }}
          />
        )}
      </div>
    </div>
  );
}
