/** Bar tools: add, insert, duplicate, delete, copy and paste bars; shows what they act on. */
import { cursorBar } from "../../stores/editor-store";
import { useActions, useEditor } from "./context";

export function BarTools() {
  const actions = useActions();
  const selection = useEditor((s) => s.selection);
  const bar = useEditor((s) => cursorBar(s));
  const bars = useEditor((s) => s.doc.bars);
  const clip = useEditor((s) => s.clipboard);
  const range = selection ?? { start: bar, count: 1 };
  const label =
    range.count === 1 ? `bar ${range.start + 1}` : `bars ${range.start + 1}–${range.start + range.count}`;
  return (
    <div className="tx-bartools" role="toolbar" aria-label="Bars">
      <span className="tx-bartools-label">
        {selection ? "Selected: " : "At the cursor: "}
        <strong className="num">{label}</strong>
        <span className="tx-dim"> of {bars}</span>
      </span>
      <button type="button" className="tx-btn" onClick={() => actions.insertBars(bars)}>
        Add bar at end
      </button>
      <button type="button" className="tx-btn" onClick={() => actions.insertBars(range.start)}>
        Insert before {range.start + 1}
      </button>
      <button type="button" className="tx-btn" onClick={() => actions.duplicateBars()}>
        Duplicate {label}
      </button>
      <button type="button" className="tx-btn" onClick={() => actions.copyBars()}>
        Copy
      </button>
      <button type="button" className="tx-btn" disabled={!clip} onClick={() => actions.pasteBars()}>
        Paste{clip ? ` (${clip.bars === 1 ? "1 bar" : `${clip.bars} bars`})` : ""}
      </button>
      <button type="button" className="tx-btn is-danger" disabled={bars - range.count < 1} onClick={() => actions.deleteBars()}>
        Delete {label}
      </button>
      {selection && (
        <button type="button" className="tx-btn is-quiet" onClick={() => actions.clearSelection()}>
          Clear selection
        </button>
      )}
    </div>
  );
}
