/**
 * Tap tempo. Sources: common practice (bpm = 60,000 / milliseconds per beat); MIREX audio tempo estimation's
 * "Accuracy 1" tolerance of 4 % (Gouyon et al. 2006, REFERENCES.md); population standard deviation (textbook
 * statistics); the steadiness limits and the reset after a pause are Tactus's own choices (tap-tempo.ts).
 */
import { describe, expect, it } from "vitest";
import { analyzeTaps, createTapTempo, roundBpm, steadinessWord } from "../../../src/lib/rhythm/tap-tempo";

/** A fake clock that returns the given times in order. */
const clock = (times: number[]) => {
  let i = 0;
  return () => times[i++]!;
};

describe("tap tempo", () => {
  it("taps 500 ms apart are 120 bpm, and 1 s apart are 60 bpm (common practice: bpm = 60,000 / ms per beat)", () => {
    expect(analyzeTaps([0, 500, 1000, 1500, 2000]).bpm).toBe(120);
    expect(analyzeTaps([0, 1000, 2000]).bpm).toBe(60);
    expect(analyzeTaps([0, 800, 1600, 2400]).bpm).toBe(75);
  });

  it("needs two taps for a tempo and three for a steadiness word", () => {
    expect(analyzeTaps([]).bpm).toBeNull();
    expect(analyzeTaps([100]).bpm).toBeNull();
    const two = analyzeTaps([0, 500]);
    expect(two.bpm).toBe(120);
    expect(two.steadiness).toBeNull();
    expect(analyzeTaps([0, 500, 1000]).steadiness).toBe("steady");
  });

  it("reports the spread of intervals as a population standard deviation in ms", () => {
    // Intervals 490, 510, 490, 510: mean 500, every deviation 10 ms → sd = 10 ms, 2 % of the beat.
    const a = analyzeTaps([0, 490, 1000, 1490, 2000]);
    expect(a.meanMs).toBe(500);
    expect(a.sdMs).toBeCloseTo(10, 10);
    expect(a.variation).toBeCloseTo(0.02, 10);
    expect(a.steadiness).toBe("steady");
    // Intervals 450, 550: sd 50 ms = 10 % → unsteady.
    expect(analyzeTaps([0, 450, 1000, 1450, 2000]).steadiness).toBe("unsteady");
    expect(steadinessWord(0.04)).toBe("fairly steady");
  });

  it("stays within 4 % of a steady performance with human wobble (MIREX 'Accuracy 1' tolerance)", () => {
    // Taps around 87 bpm (689.66 ms) with a repeating ±15 ms error.
    const beat = 60_000 / 87;
    const wobble = [0, 15, -10, 5, -15, 10, -5, 12, -8];
    const times = wobble.map((w, i) => i * beat + w);
    const bpm = analyzeTaps(times).bpm!;
    expect(Math.abs(bpm - 87) / 87).toBeLessThan(0.04);
  });

  it("uses only the most recent taps, so the reading follows a settling tempo", () => {
    // Eight slow taps, then nine at 120 bpm: the window of eight intervals sees only the new tempo.
    const times = [0, 700, 1400, 2100, 2800, 3500, 4200, 4900];
    for (let i = 1; i <= 9; i++) times.push(4900 + i * 500);
    expect(analyzeTaps(times).bpm).toBe(120);
  });

  it("a running counter with an injected clock starts over after a long pause", () => {
    const t = createTapTempo({ now: clock([1000, 1500, 2000, 9000, 9600, 10200]), resetAfterMs: 2000 });
    t.tap();
    t.tap();
    expect(t.tap().bpm).toBe(120);
    expect(t.tap().bpm).toBeNull(); // 7 s gap: a new measurement
    t.tap();
    const r = t.tap();
    expect(r.bpm).toBe(100);
    expect(r.taps).toBe(3);
    t.reset();
    expect(t.current().taps).toBe(0);
  });

  it("rounds a tapped tempo to a whole bpm for the document", () => {
    expect(roundBpm(119.7)).toBe(120);
    expect(roundBpm(74.4)).toBe(74);
  });
});
