/**
 * The small hit menu (right-click, long touch, M or Shift+F10): dynamic, articulation, remove.
 * A WAI-ARIA menu: arrow keys move, Enter or Space chooses, Esc closes and returns focus to the cell.
 */
import { useEffect, useRef } from "react";
import { ARTICULATIONS, DYNAMICS, KIT_PIECES, type Articulation, type Dynamic, type KitPieceId } from "../../lib/rhythm";
import { atOfStep, hitAt } from "../../lib/rhythm/editing";
import { useActions, useEditor } from "./context";

export interface MenuTarget {
  piece: KitPieceId;
  row: number;
  col: number;
  /** Viewport position to open at. */
  x: number;
  y: number;
}

const DYNAMIC_WORDS: Record<Dynamic, string> = { ghost: "Ghost note", normal: "Normal", accent: "Accent" };
const ART_WORDS: Record<Articulation, string> = { open: "Open (hi-hat)", flam: "Flam", choke: "Choke (cymbal)" };

export function HitMenu({ target, onClose, gridRef }: { target: MenuTarget; onClose: () => void; gridRef: React.RefObject<HTMLDivElement | null> }) {
  const actions = useActions();
  const hit = useEditor((s) => hitAt(s.doc, target.piece, atOfStep(s.doc, target.col)));
  const ref = useRef<HTMLDivElement>(null);

  const close = () => {
    onClose();
    gridRef.current?.querySelector<HTMLElement>(`[data-kcell][data-row="${target.row}"][data-col="${target.col}"]`)?.focus();
  };

  useEffect(() => {
    ref.current?.querySelector<HTMLElement>("[role^=menuitem]")?.focus();
    const outside = (e: PointerEvent) => {
      if (ref.current && !ref.current.contains(e.target as Node)) onClose();
    };
    window.addEventListener("pointerdown", outside, true);
    return () => window.removeEventListener("pointerdown", outside, true);
  }, [onClose]);

  const onKeyDown = (e: React.KeyboardEvent) => {
    const items = [...(ref.current?.querySelectorAll<HTMLElement>("[role^=menuitem]") ?? [])];
    const i = items.indexOf(document.activeElement as HTMLElement);
    if (e.key === "ArrowDown" || e.key === "ArrowUp") {
      e.preventDefault();
      const next = items[(i + (e.key === "ArrowDown" ? 1 : items.length - 1)) % items.length];
      next?.focus();
    } else if (e.key === "Home" || e.key === "End") {
      e.preventDefault();
      items[e.key === "Home" ? 0 : items.length - 1]?.focus();
    } else if (e.key === "Escape" || e.key === "Tab") {
      e.preventDefault();
      e.stopPropagation();
      close();
    }
    // Keep the editor's shortcuts out of the menu.
    e.stopPropagation();
  };

  const choose = (fn: () => void) => () => {
    fn();
    close();
  };

  const name = KIT_PIECES[target.piece].name;
  const left = Math.max(4, Math.min(target.x, (typeof window !== "undefined" ? window.innerWidth : 1024) - 220));
  return (
    <div
      ref={ref}
      role="menu"
      aria-label={`${name} hit`}
      className="tx-menu"
      style={{ left, top: target.y + 4 }}
      onKeyDown={onKeyDown}
    >
      <div className="tx-menu-head" aria-hidden="true">
        {name}
      </div>
      <div role="group" aria-label="Dynamic">
        {DYNAMICS.map((d) => (
          <button
            key={d}
            type="button"
            role="menuitemradio"
            aria-checked={hit?.dynamic === d}
            tabIndex={-1}
            className="tx-menu-item"
            onClick={choose(() => actions.setDynamic(target.piece, target.col, d))}
          >
            {DYNAMIC_WORDS[d]}
          </button>
        ))}
      </div>
      <div role="separator" className="tx-menu-sep" />
      <div role="group" aria-label="Articulation">
        <button
          type="button"
          role="menuitemradio"
          aria-checked={!!hit && !hit.articulation}
          tabIndex={-1}
          className="tx-menu-item"
          onClick={choose(() => actions.setArticulation(target.piece, target.col, null))}
        >
          Plain stroke
        </button>
        {ARTICULATIONS.map((a) => (
          <button
            key={a}
            type="button"
            role="menuitemradio"
            aria-checked={hit?.articulation === a}
            tabIndex={-1}
            className="tx-menu-item"
            onClick={choose(() => actions.setArticulation(target.piece, target.col, a))}
          >
            {ART_WORDS[a]}
          </button>
        ))}
      </div>
      {hit && (
        <>
          <div role="separator" className="tx-menu-sep" />
          <button type="button" role="menuitem" tabIndex={-1} className="tx-menu-item is-danger" onClick={choose(() => actions.toggleHit(target.piece, target.col))}>
            Remove hit
          </button>
        </>
      )}
    </div>
  );
}
