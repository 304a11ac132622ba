// @vitest-environment jsdom
/**
 * The browser renderer (NotationRenderer) under jsdom, with text measured from the font files: an edit
 * redraws only the bar it changed, the result is the same as drawing from scratch, line breaks stay put while
 * bars still fit, and the playhead overlay moves without touching the SVG.
 */
import { describe, expect, it } from "vitest";
import { useFontFileMetrics } from "../../../src/adapters/vexflow/server";
import { NotationRenderer } from "../../../src/adapters/vexflow/view";
import { spellGroove, toggleHit } from "../../../src/lib/rhythm";
import { every, groove, inkOf, render } from "./svg";

useFontFileMetrics();

const base = groove({ bars: 4, kit: { "hihat-closed": every(1, 32, 8), snare: ["1/4", "3/4", "5/4", "7/4", "9/4", "11/4", "13/4", "15/4"], kick: every(1, 4, 1) } });

/**
 * The drawing's SVGs in bar order, without VexFlow's running element ids (they differ between two drawings of
 * the same thing) and without the playhead boxes.
 */
const canonical = (canvas: Element) =>
  [...canvas.querySelectorAll("svg")]
    .map((s) => s.outerHTML.replace(/ id="vf-auto\d+"/g, ""))
    .sort()
    .join("\n");

function mount(width = 1000) {
  const host = document.createElement("div");
  document.body.appendChild(host);
  return { host, r: new NotationRenderer(host), width };
}

describe("incremental notation", () => {
  it("redraws only the changed bar and keeps the other bars' elements", () => {
    const { r, width } = mount();
    r.update(spellGroove(base), { width });
    expect(r.lastStats.barsDrawn).toBe(4);
    const before = [...r.canvas.querySelectorAll("g.tx-bar")];
    const edited = toggleHit(base, "snare", "19/16"); // bar 2 (0-based 1), beat 2 "a"
    r.update(spellGroove(edited), { width });
    expect(r.lastStats.barsDrawn).toBe(1);
    const after = [...r.canvas.querySelectorAll("g.tx-bar")];
    const same = after.filter((g) => before.includes(g)).map((g) => g.getAttribute("data-bar"));
    expect(same.sort()).toEqual(["0", "2", "3"]);
  });

  it("ends with the same drawing as a fresh render", () => {
    const a = mount();
    a.r.update(spellGroove(base), { width: a.width });
    let doc = base;
    for (const at of ["3/16", "21/16", "37/16", "53/16", "3/16"]) {
      doc = toggleHit(doc, "kick", at);
      a.r.update(spellGroove(doc), { width: a.width });
    }
    const b = mount();
    b.r.update(spellGroove(doc), { width: b.width });
    expect(canonical(a.r.canvas)).toBe(canonical(b.r.canvas));
  });

  it("does not reflow systems while the bars still fit, and redraws everything for a new width", () => {
    const { r } = mount(900);
    const first = r.update(spellGroove(base), { width: 900 });
    // Sixteenths on the off-beats of every bar make every bar wider.
    const busy = every(2, 32, 16, 1).reduce((d, at) => toggleHit(d, "tom-high", at), base);
    const second = r.update(spellGroove(busy), { width: 900 });
    const third = r.update(spellGroove(base), { width: 900 });
    expect(third.systems.map((s) => s.bars)).toEqual(second.systems.map((s) => s.bars));
    // The busier bars needed more systems; going back keeps them (a fresh drawing would not).
    expect(first.systems.length).toBeLessThan(second.systems.length);
    r.update(spellGroove(base), { width: 600 });
    expect(r.lastStats.barsDrawn).toBe(4);
  });

  it("breaks up only a system that no longer fits; the systems after it keep their bars and drawings", () => {
    const eight = groove({ bars: 8, kit: { "hihat-closed": every(1, 64, 8), snare: every(2, 16, 4, 1), kick: every(1, 8, 1) } });
    const { r } = mount(1000);
    const first = r.update(spellGroove(eight), { width: 1000 });
    const firstLine = first.systems[0]!.bars;
    expect(firstLine.length).toBeGreaterThan(1);
    // Sixteenths on the ride and the high tom all through bar 1 make it much wider.
    const busy = every(1, 16, 16).reduce((d, at, i) => toggleHit(d, i % 2 ? "tom-high" : "ride", at), eight);
    const second = r.update(spellGroove(busy), { width: 1000 });
    expect(second.systems.length).toBeGreaterThan(first.systems.length);
    // The later systems are the same bars as before, and only the first system's bars were drawn again.
    const rest = (l: typeof first, from: number) => l.systems.map((sys) => sys.bars).filter((b) => b[0]! >= from);
    expect(rest(second, firstLine.at(-1)! + 1)).toEqual(rest(first, firstLine.at(-1)! + 1));
    expect(r.lastStats.barsDrawn).toBeLessThanOrEqual(firstLine.length);
  });

  it("puts on the page exactly what the server draws, in far fewer elements", () => {
    const doc = groove({
      bars: 3,
      kit: { "hihat-closed": every(1, 24, 8), snare: ["1/4", { at: "7/16", dynamic: "ghost" }, "3/4", { at: "5/4", dynamic: "accent" }], kick: every(1, 12, 4) },
      keys: [
        { at: "0", duration: "1/2", pitch: 64 },
        { at: "1/2", duration: "3/4", pitch: 48 },
        { at: "2", duration: "1/8", pitch: 61 },
      ],
    });
    const { r } = mount(700);
    r.update(spellGroove(doc), { width: 700 });
    const server = render(doc, { width: 700 });
    // Bars in bar order, then the ties of each system.
    const groups = (root: ParentNode) => [
      ...[...root.querySelectorAll("g.tx-bar")].sort((a, b) => Number(a.getAttribute("data-bar")) - Number(b.getAttribute("data-bar"))),
      ...root.querySelectorAll("g.tx-ties"),
    ];
    const page = groups(r.canvas);
    const drawn = groups(server.doc);
    expect(page.length).toBe(drawn.length);
    expect(page.flatMap(inkOf)).toEqual(drawn.flatMap(inkOf));
    // A fraction of the elements: no <g> inside a bar, like strokes and glyphs merged, and each element keeps
    // the class of the VexFlow group it was drawn in (all noteheads and rests are in text.vf-notehead).
    expect(r.canvas.querySelectorAll("g.tx-bar g").length).toBe(0);
    expect(r.canvas.querySelectorAll("g.tx-bar *").length * 4).toBeLessThanOrEqual(server.doc.querySelectorAll("g.tx-bar *").length);
    const glyphs = (els: Iterable<Element>) => [...els].reduce((n, t) => n + (t.textContent?.length ?? 0), 0);
    expect(glyphs(r.canvas.querySelectorAll("text.vf-notehead"))).toBe(glyphs(server.doc.querySelectorAll("g.vf-notehead > text")));
  });

  it("moves the playhead overlay to the bar and beat without redrawing", () => {
    const { r, width, host } = mount();
    const layout = r.update(spellGroove(base), { width });
    const svgBefore = [...r.canvas.querySelectorAll("svg")].map((s) => s.outerHTML).join("");
    r.highlight({ bar: 2, beat: 1 });
    const bar = layout.bars.find((b) => b.bar === 2)!;
    const box = host.querySelector<HTMLElement>(".tx-playhead-bar")!;
    const line = host.querySelector<HTMLElement>(".tx-playhead-beat")!;
    expect(box.style.display).toBe("block");
    expect(box.style.transform).toContain(`translate(${bar.x0}px`);
    expect(box.style.width).toBe(`${bar.x1 - bar.x0}px`);
    expect(line.style.transform).toContain(`translate(${bar.beats[1]! - 1}px`);
    expect([...r.canvas.querySelectorAll("svg")].map((s) => s.outerHTML).join("")).toBe(svgBefore);
    r.highlight(null);
    expect(box.style.display).toBe("none");
  });
});
