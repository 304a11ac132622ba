/** Server side: the compact playhead layout of a drawing (see island-data.ts). */
import type { ScoreLayout } from "../../adapters/vexflow/server";
import type { IslandLayout } from "./island-data";

const r1 = (v: number) => Math.round(v * 10) / 10;

/**
 * @example compactLayout(drawing.layout).bars[0] // [0, 0, 88.4, 351.2, 88.4, 154, 219.6, 285.2]
 */
export function compactLayout(layout: ScoreLayout): IslandLayout {
  return {
    w: layout.width,
    h: layout.height,
    sys: layout.systems.map((s) => [r1(Math.max(0, s.staffTop - 12)), r1(Math.min(layout.height, s.staffBottom + 12))]),
    bars: layout.bars.map((b) => [b.bar, b.system, r1(b.noteStartX), r1(b.noteEndX), ...b.beats.map(r1)]),
  };
}
