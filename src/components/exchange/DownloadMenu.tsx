/**
 * A compact download menu for one groove (its latest version), for lists such as the library table: a disclosure
 * button that opens plain download links (MIDI, MusicXML, SVG, PNG) and the printable chart.
 */
import { useEffect, useRef, useState } from "react";
import { downloadLinks, printHref } from "./links";

export default function DownloadMenu({ grooveId, title }: { grooveId: string; title: string }) {
  const [open, setOpen] = useState(false);
  const root = useRef<HTMLDivElement>(null);
  useEffect(() => {
    if (!open) return;
    const close = (e: MouseEvent | KeyboardEvent) => {
      if (e instanceof KeyboardEvent ? e.key === "Escape" : !root.current?.contains(e.target as Node)) setOpen(false);
    };
    document.addEventListener("mousedown", close);
    document.addEventListener("keydown", close);
    return () => {
      document.removeEventListener("mousedown", close);
      document.removeEventListener("keydown", close);
    };
  }, [open]);
  const id = `dl-${grooveId}`;
  return (
    <div ref={root} className="relative inline-block">
      <button
        type="button"
        aria-expanded={open}
        aria-controls={id}
        aria-label={`Download ${title}`}
        onClick={() => setOpen((v) => !v)}
        className="rounded-md border border-line-strong px-2 py-1 text-sm font-medium text-ink-soft hover:border-brass hover:text-brass"
      >
        Download ▾
      </button>
      {open && (
        <ul id={id} className="absolute right-0 z-10 mt-1 min-w-40 rounded-md border border-line bg-surface-raised py-1 text-sm shadow-lg">
          {downloadLinks(grooveId).map((l) => (
            <li key={l.format}>
              <a href={l.href} download title={l.hint} className="block px-3 py-1.5 text-ink no-underline hover:bg-surface-sunken hover:text-brass" onClick={() => setOpen(false)}>
                {l.label}
              </a>
            </li>
          ))}
          <li className="border-t border-line">
            <a href={printHref(grooveId)} className="block px-3 py-1.5 text-ink no-underline hover:bg-surface-sunken hover:text-brass">
              Print chart
            </a>
          </li>
        </ul>
      )}
    </div>
  );
}
