/**
 * The music of a printed chart: the notation drawn once on the server, then cut into one SVG per system, so the
 * browser's print layout can break pages between systems (never through a staff).
 *
 * Relies on the renderer's documented SVG structure (src/adapters/vexflow/render.ts): a root <svg> whose
 * children are the systems, each `<g class="tx-system" … transform="translate(0,Y)">` in layout units.
 */
import { renderScoreOnServer } from "../../adapters/vexflow/server";
import type { GrooveDocument } from "../rhythm/document";
import { spellGroove } from "../rhythm/notation/spell";

/** Printable width of the paper sizes, CSS pixels (96 per inch) inside 15 mm side margins. */
export const PAPER = {
  a4: { label: "A4", css: "A4", width: Math.floor(((210 - 30) / 25.4) * 96) },
  letter: { label: "Letter", css: "letter", width: Math.floor(((215.9 - 30) / 25.4) * 96) },
} as const;
export type Paper = keyof typeof PAPER;

export interface ChartSystem {
  svg: string;
  /** Size in CSS pixels, for the box that holds it. */
  width: number;
  height: number;
}

/**
 * One standalone SVG per system, black ink.
 * @example chartSystems(doc, PAPER.a4.width).length // number of systems
 */
export function chartSystems(doc: GrooveDocument, width: number): ChartSystem[] {
  const { svg, layout } = renderScoreOnServer(spellGroove(doc), { width, theme: { color: "#000000" } });
  const open = svg.slice(0, svg.indexOf(">") + 1);
  const viewBox = /viewBox="0 0 ([\d.]+) ([\d.]+)"/.exec(open);
  if (!viewBox) throw new Error("the notation drawing has no viewBox");
  const layoutWidth = Number(viewBox[1]);
  const starts = [...svg.matchAll(/<g class="tx-system"[^>]*transform="translate\(0,([\d.]+)\)"[^>]*>/g)];
  const end = svg.lastIndexOf("</svg>");
  return starts.map((m, i) => {
    const system = layout.systems[i]!;
    const y = Number(m[1]);
    const heightLayout = system.height / layout.scale;
    const body = svg.slice(m.index!, i + 1 < starts.length ? starts[i + 1]!.index! : end);
    const root = open
      .replace(/\swidth="[\d.]+"/, ` width="${layout.width}"`)
      .replace(/\sheight="[\d.]+"/, ` height="${round(system.height)}"`)
      .replace(/viewBox="[^"]*"/, `viewBox="0 ${round(y)} ${layoutWidth} ${round(heightLayout)}"`)
      .replace(/\saria-label="[^"]*"/, ` aria-label="System ${i + 1}"`);
    return { svg: `${root}${body}</svg>`, width: layout.width, height: round(system.height) };
  });
}

const round = (x: number) => Math.round(x * 100) / 100;
