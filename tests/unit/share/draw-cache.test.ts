// The per-version drawing cache behind embeds, oEmbed and preview images: a repeated view draws nothing.
import { describe, expect, it } from "vitest";
import { DEMO_GROOVES } from "../../../src/lib/demo/grooves";
import { assertGroove } from "../../../src/lib/rhythm/document";
import { Resvg } from "@resvg/resvg-js";
import { notationFontFiles, renderScoreOnServer } from "../../../src/adapters/vexflow/server";
import { spellGroove } from "../../../src/lib/rhythm/notation";
import { drawBuckets, drawVersion, renderCounter, tidyForPage } from "../../../src/lib/server/embed-cache";
import { WIDTH_BUCKETS } from "../../../src/lib/share/embed-geometry";

const harbour = DEMO_GROOVES.find((g) => g.id === "LmpHarbour1")!;
const doc = assertGroove(harbour.document);

describe("drawing cache", () => {
  it("draws a version once per width and option, then answers from the cache", () => {
    const before = renderCounter();
    const first = drawBuckets("test-harbour", doc, true);
    expect(renderCounter() - before).toBe(WIDTH_BUCKETS.length);
    const again = drawBuckets("test-harbour", doc, true);
    expect(renderCounter() - before).toBe(WIDTH_BUCKETS.length); // nothing drawn the second time
    for (const w of WIDTH_BUCKETS) expect(again.get(w)).toBe(first.get(w));
    drawVersion("test-harbour", doc, { width: 720, keys: false });
    expect(renderCounter() - before).toBe(WIDTH_BUCKETS.length + 1); // another option is another drawing
  });

  it("re-wraps: narrower drawings hold fewer bars per line", () => {
    const narrow = drawVersion("test-harbour", doc, { width: 360, keys: true }).layout;
    const wide = drawVersion("test-harbour", doc, { width: 1280, keys: true }).layout;
    expect(narrow.systems.length).toBeGreaterThan(wide.systems.length);
    expect(narrow.width).toBe(360);
  });

  it("drops VexFlow's element ids (several drawings share a page) and redundant attributes, changing no pixel", () => {
    expect(tidyForPage('<g id="vf-auto12" class="vf-stave"><path id="vf-x"/></g>')).toBe("<g><path/></g>");
    const root = '<svg fill="currentColor" stroke="currentColor">';
    expect(tidyForPage(`${root}<g fill="currentColor"><path stroke="currentColor" fill="none"/></g></svg>`)).toBe(`${root}<g><path fill="none"/></g></svg>`);
    // A group that sets "none" keeps every colour below it explicit.
    const kept = `${root}<g fill="none"><path fill="currentColor"/></g></svg>`;
    expect(tidyForPage(kept)).toBe(kept);
    // The real thing, rasterised by resvg before and after tidying: the same pixels.
    const raw = renderScoreOnServer(spellGroove(doc), { width: 720, theme: { color: "#000" } }).svg;
    const png = (svg: string) =>
      new Resvg(svg, { font: { fontFiles: Object.values(notationFontFiles()), loadSystemFonts: false, defaultFontFamily: "Academico" }, background: "#fff" }).render().pixels;
    const before = png(raw);
    const after = png(tidyForPage(raw));
    expect(tidyForPage(raw).length).toBeLessThan(raw.length * 0.85);
    expect(Buffer.compare(before, after)).toBe(0);
    const svg = drawVersion("test-harbour", doc, { width: 540, keys: true }).svg;
    expect(svg).not.toMatch(/ id="/);
    expect(svg.startsWith("<svg")).toBe(true);
  });
});
