/**
 * Keys note velocity: a slider and a number field for one note (the note at the keys cursor in the lane's
 * toolbar, or the note a menu was opened on). A slider drag is one undo step: it moves freely and commits
 * when released; each arrow key on it commits one step.
 */
import { useEffect, useState } from "react";
import { atOfStep, keyNoteAt } from "../../lib/rhythm/editing";
import { pitchName } from "../../stores/selectors";
import { CommitInput, wholeNumber } from "./CommitInput";
import { useActions, useEditor } from "./context";
import "./sections.css";

/** The velocity a new note gets (the document's default). */
export const DEFAULT_VELOCITY = 90;

/**
 * How strongly a note of this velocity is drawn: 0.3 for the softest, 1 for the loudest.
 * @example velocityOpacity(127) // 1
 */
export function velocityOpacity(velocity: number): number {
  return Math.round((0.3 + (0.7 * velocity) / 127) * 1000) / 1000;
}

export function NoteVelocity({ pitch, col, autoFocus = false }: { pitch: number | null; col: number; autoFocus?: boolean }) {
  const actions = useActions();
  const note = useEditor((s) => (pitch === null ? undefined : keyNoteAt(s.doc, pitch, atOfStep(s.doc, col))));
  const velocity = note?.velocity ?? null;
  const [drag, setDrag] = useState<number | null>(null);
  useEffect(() => setDrag(null), [velocity, pitch, col]);
  const commit = (v: number) => {
    if (pitch !== null && v !== velocity) actions.setNoteVelocity(pitch, col, v);
    setDrag(null);
  };
  const shown = drag ?? velocity ?? DEFAULT_VELOCITY;
  const what = note && pitch !== null ? `${pitchName(pitch)} note` : "note at the cursor";
  return (
    <span className="tx-velocity" role="group" aria-label={`Velocity of the ${what}`}>
      <span aria-hidden="true">Velocity</span>
      <input
        type="range"
        min={1}
        max={127}
        value={shown}
        disabled={!note}
        autoFocus={autoFocus}
        aria-label={`Velocity of the ${what} (1 to 127)`}
        onChange={(e) => setDrag(Number(e.target.value))}
        onPointerUp={(e) => commit(Number((e.target as HTMLInputElement).value))}
        onKeyUp={(e) => commit(Number((e.target as HTMLInputElement).value))}
        onBlur={(e) => drag !== null && commit(Number(e.target.value))}
      />
      <CommitInput
        type="number"
        min={1}
        max={127}
        className="num"
        value={note ? String(shown) : ""}
        disabled={!note}
        aria-label={`Velocity number of the ${what}`}
        onCommit={(t) => {
          const n = wholeNumber(t);
          if (pitch !== null) actions.setNoteVelocity(pitch, col, n ?? Number.NaN);
        }}
      />
    </span>
  );
}
