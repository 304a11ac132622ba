import { describe, expect, it } from "vitest";
import { emptyGroove, parseGroove, playOrder, KIT_PIECES, KIT_PIECE_IDS } from "../../../src/lib/rhythm";

const base = () => ({
  ...emptyGroove(),
  bars: 2,
  kit: { lanes: [{ piece: "snare", hits: [{ at: "1/4" }, { at: "3/4", dynamic: "accent" }] }] },
  keys: { notes: [{ at: "7/16", duration: "3/16", pitch: 64, velocity: 80 }], splitPitch: 60 },
});

describe("groove document", () => {
  it("accepts a valid document and fills defaults", () => {
    const r = parseGroove(base());
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.doc.kit.lanes[0]?.hits[0]?.dynamic).toBe("normal");
  });

  it("canonicalises rationals and accepts decimal tempo exactly", () => {
    const r = parseGroove({ ...base(), tempo: { bpm: 75.5, beatNote: "2/8" } });
    expect(r.ok && r.doc.tempo).toEqual({ bpm: "151/2", beatNote: "1/4" });
  });

  it.each([
    [{ kit: { lanes: [{ piece: "snare", hits: [{ at: "2" }] }] } }, "kit.lanes.0.hits.0.at", /outside the groove/],
    [{ kit: { lanes: [{ piece: "snare", hits: [{ at: "-1/4" }] }] } }, "kit.lanes.0.hits.0.at", /outside the groove/],
    [{ kit: { lanes: [{ piece: "snare", hits: [{ at: "1/32" }] }] } }, "kit.lanes.0.hits.0.at", /not on the 1\/16 grid/],
    [{ kit: { lanes: [{ piece: "gong", hits: [] }] } }, "kit.lanes.0.piece", /unknown kit piece/],
    [{ keys: { notes: [{ at: "0", duration: "0", pitch: 60 }] } }, "keys.notes.0.duration", /greater than 0/],
    [{ keys: { notes: [{ at: "0", duration: "1/4", pitch: 128 }] } }, "keys.notes.0.pitch", /0 to 127/],
    [{ keys: { notes: [{ at: "7/4", duration: "1/2", pitch: 60 }] } }, "keys.notes.0.duration", /runs past the end/],
    [{ grid: { step: "1/12" }, meter: { beatsPerBar: 5, beatUnit: 16 } }, "grid.step", /does not divide/],
    [{ meter: { beatsPerBar: 7, beatUnit: 8, grouping: [2, 2, 2] } }, "meter.grouping", /adds up to 6/],
    [{ sections: [{ name: "A", startBar: 1, bars: 1, repeats: 1 }] }, "sections.0.startBar", /starts at bar 2/],
  ])("rejects %j naming the field", (patch, path, message) => {
    const r = parseGroove({ ...base(), ...patch });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      const hit = r.issues.find((i) => i.path === path);
      expect(hit, JSON.stringify(r.issues)).toBeDefined();
      expect(hit!.message).toMatch(message);
    }
  });

  it("plays sections in order with their repeats", () => {
    const r = parseGroove({
      ...base(),
      bars: 3,
      sections: [
        { name: "Intro", startBar: 0, bars: 1, repeats: 2 },
        { name: "Verse", startBar: 1, bars: 2, repeats: 1 },
      ],
    });
    expect(r.ok && playOrder(r.doc)).toEqual([0, 0, 1, 2]);
  });

  it("maps every kit piece to a General MIDI Level 1 percussion key", () => {
    // General MIDI System Level 1 percussion key map (MMA RP003): defined range 35–81.
    for (const id of KIT_PIECE_IDS) {
      expect(KIT_PIECES[id].gmNote).toBeGreaterThanOrEqual(35);
      expect(KIT_PIECES[id].gmNote).toBeLessThanOrEqual(81);
    }
    // GM1: 36 Bass Drum 1, 38 Acoustic Snare, 42 Closed Hi-Hat, 46 Open Hi-Hat, 44 Pedal Hi-Hat, 37 Side Stick.
    expect([KIT_PIECES.kick.gmNote, KIT_PIECES.snare.gmNote, KIT_PIECES["hihat-closed"].gmNote]).toEqual([36, 38, 42]);
    expect([KIT_PIECES["hihat-open"].gmNote, KIT_PIECES["hihat-foot"].gmNote, KIT_PIECES["cross-stick"].gmNote]).toEqual([46, 44, 37]);
    expect(new Set(Object.values(KIT_PIECES).map((p) => p.gmNote)).size).toBe(KIT_PIECE_IDS.length);
  });
});
