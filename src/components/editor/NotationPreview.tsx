/**
 * Live notation: spells the document with the core (`spellGroove`) and hands the score to the notation
 * adapter (src/adapters/vexflow/) through `notation-port`. Until that adapter exists, a plain placeholder
 * says so. Marks `tactus:notation-painted` after each drawing for the toggle-to-paint benchmark.
 */
import { useEffect, useMemo, useRef, useState } from "react";
import { spellGroove, type GrooveDocument } from "../../lib/rhythm";
import type { PlayPosition } from "../../stores/editor-store";
import { loadRenderer, notationAvailable, type NotationView } from "./notation-port";

export interface NotationPreviewProps {
  doc: GrooveDocument;
  playhead?: PlayPosition | null;
  label?: string;
}

export function NotationPreview({ doc, playhead = null, label = "Notation" }: NotationPreviewProps) {
  const host = useRef<HTMLDivElement>(null);
  const view = useRef<NotationView | null>(null);
  const [width, setWidth] = useState(0);
  const [error, setError] = useState<string | null>(null);
  const score = useMemo(() => {
    try {
      return spellGroove(doc);
    } catch (e) {
      return e instanceof Error ? e : new Error(String(e));
    }
  }, [doc]);

  useEffect(() => {
    const el = host.current;
    if (!el || typeof ResizeObserver === "undefined") return;
    const ro = new ResizeObserver((entries) => setWidth(Math.floor(entries[0]!.contentRect.width)));
    ro.observe(el);
    return () => ro.disconnect();
  }, []);

  useEffect(() => {
    const el = host.current;
    if (!el || !notationAvailable || score instanceof Error || width === 0) return;
    let cancelled = false;
    void loadRenderer().then(async (render) => {
      if (cancelled || !render) return;
      try {
        const v = await render(el, score, { width, highlight: null });
        if (cancelled) return;
        view.current = v ?? null;
        setError(null);
        requestAnimationFrame(() => performance.mark?.("tactus:notation-painted"));
      } catch (e) {
        setError(e instanceof Error ? e.message : String(e));
      }
    });
    return () => {
      cancelled = true;
    };
  }, [score, width]);

  useEffect(() => {
    view.current?.highlight?.(playhead);
  }, [playhead]);

  useEffect(() => () => view.current?.dispose?.(), []);

  return (
    <figure className="tx-notation" aria-label={label}>
      <div ref={host} className="tx-notation-host" />
      {!notationAvailable && (
        <p className="tx-placeholder">
          The notation preview appears here once the notation renderer is part of the build.
        </p>
      )}
      {score instanceof Error && <p className="tx-error">This groove cannot be spelled as notation: {score.message}</p>}
      {error && <p className="tx-error">The notation could not be drawn: {error}</p>}
    </figure>
  );
}
