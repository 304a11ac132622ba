/**
 * The notation renderer (src/adapters/vexflow) drawing on the server: jsdom for the DOM, text measured from
 * the Bravura and Academico font files. Each check reads the SVG that is sent to browsers.
 *
 * Sources named beside the checks:
 * - [PAS] N. Weinberg, "Guide to Standardized Drumset Notation" (Percussive Arts Society, 1998), as followed by
 *   published teaching texts (verified in the project's reference notes): bass drum in the bottom space (F4),
 *   snare in the third space (C5), hi-hat in the space above the staff (G5) with an x notehead, ride on the
 *   top line with an x, crash on the first ledger line above; hands stems up, feet stems down.
 * - [SMuFL] the Bravura font's own metadata (glyph advance widths, in staff spaces) shipped in
 *   @vexflow-fonts/bravura/metadata.json, and SMuFL code points.
 * - [common practice] facts of the trade.
 */
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { describe, expect, it } from "vitest";
import { measuringCanvas, parseCssFont } from "../../../src/adapters/vexflow/text-metrics";
import { notationFontFiles } from "../../../src/adapters/vexflow/server";
import { assertGroove, spellGroove, type NoteEvent, type VoiceEvent } from "../../../src/lib/rhythm";
import { GLYPH, every, glyphs, groove, heads, render, staffLines, stems } from "./svg";

/** The rock beat of countless method books: hi-hat eighths, snare on 2 and 4, bass drum on 1 and 3. */
const rockBeat = groove({
  kit: {
    "hihat-closed": every(1, 8, 8),
    snare: ["1/4", "3/4"],
    kick: ["0", "1/2"],
  },
});

const count = (list: readonly { glyph: string }[], glyph: string) => list.filter((g) => g.glyph === glyph).length;

describe("a rock beat on the percussion staff", () => {
  const r = render(rockBeat);
  const hs = heads(r);
  const [kitLines] = staffLines(r, 0) as [number[]];
  const top = kitLines[0]!;

  it("draws one percussion clef and a 4/4 time signature", () => {
    expect(count(glyphs(r), GLYPH.percussionClef)).toBe(1);
    expect(r.doc.querySelectorAll("g.vf-timesignature").length).toBe(1);
  });

  it("draws every note and rest of both voices", () => {
    // Hands: eight eighths (two of them hi-hat + snare chords). Feet: quarter, quarter rest, quarter, quarter rest.
    expect(r.doc.querySelectorAll("g.vf-stavenote").length).toBe(8 + 4);
    // [PAS] x noteheads for the hi-hat, normal heads for snare and bass drum.
    expect(count(hs, GLYPH.noteheadXBlack)).toBe(8);
    expect(count(hs, GLYPH.noteheadBlack)).toBe(4);
    expect(count(glyphs(r), GLYPH.restQuarter)).toBe(2);
  });

  it("puts bass drum, snare and hi-hat on the drum-set guide's staff positions [PAS]", () => {
    // Five lines a staff space (10 px) apart; a space's centre is 5 px from its lines.
    expect(kitLines.map((y) => y - top)).toEqual([0, 10, 20, 30, 40]);
    const ys = (glyph: string) => [...new Set(hs.filter((h) => h.glyph === glyph).map((h) => h.y - top))].sort((a, b) => a - b);
    // Hi-hat G5: the space above the top line. Snare C5: third space. Bass drum F4: bottom space.
    expect(ys(GLYPH.noteheadXBlack)).toEqual([-5]);
    expect(ys(GLYPH.noteheadBlack)).toEqual([15, 35]);
  });

  it("stems the hands up and the feet down [PAS]", () => {
    const all = stems(r);
    const kick = all.filter((s) => s.base - top === 35);
    const hands = all.filter((s) => s.base - top !== 35);
    expect(kick.length).toBe(2);
    expect(kick.every((s) => s.dir === "down")).toBe(true);
    expect(hands.length).toBe(8);
    expect(hands.every((s) => s.dir === "up")).toBe(true);
  });

  it("beams the eighths by the beat, as the notation model groups them [common practice]", () => {
    const beamIds = new Set(spellGroove(rockBeat).bars[0]!.kit.up.flatMap((e) => (e.kind === "note" && e.beam ? [e.beam] : [])));
    expect(beamIds.size).toBe(4);
    const beams = [...r.doc.querySelectorAll("g.vf-beam")];
    expect(beams.length).toBe(beamIds.size);
    // Two stems under each beam.
    expect(beams.map((b) => b.querySelectorAll("g.vf-stem").length)).toEqual([2, 2, 2, 2]);
  });

  it("draws in currentColor only, so inline SVG follows the page's light or dark theme", () => {
    const colours = [...r.svg.matchAll(/\b(?:fill|stroke)="([^"]+)"/g)].map((m) => m[1]);
    expect(new Set(colours)).toEqual(new Set(["currentColor", "none"]));
    expect(r.svg).not.toMatch(/black|#[0-9a-f]{3,6}\b/i);
  });

  it("names the drawing for assistive technology", () => {
    expect(r.root.getAttribute("role")).toBe("img");
    expect(r.root.getAttribute("aria-label")).toBe("Notation: 4/4, 96 bpm, 1 bar, drum kit");
  });
});

describe("beams are the model's, never VexFlow's own grouping", () => {
  it("6/8 grouped 2+2+2 by the document gets three beams of two, not the 3+3 default of 6/8", () => {
    const doc = groove({ meter: { beatsPerBar: 6, beatUnit: 8, grouping: [2, 2, 2] }, kit: { ride: every(1, 6, 8) } });
    const r = render(doc);
    const model = spellGroove(doc).bars[0]!.kit.up as readonly VoiceEvent[];
    const groups = new Map<number, number>();
    for (const e of model) if (e.kind === "note" && e.beam) groups.set(e.beam, (groups.get(e.beam) ?? 0) + 1);
    expect([...groups.values()]).toEqual([2, 2, 2]);
    const beams = [...r.doc.querySelectorAll("g.vf-beam")].map((b) => b.querySelectorAll("g.vf-stem").length);
    expect(beams).toEqual([...groups.values()]);
  });

  it("keeps a rest between two notes of a beat under the beam (stems of the beam = notes of the group)", () => {
    // Sixteenths: note, rest, rest, note in beat 1 → one beam over two notes.
    const doc = groove({ kit: { snare: ["0", "3/16"] } });
    const r = render(doc);
    const up = spellGroove(doc).bars[0]!.kit.up.filter((e): e is NoteEvent => e.kind === "note");
    expect(up.map((e) => e.beam)).toEqual([1, 1]);
    const beams = [...r.doc.querySelectorAll("g.vf-beam")];
    expect(beams.length).toBe(1);
    expect(beams[0]!.querySelectorAll("g.vf-stem").length).toBe(2);
  });
});

describe("marks and noteheads", () => {
  it("draws accents, ghost-note parentheses, the open hi-hat circle and the cross-stick head", () => {
    const doc = groove({
      kit: {
        "hihat-closed": [{ at: "0", dynamic: "accent" }],
        "hihat-open": ["1/4"],
        snare: [{ at: "1/2", dynamic: "ghost" }],
        "cross-stick": ["3/4"],
      },
    });
    const g = glyphs(render(doc));
    expect(count(g, GLYPH.accent)).toBe(1);
    expect(count(g, GLYPH.openMark)).toBe(1);
    expect(count(g, GLYPH.parenthesisLeft)).toBe(1);
    expect(count(g, GLYPH.noteheadCircleX)).toBe(1);
  });

  it("writes triplet eighths with a tuplet number", () => {
    const doc = groove({ grid: "1/12", kit: { ride: every(1, 12, 12) } });
    const r = render(doc);
    expect(r.doc.querySelectorAll("g.vf-tuplet").length).toBe(4);
  });

  it("draws an empty bar as one whole rest", () => {
    const r = render(groove({ bars: 2, kit: { snare: ["1/4"] } }));
    const rests = glyphs(r).filter((g) => g.glyph === GLYPH.restWhole);
    expect(rests.map((g) => g.bar)).toEqual([1]);
  });
});

describe("the keys grand staff", () => {
  const doc = groove({
    kit: { kick: ["0"] },
    keys: [
      { at: "0", duration: "1/2", pitch: 61 }, // C#4: treble staff, with a sharp
      { at: "0", duration: "1/2", pitch: 64 },
      { at: "1/2", duration: "1/2", pitch: 43 }, // G2: bass staff
    ],
  });
  const r = render(doc);

  it("joins treble and bass staves with a brace under the kit staff", () => {
    const g = glyphs(r);
    expect(count(g, GLYPH.trebleClef)).toBe(1);
    expect(count(g, GLYPH.bassClef)).toBe(1);
    expect(r.doc.querySelectorAll("g.vf-stave").length).toBe(3);
    // One connector group per bar: bar line through both keys staves, and at the system start the brace and
    // the system's opening line through all three staves.
    const connectors = r.doc.querySelectorAll("g.vf-staveconnector");
    expect(connectors.length).toBe(1);
    const [kit, , bass] = staffLines(r, 0) as [number[], number[], number[]];
    const spans = [...connectors[0]!.querySelectorAll("rect")].map((rect) => [Number(rect.getAttribute("y")), Number(rect.getAttribute("y")) + Number(rect.getAttribute("height"))]);
    expect(spans.some(([y0, y1]) => Math.abs(y0! - kit[0]!) <= 1 && Math.abs(y1! - bass[4]!) <= 2)).toBe(true);
    expect([...connectors[0]!.querySelectorAll("path")].some((p) => /C/.test(p.getAttribute("d") ?? ""))).toBe(true);
    expect(count(g, GLYPH.sharp)).toBe(1);
  });

  it("ties a held note across the bar line, or with two half ties across a system break [common practice]", () => {
    // A G4 held from beat 4 of bar 1 into bar 2: tied across the bar line.
    const held = groove({ bars: 2, kit: { kick: ["0", "1"] }, keys: [{ at: "3/4", duration: "1/2", pitch: 67 }] });
    const oneSystem = render(held, { width: 1000 });
    expect(oneSystem.layout.systems.length).toBe(1);
    const ties = [...oneSystem.doc.querySelectorAll("g.tx-ties g.vf-stavetie path")];
    expect(ties.length).toBe(1);
    const xs = (ties[0]!.getAttribute("d") ?? "").match(/-?\d+(?:\.\d+)?/g)!.map(Number).filter((_, i) => i % 2 === 0);
    const [bar1, bar2] = oneSystem.layout.bars;
    // From bar 1's last note to bar 2's first note, over the bar line.
    expect(Math.min(...xs)).toBeLessThan(bar1!.x1);
    expect(Math.max(...xs)).toBeGreaterThan(bar2!.x0);
    const twoSystems = render(held, { width: 1000, maxBarsPerSystem: 1 });
    expect(twoSystems.layout.systems.length).toBe(2);
    const halves = [...twoSystems.doc.querySelectorAll("g.tx-ties")].map((g) => g.querySelectorAll("g.vf-stavetie").length);
    expect(halves).toEqual([1, 1]);
  });

  it("can leave the keys out", () => {
    const kitOnly = render(doc, { showKeys: false });
    expect(kitOnly.doc.querySelectorAll("g.vf-stave").length).toBe(1);
    expect(kitOnly.layout.height).toBeLessThan(r.layout.height);
  });
});

describe("systems, wrapping and layout", () => {
  const eight = groove({ bars: 8, kit: { "hihat-closed": every(1, 64, 8), snare: every(1, 16, 2, 0).map((_, i) => `${2 * i + 1}/4`), kick: every(1, 8, 1) } });

  it("wraps bars into more systems for a narrower width", () => {
    const wide = render(eight, { width: 1400 });
    const narrow = render(eight, { width: 600 });
    expect(wide.layout.systems.length).toBeGreaterThanOrEqual(2);
    expect(narrow.layout.systems.length).toBeGreaterThan(wide.layout.systems.length);
    expect(narrow.doc.querySelectorAll("g.tx-system").length).toBe(narrow.layout.systems.length);
    // Every system starts with a clef and a bar number (1-based).
    expect(count(glyphs(narrow), GLYPH.percussionClef)).toBe(narrow.layout.systems.length);
    const firstBars = narrow.layout.systems.map((s) => s.bars[0]! + 1);
    const numbers = [...narrow.doc.querySelectorAll("g.vf-barnumber text")].map((t) => t.textContent);
    expect(numbers).toEqual(firstBars.map(String));
  });

  it("gives each bar its system, x range and one x per beat, inside the bar and in time order", () => {
    const { layout } = render(eight, { width: 900 });
    expect(layout.bars.map((b) => b.bar)).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
    for (const b of layout.bars) {
      expect(b.beats.length).toBe(4);
      expect(b.beats[0]).toBeGreaterThanOrEqual(b.noteStartX - 1);
      for (let i = 1; i < 4; i++) expect(b.beats[i]).toBeGreaterThan(b.beats[i - 1]!);
      expect(b.beats[3]).toBeLessThan(b.x1);
    }
    const ys = layout.systems.map((s) => s.y);
    expect([...ys].sort((a, b) => a - b)).toEqual(ys);
  });

  it("counts beats as the playhead does: two dotted quarters in 6/8, 2+2+3 in 7/8 [common practice]", () => {
    const sixEight = render(groove({ meter: { beatsPerBar: 6, beatUnit: 8 }, kit: { ride: every(1, 6, 8) } }));
    const [b68] = sixEight.layout.bars;
    expect(b68!.beats.length).toBe(2);
    // The second counted beat is the fourth eighth: where the fourth ride note stands.
    const ride = heads(sixEight).filter((h) => h.glyph === GLYPH.noteheadXBlack).map((h) => h.x).sort((a, b) => a - b);
    expect(Math.abs(b68!.beats[1]! - ride[3]!)).toBeLessThan(2);
    const sevenEight = render(groove({ meter: { beatsPerBar: 7, beatUnit: 8 }, kit: { ride: every(1, 7, 8) } }));
    expect(sevenEight.layout.bars[0]!.beats.length).toBe(3);
  });

  it("draws a range of bars (fromBar, toBar) with their own bar numbers", () => {
    const r = render(eight, { fromBar: 2, toBar: 5 });
    expect(r.layout.bars.map((b) => b.bar)).toEqual([2, 3, 4]);
    expect(r.doc.querySelector("g.tx-bar")?.getAttribute("data-bar")).toBe("2");
  });

  it("prints the tempo and section names on the first system", () => {
    const withSection = groove({ bars: 2, kit: { snare: ["1/4"] }, sections: [{ name: "Chorus", startBar: 0, bars: 2, repeats: 2 }] });
    const texts = glyphs(render(withSection)).map((g) => g.glyph);
    expect(texts).toContain("Chorus x2");
    expect(texts.some((t) => t.includes("96"))).toBe(true);
  });

  it("marks swing after the tempo (the long note's share of each pair, 2/3 = triplet swing)", () => {
    const swung = assertGroove({ ...groove({ kit: { ride: every(1, 8, 8) } }), swing: { unit: "1/8", ratio: 2 / 3 } });
    expect(glyphs(render(swung)).map((g) => g.glyph)).toContain("Swung 8ths 67%");
    expect(glyphs(render(rockBeat)).some((g) => g.glyph.startsWith("Swung"))).toBe(false);
  });

  it("scales a phone-width drawing down instead of crushing the bars", () => {
    const phone = render(eight, { width: 320 });
    expect(phone.layout.width).toBe(320);
    expect(phone.layout.scale).toBeLessThan(1);
    expect(phone.root.getAttribute("width")).toBe("320");
    expect(phone.layout.bars.every((b) => b.x1 <= 320 + 0.5)).toBe(true);
  });
});

describe("text measurement from the font files", () => {
  const require = createRequire(import.meta.url);
  const fontkit = require("fontkit") as { create(b: Uint8Array): never };
  const files = notationFontFiles();
  const canvas = measuringCanvas({
    bravura: { normal: fontkit.create(readFileSync(files.bravura)) },
    academico: { normal: fontkit.create(readFileSync(files.academico)) },
  });
  const ctx = canvas.getContext("2d");
  const metadata = JSON.parse(readFileSync(files.bravura.replace(/bravura\.otf$/, "metadata.json"), "utf8")) as {
    glyphAdvanceWidths: Record<string, number>;
  };

  it("gives SMuFL glyphs their advance width from Bravura's metadata [SMuFL]", () => {
    // At 30pt = 40 px the em is four staff spaces: one staff space is 10 px.
    ctx.font = "30pt Bravura,Academico";
    expect(ctx.measureText(GLYPH.noteheadBlack).width).toBeCloseTo(metadata.glyphAdvanceWidths.noteheadBlack! * 10, 5);
    expect(ctx.measureText(GLYPH.noteheadXBlack).width).toBeCloseTo(metadata.glyphAdvanceWidths.noteheadXBlack! * 10, 5);
  });

  it("falls back to Academico for letters Bravura lacks, as a browser's font fallback does", () => {
    ctx.font = "10pt Bravura,Academico";
    const mixed = ctx.measureText("Verse").width;
    ctx.font = "10pt Academico";
    expect(mixed).toBeCloseTo(ctx.measureText("Verse").width, 5);
    expect(mixed).toBeGreaterThan(0);
  });

  it("reads CSS font shorthands as VexFlow writes them", () => {
    expect(parseCssFont("bold 10pt Academico")).toEqual({ sizePx: 10 * (4 / 3), bold: true, families: ["academico"] });
    expect(parseCssFont("30pt Bravura,Academico").families).toEqual(["bravura", "academico"]);
  });
});
