/**
 * One kit row of the step grid: a row header (piece name, remove button) and one cell per grid step.
 * The row reads its lane from the store; cells are memoised so an edit re-renders only the changed row.
 */
import { memo, useMemo } from "react";
import { KIT_PIECES, type KitHit, type KitPieceId } from "../../lib/rhythm";
import { hitState, type GridColumn } from "../../stores/selectors";
import { useActions, useEditor } from "./context";
import { Spacer } from "./Spacer";

export function lineClass(c: GridColumn): string {
  return c.barStart ? " is-bar" : c.beatStart ? " is-beat" : c.unitStart ? " is-unit" : "";
}

const ART_MARK: Record<string, string> = { open: "o", flam: "fl", choke: "ch" };

interface CellProps {
  row: number;
  col: GridColumn;
  name: string;
  hit: KitHit | undefined;
  cursor: boolean;
  selected: boolean;
  shade: boolean;
}

const KitCell = memo(function KitCell({ row, col, name, hit, cursor, selected, shade }: CellProps) {
  return (
    <div
      role="gridcell"
      data-kcell=""
      data-row={row}
      data-col={col.col}
      aria-colindex={col.col + 2}
      tabIndex={cursor ? 0 : -1}
      aria-label={`${name}, ${col.where}: ${hitState(hit)}`}
      aria-selected={selected || undefined}
      className={`tx-cell${lineClass(col)}${cursor ? " is-cursor" : ""}${selected ? " in-sel" : ""}${shade ? " is-shade" : ""}`}
    >
      {hit && (
        <span className="tx-hit" data-dyn={hit.dynamic} aria-hidden="true">
          {hit.articulation && <span className="tx-art">{ART_MARK[hit.articulation]}</span>}
        </span>
      )}
    </div>
  );
});

export interface KitLaneProps {
  row: number;
  columns: GridColumn[];
  /** Rendered column window (inclusive); spacers stand for the rest. */
  first: number;
  last: number;
  /** Per column: true when its beat is shaded (every other counted beat). */
  shade: boolean[];
}

/** Memoised: a row re-renders only when its own lane, its cursor column or the selection changes. */
export const KitLane = memo(function KitLane({ row, columns, shade, first, last }: KitLaneProps) {
  const lane = useEditor((s) => s.doc.kit.lanes[row]);
  const cursorCol = useEditor((s) => (s.cursor.area === "kit" && s.cursor.row === row ? s.cursor.col : -1));
  const selection = useEditor((s) => s.selection);
  const actions = useActions();
  const byAt = useMemo(() => new Map((lane?.hits ?? []).map((h) => [h.at, h] as const)), [lane?.hits]);
  if (!lane) return null;
  const piece = KIT_PIECES[lane.piece as KitPieceId];
  const inSel = (bar: number) => !!selection && bar >= selection.start && bar < selection.start + selection.count;
  return (
    <div role="row" className="tx-row" aria-rowindex={row + 3}>
      <div role="rowheader" className="tx-rowhead" aria-colindex={1}>
        <span className="tx-rowname">{piece.name}</span>
        <button
          type="button"
          className="tx-rowdel"
          aria-label={`Remove the ${piece.name} row`}
          title={`Remove the ${piece.name} row`}
          onClick={() => actions.removeLane(lane.piece)}
        >
          ×
        </button>
      </div>
      <Spacer count={first} />
      {columns.slice(first, last + 1).map((c) => (
        <KitCell
          key={c.col}
          row={row}
          col={c}
          name={piece.name}
          hit={byAt.get(c.at)}
          cursor={c.col === cursorCol}
          selected={inSel(c.bar)}
          shade={shade[c.col]!}
        />
      ))}
      <Spacer count={columns.length - 1 - last} />
    </div>
  );
});
