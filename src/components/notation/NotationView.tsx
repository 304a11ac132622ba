/**
 * Live notation island: a groove document (or an already spelled NotationScore) drawn with the VexFlow
 * adapter, wrapped to the width it is given, redrawn bar by bar as the groove changes, with the playing
 * bar and beat marked by an overlay that moves without redrawing.
 *
 * The adapter (and VexFlow with it) loads lazily, after the page is interactive. Performance marks for the
 * toggle-to-paint benchmark: "tactus:notation-updated" after the SVG changed, "tactus:painted" in the next
 * animation frame.
 */
import { useEffect, useLayoutEffect, useMemo, useRef, useState } from "react";
import type { GrooveDocument } from "../../lib/rhythm/document";
import type { NotationScore } from "../../lib/rhythm/notation/model";
import { respell, type Spelled } from "./respell";

type Adapter = typeof import("../../adapters/vexflow/index");
type Renderer = import("../../adapters/vexflow/view").NotationRenderer;
type ScoreLayout = import("../../adapters/vexflow/render").ScoreLayout;

export interface PlayPosition {
  /** 0-based bar and counted beat (as the playback plan counts them: 2 per bar in 6/8). */
  readonly bar: number;
  readonly beat: number;
}

export interface NotationViewProps {
  /** The groove to draw (spelled here), or ... */
  doc?: GrooveDocument;
  /** ... a score spelled by the caller. */
  score?: NotationScore;
  playhead?: PlayPosition | null;
  showKeys?: boolean;
  fromBar?: number;
  toBar?: number;
  /** Accessible name of the figure's drawing. */
  label?: string;
  className?: string;
  /** Called after each drawing with the position of every bar and beat. */
  onLayout?: (layout: ScoreLayout) => void;
  /** The drawing will be edited: after the first drawing, warm up the drawing code while the page is idle. */
  warmUp?: boolean;
}

let adapterPromise: Promise<Adapter> | null = null;
function loadAdapter(): Promise<Adapter> {
  adapterPromise ??= import("../../adapters/vexflow/index");
  return adapterPromise;
}

export function NotationView({ doc, score: given, playhead = null, showKeys = true, fromBar, toBar, label, className, onLayout, warmUp = false }: NotationViewProps) {
  const host = useRef<HTMLDivElement>(null);
  const renderer = useRef<Renderer | null>(null);
  const lastDrawn = useRef<{ score: NotationScore; width: number } | null>(null);
  const lastSpelled = useRef<Spelled | null>(null);
  const [adapter, setAdapter] = useState<Adapter | null>(null);
  const [fontsReady, setFontsReady] = useState(false);
  const [width, setWidth] = useState(0);
  const [drawError, setDrawError] = useState<string | null>(null);
  const layoutCallback = useRef(onLayout);
  layoutCallback.current = onLayout;
  const stopWarmUp = useRef<(() => void) | null>(null);

  const score = useMemo<NotationScore | Error | null>(() => {
    if (given) return given;
    if (!doc) return null;
    try {
      // An edit spells only the bars it changed; the others keep their objects (and cached drawings).
      const score = respell(lastSpelled.current, doc);
      lastSpelled.current = { doc, score };
      return score;
    } catch (e) {
      return e instanceof Error ? e : new Error(String(e));
    }
  }, [doc, given]);

  useEffect(() => {
    let live = true;
    void loadAdapter()
      .then(async (a) => {
        if (!live) return;
        setAdapter(a);
        await a.loadNotationFonts();
        if (live) setFontsReady(true);
      })
      .catch((e: unknown) => live && setDrawError(e instanceof Error ? e.message : String(e)));
    return () => {
      live = false;
    };
  }, []);

  useLayoutEffect(() => {
    const el = host.current;
    if (!el) return;
    setWidth(Math.floor(el.getBoundingClientRect().width));
    if (typeof ResizeObserver === "undefined") return;
    const ro = new ResizeObserver((entries) => setWidth(Math.floor(entries[0]!.contentRect.width)));
    ro.observe(el);
    return () => ro.disconnect();
  }, []);

  // Draw in a layout effect: the SVG is updated in the same task as the edit, before the browser paints.
  useLayoutEffect(() => {
    const el = host.current;
    if (!el || !adapter || !fontsReady || width <= 0 || !score || score instanceof Error) return;
    try {
      renderer.current ??= new adapter.NotationRenderer(el);
      const prev = lastDrawn.current;
      el.dataset.updateReason = !prev ? "first" : prev.score !== score ? "score" : prev.width !== width ? `width ${prev.width}→${width}` : "options";
      lastDrawn.current = { score, width };
      const layout = renderer.current.update(score, { width, showKeys, fromBar, toBar });
      performance.mark?.("tactus:notation-updated");
      // Bars drawn and milliseconds spent drawing so far (for the benchmark: what one edit costs).
      el.dataset.barsDrawn = String(Number(el.dataset.barsDrawn ?? 0) + renderer.current.lastStats.barsDrawn);
      el.dataset.drawMs = (Number(el.dataset.drawMs ?? 0) + renderer.current.lastStats.ms).toFixed(2);
      requestAnimationFrame(() => performance.mark?.("tactus:painted"));
      if (warmUp && !prev) stopWarmUp.current = adapter.warmUp(score, { width, showKeys });
      setDrawError(null);
      layoutCallback.current?.(layout);
    } catch (e) {
      setDrawError(e instanceof Error ? e.message : String(e));
    }
    // warmUp is read at the first drawing only.
  }, [adapter, fontsReady, width, score, showKeys, fromBar, toBar]);

  useEffect(() => {
    renderer.current?.highlight(playhead);
  }, [playhead, adapter, fontsReady]);

  useEffect(
    () => () => {
      stopWarmUp.current?.();
      renderer.current?.dispose();
      renderer.current = null;
    },
    [],
  );

  return (
    <div className={className ? `tx-notation-view ${className}` : "tx-notation-view"} data-ready={fontsReady && adapter ? "" : undefined}>
      <div ref={host} className="tx-notation-draw" aria-label={label} role={label ? "group" : undefined} />
      {score instanceof Error && <p className="tx-error">This groove cannot be written as notation: {score.message}</p>}
      {drawError && <p className="tx-error">The notation could not be drawn: {drawError}</p>}
    </div>
  );
}

export default NotationView;
