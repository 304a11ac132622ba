/**
 * The seam between the editor and the notation adapter (src/adapters/vexflow/). The editor never imports
 * VexFlow: it spells the document with the core (`spellGroove`) and hands the renderer-neutral score to
 * `renderNotation` from `src/adapters/vexflow/index.ts`, loaded lazily.
 *
 * Contract for the adapter (structural; no import of this file needed):
 *   export function renderNotation(el: HTMLElement, score: NotationScore, options: RenderOptions):
 *     NotationView | void | Promise<NotationView | void>
 * It draws into `el` (replacing what it drew before), wrapping bars to `options.width` pixels. The optional
 * view lets the editor move the playhead highlight without redrawing.
 */
import type { NotationScore } from "../../lib/rhythm";
import type { PlayPosition } from "../../stores/editor-store";

export interface RenderOptions {
  /** Width available in CSS pixels. */
  width: number;
  /** Bar and beat to highlight (0-based), or null. */
  highlight: PlayPosition | null;
}

export interface NotationView {
  /** Move the playing-bar-and-beat highlight (null clears it). */
  highlight?(pos: PlayPosition | null): void;
  dispose?(): void;
}

export type RenderNotation = (
  el: HTMLElement,
  score: NotationScore,
  options: RenderOptions,
) => NotationView | void | Promise<NotationView | void>;

type NotationModule = { renderNotation?: RenderNotation };

const adapters = import.meta.glob<NotationModule>("../../adapters/vexflow/index.ts");

/** Whether a notation adapter is part of this build. */
export const notationAvailable = Object.keys(adapters).length > 0;

let cached: Promise<RenderNotation | null> | null = null;

/** The adapter's render function, loaded once; null when the adapter is not built yet. */
export function loadRenderer(): Promise<RenderNotation | null> {
  const load = Object.values(adapters)[0];
  if (!load) return Promise.resolve(null);
  cached ??= load().then((m) => m.renderNotation ?? null);
  return cached;
}
