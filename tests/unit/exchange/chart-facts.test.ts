/**
 * The words printed above a chart. Note names are the common American ones (common practice on charts in English);
 * a compound meter's beat is a dotted quarter (common practice); triplet swing is the ratio 2:1 (common practice).
 */
import { describe, expect, it } from "vitest";
import { bpmText, formText, meterText, swingText, tempoText } from "../../../src/lib/exchange/chart-facts";

describe("chart facts", () => {
  it("tempo in words, with the note that carries the beat", () => {
    expect(tempoText({ bpm: "96", beatNote: "1/4" })).toBe("96 bpm (quarter note)");
    expect(tempoText({ bpm: "58", beatNote: "3/8" })).toBe("58 bpm (dotted quarter note)");
    expect(tempoText({ bpm: "151/2", beatNote: "1/2" })).toBe("75.5 bpm (half note)");
    expect(tempoText({ bpm: "200", beatNote: "5/16" })).toBe("200 bpm (5/16 of a whole note)");
    expect(bpmText("1000/3")).toBe("333.33");
  });

  it("meter, with the grouping of its beats when the groups differ", () => {
    expect(meterText({ beatsPerBar: 4, beatUnit: 4 })).toBe("4/4");
    expect(meterText({ beatsPerBar: 6, beatUnit: 8, grouping: [3, 3] })).toBe("6/8");
    expect(meterText({ beatsPerBar: 12, beatUnit: 8 })).toBe("12/8");
    expect(meterText({ beatsPerBar: 7, beatUnit: 8, grouping: [3, 2, 2] })).toBe("7/8 (3+2+2)");
    expect(meterText({ beatsPerBar: 5, beatUnit: 8, grouping: [3, 2] })).toBe("5/8 (3+2)");
  });

  it("swing as a ratio of whole numbers; nothing when straight", () => {
    expect(swingText({ unit: "1/8", ratio: 2 / 3 })).toBe("Swung eighths, 2:1");
    expect(swingText({ unit: "1/16", ratio: 0.6 })).toBe("Swung sixteenths, 3:2");
    expect(swingText({ unit: "1/8", ratio: 0.5 })).toBeNull();
  });

  it("song form with repeats", () => {
    expect(formText([{ name: "Verse", startBar: 0, bars: 2, repeats: 4 }, { name: "Chorus", startBar: 2, bars: 4, repeats: 1 }])).toBe("Verse ×4 · Chorus");
    expect(formText([])).toBeNull();
  });
});
