/**
 * The tables behind notation spelling: note values (checked against @tonaljs/duration-value, a general-purpose
 * music-theory package, as an oracle), the drum-set staff (PAS), pitch spelling and default groupings.
 */
import * as durationValue from "@tonaljs/duration-value";
import { describe, expect, it } from "vitest";
import {
  Fraction,
  KIT_PIECES,
  KIT_PIECE_IDS,
  KIT_STAFF,
  NOTE_TYPES,
  chooseAccidentals,
  kitVoice,
  beatGrouping,
  noteValueOf,
  spellMidi,
  staffIndex,
  valueLength,
  type NoteType,
} from "../../../src/lib/rhythm";
import { makeTimebase } from "../../../src/lib/rhythm/notation/timebase";

/** Our MusicXML type names → tonal's names (tonal has no 512th/1024th). */
const TONAL_NAME: Partial<Record<NoteType, string>> = {
  whole: "whole",
  half: "half",
  quarter: "quarter",
  eighth: "eighth",
  "16th": "sixteenth",
  "32nd": "thirty-second",
  "64th": "sixty-fourth",
  "128th": "hundred twenty-eighth",
  "256th": "two hundred fifty-sixth",
};

const tonal = (name: string) => {
  const [n, d] = durationValue.fraction(name);
  return new Fraction(n, d);
};

describe("note values against @tonaljs/duration-value", () => {
  for (const [type, name] of Object.entries(TONAL_NAME) as [NoteType, string][]) {
    for (const dots of [0, 1, 2] as const) {
      it(`${type}${".".repeat(dots)} = tonal "${name}${".".repeat(dots)}"`, () => {
        const oracle = tonal(name + ".".repeat(dots));
        expect(valueLength({ type, dots }).equals(oracle)).toBe(true);
        expect(noteValueOf(oracle, 2)).toEqual({ type, dots });
      });
    }
  }

  it("gives triplets two thirds of the plain value (three in the time of two: common practice)", () => {
    const triplet = { actual: 3, normal: 2 };
    expect(valueLength({ type: "eighth", dots: 0 }, triplet).equals(tonal("eighth").mul(2, 3))).toBe(true);
    expect(valueLength({ type: "quarter", dots: 0 }, triplet).toFraction()).toBe("1/6");
    expect(valueLength({ type: "16th", dots: 0 }, triplet).equals(tonal("sixteenth").mul(2, 3))).toBe(true);
    expect(valueLength({ type: "16th", dots: 0 }, { actual: 5, normal: 4 }).toFraction()).toBe("1/20");
  });

  it("finds no value for lengths that are not plain or dotted", () => {
    expect(noteValueOf("5/16")).toBeNull();
    expect(noteValueOf("1/12")).toBeNull();
    expect(noteValueOf("7/16")).toBeNull(); // double-dotted quarter: only with maxDots 2
    expect(noteValueOf("7/16", 2)).toEqual({ type: "quarter", dots: 2 });
  });

  it("lists MusicXML note-type names from whole down, each once", () => {
    expect(new Set(NOTE_TYPES).size).toBe(NOTE_TYPES.length);
    expect(NOTE_TYPES.slice(0, 7)).toEqual(["whole", "half", "quarter", "eighth", "16th", "32nd", "64th"]);
  });
});

describe("drum-set staff positions", () => {
  const pos = (id: keyof typeof KIT_STAFF) => {
    const e = KIT_STAFF[id];
    return `${e.step}${e.octave} ${e.notehead}`;
  };

  it("places the kit as the PAS guide does (Weinberg 1998, verified in published teaching texts)", () => {
    expect(pos("kick")).toBe("F4 normal"); // bottom space
    expect(pos("tom-floor")).toBe("A4 normal"); // second space
    expect(pos("snare")).toBe("C5 normal"); // third space
    expect(pos("tom-high")).toBe("E5 normal"); // top space
    expect(pos("ride")).toBe("F5 x"); // top line, x
    expect(pos("hihat-closed")).toBe("G5 x"); // space above the staff, x
    expect(pos("crash")).toBe("A5 x"); // first ledger line above, x
    // hi-hat with the foot: an x below the staff (bottom line is E4)
    expect(KIT_STAFF["hihat-foot"].notehead).toBe("x");
    expect(staffIndex(KIT_STAFF["hihat-foot"].step, KIT_STAFF["hihat-foot"].octave)).toBeLessThan(staffIndex("E", 4));
  });

  it("places the pieces the reference notes give from memory as remembered (marked so)", () => {
    expect(pos("tom-mid")).toBe("D5 normal"); // fourth line, from memory
    expect(pos("hihat-foot")).toBe("D4 x"); // from memory
    expect(pos("cross-stick")).toBe("C5 circle-x"); // snare space, circled x: from memory
    expect(KIT_STAFF["hihat-open"].open).toBe(true); // "o" above: from memory
    for (const id of ["tom-mid", "hihat-foot", "cross-stick", "hihat-open"] as const) expect(KIT_STAFF[id].source).toBe("memory");
  });

  it("has one entry per kit piece, each with a unique position, notehead and open mark", () => {
    expect(Object.keys(KIT_STAFF).sort()).toEqual([...KIT_PIECE_IDS].sort());
    const keys = KIT_PIECE_IDS.map((id) => `${pos(id)} ${KIT_STAFF[id].open ? "open" : ""}`);
    expect(new Set(keys).size).toBe(keys.length);
  });

  it("marks the Tactus conventions as such", () => {
    for (const id of ["ride-bell", "clap", "tambourine", "cowbell"] as const) expect(KIT_STAFF[id].source).toBe("Tactus");
  });

  it("writes hands in the upper voice and feet in the lower (PAS: hands stems up, feet stems down)", () => {
    for (const id of KIT_PIECE_IDS) expect(kitVoice(id)).toBe(KIT_PIECES[id].limb === "foot" ? "down" : "up");
    expect(kitVoice("kick")).toBe("down");
    expect(kitVoice("hihat-foot")).toBe("down");
    expect(kitVoice("snare")).toBe("up");
  });
});

describe("pitch spelling", () => {
  it("spells MIDI 60 as C4 and 69 as A4 (MIDI convention, common practice: middle C = C4, A440 = 69)", () => {
    expect(spellMidi(60)).toEqual({ step: "C", alter: 0, octave: 4 });
    expect(spellMidi(69)).toEqual({ step: "A", alter: 0, octave: 4 });
    expect(spellMidi(21)).toEqual({ step: "A", alter: 0, octave: 0 }); // lowest piano key
    expect(spellMidi(108)).toEqual({ step: "C", alter: 0, octave: 8 }); // highest piano key
    expect(spellMidi(0)).toEqual({ step: "C", alter: 0, octave: -1 });
  });

  it("uses sharps by default and flats on request, the same key either way", () => {
    expect(spellMidi(61)).toEqual({ step: "C", alter: 1, octave: 4 });
    expect(spellMidi(61, "flats")).toEqual({ step: "D", alter: -1, octave: 4 });
    for (let m = 0; m < 128; m++) {
      const semis = { C: 0, D: 2, E: 4, F: 5, G: 7, A: 9, B: 11 };
      for (const acc of ["sharps", "flats"] as const) {
        const p = spellMidi(m, acc);
        expect((p.octave + 1) * 12 + semis[p.step] + p.alter).toBe(m);
      }
    }
  });

  it("chooses flats for flat-key material and sharps otherwise", () => {
    expect(chooseAccidentals([70, 62, 63, 65, 67, 69, 70, 74])).toBe("flats"); // B♭ major scale
    expect(chooseAccidentals([67, 69, 71, 72, 74, 76, 78])).toBe("sharps"); // G major scale
    expect(chooseAccidentals([60, 62, 64])).toBe("sharps"); // no black keys: sharps (the default)
    expect(chooseAccidentals([])).toBe("sharps");
  });
});

describe("groupings", () => {
  // [OU 3.6] beam by the beat in simple meters, by dotted beats in compound meters; odd meters by twos with
  // a final three (E. Gould, "Behind Bars", 2011, from memory).
  it("groups simple meters by the beat, compound by threes, odd eighths by twos and a final three", () => {
    expect(beatGrouping({ beatsPerBar: 4, beatUnit: 4 })).toEqual([1, 1, 1, 1]);
    expect(beatGrouping({ beatsPerBar: 6, beatUnit: 8 })).toEqual([3, 3]);
    expect(beatGrouping({ beatsPerBar: 12, beatUnit: 8 })).toEqual([3, 3, 3, 3]);
    expect(beatGrouping({ beatsPerBar: 7, beatUnit: 8 })).toEqual([2, 2, 3]);
    expect(beatGrouping({ beatsPerBar: 5, beatUnit: 8 })).toEqual([2, 3]);
    expect(beatGrouping({ beatsPerBar: 7, beatUnit: 8, grouping: [3, 2, 2] })).toEqual([3, 2, 2]);
  });
});

describe("the spelling timebase", () => {
  it("turns grid positions into whole ticks and back, exactly", () => {
    const tb = makeTimebase("1/24", 4);
    expect(tb.D % 24).toBe(0);
    for (const r of ["0", "1/24", "3/16", "2", "-1/8", "1001/24", "5/2"]) expect(tb.rational(tb.ticks(r))).toBe(r);
    expect(tb.ticks("1/4") * 4).toBe(tb.D);
  });

  it("refuses positions that are not on the grid or not rationals", () => {
    const tb = makeTimebase("1/16", 4);
    expect(() => tb.ticks("1/7")).toThrow(/not on the 1\/16 grid/);
    expect(() => tb.ticks("1/")).toThrow();
    expect(() => tb.ticks("abc")).toThrow();
    expect(() => tb.ticks("")).toThrow();
  });
});
