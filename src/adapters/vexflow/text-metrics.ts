/**
 * Canvas-like text measurement from font files, for drawing notation where no browser lays out text (Node).
 *
 * VexFlow 5 sizes every glyph (noteheads, clefs, rests, digits) by asking a canvas 2D context to measure it
 * (`Element.setTextMeasurementCanvas`). Under jsdom that canvas measures nothing, so noteheads would pile up.
 * This object answers `measureText` the way a browser canvas does: the CSS font string picks the families,
 * each character comes from the first family that has it (browser font fallback), widths are the fonts'
 * advances after shaping, and the bounding box comes from the glyph outlines.
 */

/** The part of a fontkit font this module reads (kept structural so it needs no fontkit types). */
export interface MeasurableFont {
  readonly unitsPerEm: number;
  readonly ascent: number;
  readonly descent: number;
  hasGlyphForCodePoint(codePoint: number): boolean;
  layout(text: string, features?: Record<string, boolean>): {
    glyphs: readonly { bbox: { minX: number; minY: number; maxX: number; maxY: number } }[];
    positions: readonly { xAdvance: number; xOffset: number; yOffset: number }[];
  };
}

/** Fonts by lower-case family name, with an optional bold face. */
export type FontTable = Record<string, { normal: MeasurableFont; bold?: MeasurableFont }>;

export interface TextMetricsLike {
  width: number;
  actualBoundingBoxLeft: number;
  actualBoundingBoxRight: number;
  actualBoundingBoxAscent: number;
  actualBoundingBoxDescent: number;
  fontBoundingBoxAscent: number;
  fontBoundingBoxDescent: number;
}

interface ParsedFont {
  sizePx: number;
  bold: boolean;
  families: string[];
}

const NO_KERNING = { kern: false };

const SIZE_TO_PX: Record<string, number> = { px: 1, pt: 4 / 3, em: 16, rem: 16, "%": 0.16, "": 1 };

/**
 * Parse a CSS font shorthand as VexFlow writes it ("30pt Bravura,Academico", "bold 10pt Academico").
 * @example parseCssFont("italic bold 14pt Academico").sizePx // 18.67
 */
export function parseCssFont(font: string): ParsedFont {
  const m = /(?:^|\s)([\d.]+)(px|pt|em|rem|%)?\s+(.+)$/.exec(font.trim());
  if (!m) return { sizePx: 10, bold: false, families: ["sans-serif"] };
  const before = font.slice(0, m.index);
  const bold = /\b(bold|bolder|[6-9]00)\b/.test(before);
  const sizePx = Number(m[1]) * (SIZE_TO_PX[m[2] ?? ""] ?? 1);
  const families = m[3]!.split(",").map((f) => f.trim().replace(/^["']|["']$/g, "").toLowerCase());
  return { sizePx, bold, families };
}

/**
 * A stand-in for an HTML canvas whose 2D context measures text with the given fonts.
 * @example Element.setTextMeasurementCanvas(measuringCanvas(fonts) as unknown as HTMLCanvasElement)
 */
export function measuringCanvas(fonts: FontTable): { getContext(kind: "2d"): MeasuringContext } {
  const ctx = new MeasuringContext(fonts);
  return { getContext: () => ctx };
}

export class MeasuringContext {
  font = "10px sans-serif";
  private readonly cache = new Map<string, TextMetricsLike>();

  constructor(private readonly fonts: FontTable) {}

  measureText(text: string): TextMetricsLike {
    const key = `${this.font}\u0000${text}`;
    let m = this.cache.get(key);
    if (!m) {
      m = this.measure(text);
      if (this.cache.size > 20_000) this.cache.clear();
      this.cache.set(key, m);
    }
    return { ...m };
  }

  private face(family: string, bold: boolean): MeasurableFont | undefined {
    const f = this.fonts[family];
    return f ? (bold ? (f.bold ?? f.normal) : f.normal) : undefined;
  }

  private measure(text: string): TextMetricsLike {
    const { sizePx, bold, families } = parseCssFont(this.font);
    const faces = families.map((f) => this.face(f, bold)).filter((f): f is MeasurableFont => f !== undefined);
    const primary = faces[0];
    const empty: TextMetricsLike = {
      width: 0,
      actualBoundingBoxLeft: 0,
      actualBoundingBoxRight: 0,
      actualBoundingBoxAscent: 0,
      actualBoundingBoxDescent: 0,
      fontBoundingBoxAscent: primary ? (primary.ascent / primary.unitsPerEm) * sizePx : 0,
      fontBoundingBoxDescent: primary ? (-primary.descent / primary.unitsPerEm) * sizePx : 0,
    };
    if (!primary || text.length === 0) return empty;

    // Split into runs of characters drawn from the same face (the first family that has the character).
    const runs: { face: MeasurableFont; text: string }[] = [];
    for (const ch of text) {
      const cp = ch.codePointAt(0)!;
      const face = faces.find((f) => f.hasGlyphForCodePoint(cp)) ?? faces[faces.length - 1]!;
      const last = runs[runs.length - 1];
      if (last && last.face === face) last.text += ch;
      else runs.push({ face, text: ch });
    }

    let x = 0;
    let left = Infinity;
    let right = -Infinity;
    let ascent = -Infinity;
    let descent = -Infinity;
    for (const run of runs) {
      const scale = sizePx / run.face.unitsPerEm;
      // A canvas measures without kerning (as Chromium's measureText does for these fonts).
      const { glyphs, positions } = run.face.layout(run.text, NO_KERNING);
      glyphs.forEach((g, i) => {
        const p = positions[i]!;
        const gx = x + p.xOffset * scale;
        const b = g.bbox;
        if (Number.isFinite(b.minX) && b.maxX > b.minX) {
          left = Math.min(left, gx + b.minX * scale);
          right = Math.max(right, gx + b.maxX * scale);
          ascent = Math.max(ascent, (b.maxY + p.yOffset) * scale);
          descent = Math.max(descent, -(b.minY + p.yOffset) * scale);
        }
        x += p.xAdvance * scale;
      });
    }
    if (left === Infinity) return { ...empty, width: x };
    // Glyph bounds come rounded out to whole pixels, as a browser's rasteriser reports them.
    return {
      ...empty,
      width: x,
      actualBoundingBoxLeft: Math.ceil(-left),
      actualBoundingBoxRight: Math.ceil(right),
      actualBoundingBoxAscent: Math.ceil(ascent),
      actualBoundingBoxDescent: Math.ceil(descent),
    };
  }
}
