/**
 * The keys note menu (right-click or a long touch on a note): the note's velocity and its removal.
 * A small non-modal dialog: focus starts on the velocity slider, Esc closes it and returns focus to the cell.
 */
import { useEffect, useRef } from "react";
import { atOfStep, describeAt, keyNoteAt } from "../../lib/rhythm/editing";
import { pitchName } from "../../stores/selectors";
import { useActions, useEditor } from "./context";
import { NoteVelocity } from "./NoteVelocity";

export interface NoteMenuTarget {
  pitch: number;
  col: number;
  /** Viewport position to open at. */
  x: number;
  y: number;
}

export function NoteMenu({ target, onClose, gridRef }: { target: NoteMenuTarget; onClose: () => void; gridRef: React.RefObject<HTMLDivElement | null> }) {
  const actions = useActions();
  const note = useEditor((s) => keyNoteAt(s.doc, target.pitch, atOfStep(s.doc, target.col)));
  const where = useEditor((s) => (note ? describeAt(s.doc, note.at) : ""));
  const ref = useRef<HTMLDivElement>(null);

  const close = () => {
    onClose();
    gridRef.current?.querySelector<HTMLElement>(`[data-pcell][data-pitch="${target.pitch}"][data-col="${target.col}"]`)?.focus();
  };

  useEffect(() => {
    const outside = (e: PointerEvent) => {
      if (ref.current && !ref.current.contains(e.target as Node)) onClose();
    };
    window.addEventListener("pointerdown", outside, true);
    return () => window.removeEventListener("pointerdown", outside, true);
  }, [onClose]);

  // The note went away (undo, removal): nothing left to edit.
  useEffect(() => {
    if (!note) onClose();
  }, [note, onClose]);
  if (!note) return null;

  const name = `${pitchName(target.pitch)} note, ${where}`;
  const left = Math.max(4, Math.min(target.x, (typeof window !== "undefined" ? window.innerWidth : 1024) - 260));
  return (
    <div
      ref={ref}
      role="dialog"
      aria-label={name}
      className="tx-menu tx-notemenu"
      style={{ left, top: target.y + 4 }}
      onKeyDown={(e) => {
        if (e.key === "Escape") {
          e.preventDefault();
          close();
        }
        // Keep the editor's shortcuts out of the menu.
        e.stopPropagation();
      }}
    >
      <div className="tx-menu-head" aria-hidden="true">
        {name}
      </div>
      <NoteVelocity pitch={target.pitch} col={target.col} autoFocus />
      <div className="tx-stepper">
        <button
          type="button"
          className="tx-btn is-small is-danger"
          onClick={() => {
            actions.toggleNote(target.pitch, target.col);
            close();
          }}
        >
          Remove note
        </button>
        <button type="button" className="tx-btn is-small is-quiet" onClick={close}>
          Done
        </button>
      </div>
    </div>
  );
}
