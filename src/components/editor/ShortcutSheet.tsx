/** The shortcut sheet ("?"): a modal dialog listing every key, from the same table the handler uses. */
import { useEffect, useRef } from "react";
import { useActions, useEditor } from "./context";
import { SHORTCUTS } from "./shortcuts";

const isApple = () => typeof navigator !== "undefined" && /Mac|iPhone|iPad/.test(navigator.platform || navigator.userAgent);

export function ShortcutSheet() {
  const open = useEditor((s) => s.sheetOpen);
  const actions = useActions();
  const closeRef = useRef<HTMLButtonElement>(null);
  const back = useRef<Element | null>(null);
  useEffect(() => {
    if (open) {
      back.current = document.activeElement;
      closeRef.current?.focus();
    } else if (back.current instanceof HTMLElement) {
      back.current.focus();
      back.current = null;
    }
  }, [open]);
  if (!open) return null;
  const mod = isApple() ? "⌘" : "Ctrl";
  return (
    <div className="tx-overlay" onPointerDown={(e) => e.target === e.currentTarget && actions.setSheetOpen(false)}>
      <div
        role="dialog"
        aria-modal="true"
        aria-labelledby="tx-sheet-title"
        className="tx-sheet"
        onKeyDown={(e) => {
          if (e.key === "Tab") {
            // Keep focus inside the dialog: its only control is the close button.
            e.preventDefault();
            closeRef.current?.focus();
          }
        }}
      >
        <div className="tx-sheet-head">
          <h2 id="tx-sheet-title">Keyboard shortcuts</h2>
          <button ref={closeRef} type="button" className="tx-btn is-small" onClick={() => actions.setSheetOpen(false)}>
            Close <kbd>Esc</kbd>
          </button>
        </div>
        <div className="tx-sheet-body">
          {SHORTCUTS.map((g) => (
            <section key={g.title}>
              <h3>{g.title}</h3>
              <dl>
                {g.rows.map((r) => (
                  <div key={r.what} className="tx-sheet-row">
                    <dt>
                      {r.keys.map((k, i) => (
                        <span key={k}>
                          {i > 0 && <span className="tx-dim"> / </span>}
                          <kbd>{k.replace("Mod", mod)}</kbd>
                        </span>
                      ))}
                    </dt>
                    <dd>{r.what}</dd>
                  </div>
                ))}
              </dl>
            </section>
          ))}
        </div>
      </div>
    </div>
  );
}
