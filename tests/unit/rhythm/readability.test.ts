/**
 * Readability figures of a document. Sources, named beside each check: Longuet-Higgins & Lee (1984) and
 * Gómez, Melvin, Rappaport & Toussaint (2005) for the syncopation measures (REFERENCES.md); common practice
 * for the rock beat (snare on 2 and 4, kick on 1) and the backbeat on the weak beats; the usual tempo range
 * (60–180 bpm) from memory; the notation counts follow Tactus's own spelling rules (notation/spell.ts).
 */
import { fc, test } from "@fast-check/vitest";
import { describe, expect, it } from "vitest";
import {
  barLength,
  countNotation,
  displace,
  figureInput,
  figuresFrom,
  q,
  rotateFigureInput,
  lhlSyncopation,
  metricalHierarchy,
  readabilityFigures,
  USUAL_TEMPO_RANGE,
  type NotationScore,
} from "../../../src/lib/rhythm";
import { loopArb } from "./arbitraries";
import { groove, hits, rockBeat } from "./grooves";


describe("readability figures", () => {
  it("sees the backbeat on 2 and 4 and the kick on 1 in a plain rock beat", () => {
    // Common practice: snare on beats 2 and 4, kick on the downbeat.
    const f = readabilityFigures(rockBeat());
    expect(f.backbeat).toEqual({ beats: [2, 4], barsWithBackbeat: 1, barsWithSnare: 1, share: 1 });
    expect(f.downbeatKick).toEqual({ barsWithKickOnOne: 1, barsWithKick: 1, share: 1 });
    // Hands play every eighth: no silence anywhere, so LHL finds nothing; each off-beat eighth ends on the next
    // beat, scoring 1/T = 1/0.5 = 2 in WNBD, four of them over eight onsets → 1.
    expect(f.parts.hands.lhl).toBe(0);
    expect(f.parts.hands.wnbd).toBe(1);
    expect(f.parts.feet).toMatchObject({ onsets: 2, lhl: 0, wnbd: 0, anticipations: 0 });
    expect(f.density).toEqual({ events: 12, perBar: 12 });
  });

  it("loses the backbeat and the downbeat kick when the same beat is displaced by an eighth", () => {
    const f = readabilityFigures(rockBeat({ shift: 2 }));
    expect(f.backbeat.share).toBe(0);
    expect(f.downbeatKick.share).toBe(0);
    // Kick on the "and" of 1 and of 3 (pulses 2 and 10 of 16): each held over the next beat and half bar.
    // Pulse 2 (−3) silent through 9 whose strongest is pulse 8 (−1): strength 2; pulse 10 (−3) through the
    // bar line (0): strength 3 (Longuet-Higgins & Lee 1984).
    expect(f.parts.feet.lhl).toBe(5);
    expect(f.parts.feet.anticipations).toBe(2);
  });

  it("measures a keys anticipation by hand", () => {
    // Chords on beat 1 and on the last sixteenth of beat 2 (pulse 7 of 16), held into the next bar.
    const doc = groove({
      lanes: [],
      keys: {
        notes: [
          { at: "0", duration: "1/4", pitch: 60 },
          { at: "0", duration: "1/4", pitch: 64 },
          { at: "7/16", duration: "9/16", pitch: 62 },
        ],
        splitPitch: 60,
      },
    });
    const k = readabilityFigures(doc).parts.keys;
    // Chords count once: two onsets. LHL: pulse 7 (−4) is followed by silence up to the bar line, strongest on
    // pulse 8 (−1, the half bar): one syncopation of strength 3.
    expect(k.onsets).toBe(2);
    expect(k.lhl).toBe(3);
    expect(k.lhlSyncopations).toBe(1);
    // WNBD (Gómez et al. 2005): pulse 7 is 1/4 beat from beat 3 (T = 0.25); its note lasts to pulse 16, not
    // strictly before the beat after next (pulse 12), so it scores 1/T = 4; averaged over two onsets → 2.
    expect(k.wnbd).toBe(2);
    expect(k.anticipations).toBe(1);
    expect(k.offBeatness).toBe(1); // 7 is coprime to 16 (Toussaint)
  });

  it("agrees with the LHL measure run directly on the part's onsets over several bars", () => {
    const doc = groove({ bars: 2, lanes: [{ piece: "snare", hits: hits("3/16", "5/4", "23/16") }] });
    const h = metricalHierarchy(doc.meter, doc.grid.step, doc.tempo.beatNote);
    const direct = lhlSyncopation([3, 20, 23], 32, (p) => h.weights[p % 16]!);
    expect(readabilityFigures(doc).parts.hands.lhl).toBe(direct.total);
    expect(direct.total).toBeGreaterThan(0);
  });

  it("puts the backbeat on the weak beats of other meters", () => {
    // Generalised from 2 and 4 in 4/4: the felt beats that are not on a higher level of the meter.
    const waltz = groove({ meter: { beatsPerBar: 3, beatUnit: 4 }, lanes: [{ piece: "snare", hits: hits("1/4", "1/2") }] });
    expect(readabilityFigures(waltz).backbeat).toMatchObject({ beats: [2, 3], share: 1 });
    const sixEight = groove({
      meter: { beatsPerBar: 6, beatUnit: 8 },
      tempo: { bpm: "80", beatNote: "3/8" },
      lanes: [{ piece: "cross-stick", hits: hits("3/8") }],
    });
    expect(readabilityFigures(sixEight).backbeat).toMatchObject({ beats: [2], share: 1 });
  });

  it("checks the tempo of the written beat against the usual range (common practice, from memory)", () => {
    expect(USUAL_TEMPO_RANGE).toEqual({ min: 60, max: 180 });
    const at = (bpm: string) => readabilityFigures(groove({ tempo: { bpm, beatNote: "1/4" } })).tempo.inUsualRange;
    expect([at("59"), at("60"), at("152"), at("180"), at("181"), at("38")]).toEqual([false, true, true, true, false, false]);
  });

  it("counts notes, rests and ties of a spelled score, with a chord as one note and ties per head", () => {
    const head = (tieStart: boolean) => ({ kind: "pitch", midi: 60, step: "C", alter: 0, octave: 4, velocity: 90, tieStart, tieStop: false }) as const;
    const q = { type: "quarter", dots: 0 } as const;
    const score = {
      meter: { beatsPerBar: 2, beatUnit: 4, grouping: [1, 1] },
      tempo: { bpm: "90", beatNote: "1/4", beatNoteValue: q },
      sections: [],
      hasKeys: true,
      bars: [
        {
          index: 0,
          start: "0",
          length: "1/2",
          kit: { up: [{ kind: "rest", at: "0", duration: "1/2", value: q, measure: true }], down: [{ kind: "rest", at: "0", duration: "1/2", value: q, hidden: true }] },
          keys: {
            treble: [
              { kind: "note", at: "0", duration: "1/4", value: q, heads: [head(true), head(false)], stem: "up" },
              { kind: "note", at: "1/4", duration: "1/4", value: q, heads: [head(false)], stem: "up" },
            ],
            bass: [{ kind: "rest", at: "0", duration: "1/2", value: q, measure: true }],
          },
        },
      ],
    } as unknown as NotationScore;
    expect(countNotation(score)).toEqual({ notes: 2, rests: 2, ties: 1 });
  });

  it("counts the spelled notation by default, or uses a given counter, and survives one that fails", () => {
    // The rock beat spelled: hands 8 eighth notes (snare joins the hi-hat as chords), feet two quarters with rests between.
    const spelled = readabilityFigures(rockBeat()).notation!;
    expect(spelled.notes).toBe(10);
    expect(spelled.ties).toBe(0);
    expect(readabilityFigures(rockBeat(), { notation: false }).notation).toBeNull();
    expect(readabilityFigures(rockBeat(), { notation: () => ({ notes: 1, rests: 2, ties: 3 }) }).notation).toEqual({ notes: 1, rests: 2, ties: 3 });
    expect(readabilityFigures(rockBeat(), { notation: () => { throw new Error("no"); } }).notation).toBeNull();
  });
});

describe("figures of a rotation without building it", () => {
  // The reading finder measures rotations of a loop from the extracted onsets; they must be the figures of
  // the document that displace(…, "rotate") builds.
  test.prop([
    loopArb({ maxBars: 3, swing: false }).chain((d) => {
      const perLoop = Number(barLength(d.meter).mul(d.bars).div(q(d.grid.step)).n);
      return fc.tuple(fc.constant(d), fc.integer({ min: -perLoop + 1, max: perLoop - 1 }));
    }),
  ])("equal the figures of the rotated document", ([d, j]) => {
    const built = displace(d, q(d.grid.step).mul(j).toFraction(), "rotate");
    expect(figuresFrom(rotateFigureInput(figureInput(d), j))).toEqual(readabilityFigures(built, { notation: false }));
  });
});
