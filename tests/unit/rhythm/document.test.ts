/**
 * The groove document. Sources: Tactus's own document rules (the README's "Groove document" section: exact
 * rationals, positions inside the groove and on the grid, durations > 0, MIDI pitches 0–127, known kit
 * pieces, grids that divide the bar, sections that tile the bars); MIDI 1.0 (7-bit note numbers and
 * velocities); General MIDI Level 1 percussion key map (MMA RP003) for the kit's GM notes.
 */
import { fc, test } from "@fast-check/vitest";
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

  it.each([
    [{ bars: 0 }, "bars", "a groove has 1 to 4096 bars"],
    [{ meter: { beatsPerBar: 0, beatUnit: 4 } }, "meter.beatsPerBar", "beats per bar must be from 1 to 32"],
    [{ swing: { unit: "1/8", ratio: 0.9 } }, "swing.ratio", "swing must be between 0.5 (straight) and 0.75"],
    [{ keys: { notes: [{ at: "0", duration: "1/4", pitch: 60, velocity: 0 }], splitPitch: 60 } }, "keys.notes.0.velocity", "velocity must be a whole number from 1 to 127 (MIDI note-on velocity)"],
    [{ sections: [{ name: "A", startBar: 0, bars: 1, repeats: 65 }] }, "sections.0.repeats", "a section plays from 1 to 64 times"],
    [{ tempo: { bpm: "fast", beatNote: "1/4" } }, "tempo.bpm", "must be a rational such as 3/16 or 2"],
    [{ schemaVersion: 2 }, "schemaVersion", "schemaVersion must be 1"],
  ])("says what is wrong with %j in plain words", (patch, path, message) => {
    const r = parseGroove({ ...base(), ...patch });
    expect(r.ok ? [] : r.issues).toContainEqual({ path, message });
  });

  it("answers a malformed document with issues, never by throwing (the musical checks wait for a valid shape)", () => {
    // A tempo that is not a rational used to reach the musical checks and throw inside fraction.js.
    const r = parseGroove({ ...base(), tempo: { bpm: "abc", beatNote: "1/4" }, grid: { step: "0" } });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.issues.map((i) => i.path)).toEqual(["tempo.bpm", "grid.step"]);
  });

  test.prop([fc.anything()])("never throws on any JSON-like input", (input) => {
    expect(() => parseGroove(input)).not.toThrow();
  });

  test.prop([fc.constantFrom("tempo.bpm", "tempo.beatNote", "grid.step", "swing.unit", "keys.notes.0.at", "keys.notes.0.duration", "kit.lanes.0.hits.0.at", "bars", "kit.lanes", "meter.grouping"), fc.anything()])(
    "never throws when one field of a valid document is replaced by anything",
    (path, junk) => {
      const doc = structuredClone(base()) as Record<string, unknown>;
      const keys = path.split(".");
      let at: Record<string, unknown> = doc;
      for (const k of keys.slice(0, -1)) at = at[k] as Record<string, unknown>;
      at[keys[keys.length - 1]!] = junk;
      expect(() => parseGroove(doc)).not.toThrow();
    },
  );

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
