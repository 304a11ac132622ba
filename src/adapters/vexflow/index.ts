/**
 * Notation adapter, browser entry: the core's NotationScore drawn with VexFlow (see ./render.ts for the SVG
 * structure, ./view.ts for incremental updates, ./server.ts for Node).
 *
 * The fonts come from the app itself (../../styles/notation-fonts.css, imported here so any page that
 * loads this module gets the @font-face rules); they must be loaded before the first drawing, because
 * VexFlow measures every glyph with the browser's canvas.
 */
import "../../styles/notation-fonts.css";
import type { NotationScore } from "../../lib/rhythm/notation/model";
import type { RenderOptions, ScoreLayout } from "./render";
import { NotationRenderer, type PlayPosition } from "./view";
import { forgetTextMetrics } from "./vexflow";

export { renderScoreSvg, type RenderOptions, type RenderResult, type ScoreLayout, type BarLayout, type SystemLayout } from "./render";
export { NotationRenderer, warmUp, type PlayPosition, type UpdateStats } from "./view";

const FONT_FACES = ["30pt Bravura", "10pt Academico", "bold 10pt Academico"];
let fontsReady: Promise<void> | null = null;
let fontsLoaded = false;

/**
 * Load Bravura and Academico (from the app's own files). Resolves once they can be measured.
 * @example await loadNotationFonts(); renderInto(el, score, { width: 800 })
 */
export function loadNotationFonts(): Promise<void> {
  if (fontsLoaded) return Promise.resolve();
  fontsReady ??= Promise.all(FONT_FACES.map((f) => document.fonts.load(f))).then((faces) => {
    fontsLoaded = true;
    // Anything measured before now was measured with fallback fonts.
    forgetTextMetrics();
    if (faces.some((list) => list.length === 0)) {
      console.warn("Tactus notation: Bravura/Academico are not declared on this page; the notation spacing may be off.");
    }
  });
  return fontsReady;
}

/** True once the notation fonts are loaded (drawing can then be synchronous). */
export function notationFontsLoaded(): boolean {
  return fontsLoaded;
}

const renderers = new WeakMap<HTMLElement, NotationRenderer>();

/** The renderer attached to an element, created on first use. */
export function rendererFor(el: HTMLElement): NotationRenderer {
  let r = renderers.get(el);
  if (!r) {
    r = new NotationRenderer(el);
    renderers.set(el, r);
  }
  return r;
}

/**
 * Draw a score into an element, replacing (incrementally) what was drawn there before. Fonts must be loaded
 * (see loadNotationFonts).
 * @example const layout = renderInto(el, score, { width: el.clientWidth })
 */
export function renderInto(el: HTMLElement, score: NotationScore, opts: RenderOptions): ScoreLayout {
  return rendererFor(el).update(score, opts);
}

/** The editor's seam (src/components/editor/notation-port.ts): draw, then hand back highlight and dispose. */
export interface NotationViewHandle {
  highlight(pos: PlayPosition | null): void;
  dispose(): void;
  readonly layout: ScoreLayout | null;
}

/**
 * Draw `score` into `el` (loading the fonts first if needed) and return a handle for the playhead.
 * @example const view = await renderNotation(el, score, { width: 800, highlight: null })
 */
export function renderNotation(
  el: HTMLElement,
  score: NotationScore,
  options: RenderOptions & { highlight?: PlayPosition | null },
): NotationViewHandle | Promise<NotationViewHandle> {
  const draw = (): NotationViewHandle => {
    const r = rendererFor(el);
    r.update(score, options);
    if (options.highlight !== undefined) r.highlight(options.highlight);
    return {
      highlight: (pos) => r.highlight(pos),
      dispose: () => {
        r.dispose();
        renderers.delete(el);
      },
      get layout() {
        return r.layout;
      },
    };
  };
  return fontsLoaded ? draw() : loadNotationFonts().then(draw);
}
