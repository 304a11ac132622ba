/**
 * Incremental spelling for the live notation (src/components/notation/respell.ts): after any edit the result
 * must equal spelling the whole groove again (`spellGroove`), and after a kit edit the bars it did not touch
 * must be the very same objects (the renderer keys its work by bar object).
 */
import { describe, expect, it } from "vitest";
import { changedKitBars, respell } from "../../../src/components/notation/respell";
import {
  addKeyNote,
  changeTempo,
  cycleDynamic,
  insertBar,
  paintRun,
  removeLane,
  setArticulation,
  spellGroove,
  toggleHit,
  type GrooveDocument,
} from "../../../src/lib/rhythm";
import { every, groove } from "./svg";

const base = groove({
  bars: 4,
  kit: { "hihat-closed": every(1, 32, 8), snare: ["1/4", "3/4", "5/4", "7/4", "9/4", "11/4", "13/4", "15/4"], kick: every(1, 4, 1) },
  keys: [
    { at: "0", duration: "1/2", pitch: 60 },
    { at: "3/4", duration: "1/2", pitch: 64 }, // tied over the first bar line
  ],
});

describe("respell", () => {
  it("equals spelling the whole groove after each of a run of edits", () => {
    const edits: ((d: GrooveDocument) => GrooveDocument)[] = [
      (d) => toggleHit(d, "snare", "19/16"),
      (d) => toggleHit(d, "snare", "19/16"),
      (d) => cycleDynamic(d, "snare", "1/4"),
      (d) => setArticulation(d, "hihat-closed", "3/8", "open"),
      (d) => paintRun(d, "kick", "1/16", "31/16", "on"), // bars 1 and 2
      (d) => toggleHit(d, "kick", "63/16"),
      (d) => addKeyNote(d, { at: "2", pitch: 67 }),
      (d) => changeTempo(d, { bpm: "120" }).doc,
      (d) => insertBar(d, 1),
      (d) => removeLane(d, "kick").doc,
      (d) => toggleHit(d, "snare", "0"),
    ];
    let prev = { doc: base, score: spellGroove(base) };
    for (const edit of edits) {
      const doc = edit(prev.doc);
      const score = respell(prev, doc);
      expect(score).toEqual(spellGroove(doc));
      prev = { doc, score };
    }
  });

  it("keeps the bar objects a kit edit did not touch", () => {
    const score = spellGroove(base);
    const doc = toggleHit(base, "snare", "19/16"); // bar 2 (0-based 1)
    expect(changedKitBars(base, doc)).toEqual([1]);
    const next = respell({ doc: base, score }, doc);
    expect(next.bars.map((b, i) => b === score.bars[i])).toEqual([true, false, true, true]);
    expect(respell({ doc, score: next }, doc)).toBe(next);
  });

  it("spells everything again when more than kit hits changed", () => {
    expect(changedKitBars(base, changeTempo(base, { bpm: "100" }).doc)).toBeNull();
    expect(changedKitBars(base, addKeyNote(base, { at: "1", pitch: 62 }))).toBeNull();
    expect(changedKitBars(base, insertBar(base, 0))).toBeNull();
  });
});
