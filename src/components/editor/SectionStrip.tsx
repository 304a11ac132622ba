/**
 * The song-form strip above the grid's bar columns: one labelled band per section ("Verse ×3"), lined up
 * with its bars. Pressing a band selects the section's bars, so the bar tools (copy, duplicate, delete…)
 * act on the whole section. Shown only when the groove has sections.
 */
import { useShallow } from "zustand/react/shallow";
import { useActions, useEditor } from "./context";
import "./sections.css";

/** "bars 5–8" or "bar 5", 1-based, for people. */
export function barsText(startBar: number, bars: number): string {
  return bars === 1 ? `bar ${startBar + 1}` : `bars ${startBar + 1}–${startBar + bars}`;
}

export function SectionStrip({ perBar }: { perBar: number }) {
  const actions = useActions();
  const sections = useEditor(useShallow((s) => s.doc.sections));
  const selection = useEditor((s) => s.selection);
  if (sections.length === 0) return null;
  return (
    <div className="tx-formstrip" role="group" aria-label="Song form">
      <div className="tx-rowhead tx-corner" aria-hidden="true">
        Form
      </div>
      {sections.map((s, i) => {
        const selected = !!selection && selection.start === s.startBar && selection.count === s.bars;
        return (
          <button
            key={`${i}:${s.startBar}`}
            type="button"
            className={`tx-formband${selected ? " in-sel" : ""}`}
            data-section={i}
            aria-pressed={selected}
            aria-label={`Section ${s.name}, ${barsText(s.startBar, s.bars)}, played ${s.repeats === 1 ? "once" : `${s.repeats} times`}: select its bars`}
            title={`${s.name}: ${barsText(s.startBar, s.bars)}${s.repeats > 1 ? `, played ${s.repeats} times` : ""}`}
            style={{
              left: `calc(var(--head) + var(--cell) * ${perBar * s.startBar})`,
              width: `calc(var(--cell) * ${perBar * s.bars})`,
            }}
            onClick={() => {
              if (selected) actions.clearSelection();
              else {
                actions.clearSelection(); // selectBar on the one selected bar would toggle it off
                actions.selectBar(s.startBar);
                if (s.bars > 1) actions.selectBar(s.startBar + s.bars - 1, true);
              }
            }}
          >
            <span className="tx-formname">{s.name}</span>
            {s.repeats > 1 && <span className="tx-formrep num">×{s.repeats}</span>}
          </button>
        );
      })}
    </div>
  );
}
