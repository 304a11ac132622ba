// The per-version drawing cache behind embeds, oEmbed and preview images: a repeated view draws nothing.
import { describe, expect, it } from "vitest";
import { DEMO_GROOVES } from "../../../src/lib/demo/grooves";
import { assertGroove } from "../../../src/lib/rhythm/document";
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

  it("drops VexFlow's element ids, so several drawings can share a page", () => {
    expect(tidyForPage('<g id="vf-auto12" class="vf-stave"><path id="vf-x"/></g>')).toBe('<g class="vf-stave"><path/></g>');
    const svg = drawVersion("test-harbour", doc, { width: 540, keys: true }).svg;
    expect(svg).not.toMatch(/ id="/);
    expect(svg.startsWith("<svg")).toBe(true);
  });
});
