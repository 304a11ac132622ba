/**
 * The scrolling work area: the kit grid and the keys lane share one horizontal scroll, so their columns
 * stay aligned, with the playhead drawn over both while the groove plays.
 */
import { useMemo } from "react";
import { useShallow } from "zustand/react/shallow";
import { gridColumns } from "../../stores/selectors";
import { useEditor } from "./context";
import { KeysLane } from "./KeysLane";
import { StepGrid } from "./StepGrid";

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

  return (
    <div className="tx-scroll" tabIndex={-1}>
      <div className="tx-canvas">
        <StepGrid columns={columns} shade={shade} menuRef={menuRef} />
        <KeysLane columns={columns} shade={shade} />
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
