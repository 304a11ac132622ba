/**
 * The onset detector on synthetic signals whose onsets are known to the sample (constructed here, so the truth
 * does not depend on the detector), and the comparison of detected onsets with a schedule.
 * Method references: linear prediction by the autocorrelation method and Levinson–Durbin (Makhoul, "Linear
 * prediction: a tutorial review", Proc. IEEE 1975); change-point sum (Page, "Continuous inspection schemes",
 * Biometrika 1954). Timing target from issue 4: within 1 ms.
 */
import { describe, expect, it } from "vitest";
import { compareOnsets, detectOnsets, distinctTimes, mixDown } from "../../../src/lib/rhythm/onsets";

const SR = 44100;

/** A small deterministic noise source (mulberry32), so the tests are repeatable. */
function rng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296 - 0.5;
  };
}

type Burst = { at: number; kind: "tone" | "noise" | "sweep"; amp: number; decay: number; hz?: number };

/** Sum of struck sounds: each starts at its sample with a 1 ms linear attack and dies away exponentially. */
function render(seconds: number, bursts: Burst[], seed = 1): Float32Array {
  const x = new Float32Array(Math.round(seconds * SR));
  const noise = rng(seed);
  for (const b of bursts) {
    const start = Math.round(b.at * SR);
    let phase = 0;
    for (let n = start; n < x.length; n++) {
      const t = (n - start) / SR;
      const env = b.amp * Math.min(1, t / 0.001) * Math.exp(-t / b.decay);
      if (env < 1e-6 && t > 0.01) break;
      if (b.kind === "noise") x[n]! += env * noise() * 2;
      else {
        const hz = b.kind === "sweep" ? (b.hz ?? 50) * (1 + 30 * Math.exp(-t / 0.03)) : (b.hz ?? 440);
        phase += (2 * Math.PI * hz) / SR;
        x[n]! += env * Math.sin(phase);
      }
    }
  }
  return x;
}

const errorsMs = (expected: number[], got: number[]) => compareOnsets(expected, got);

describe("detectOnsets", () => {
  it("finds struck tones on their sample, each once", () => {
    const times = [0.1, 0.35, 0.5, 0.9, 1.2345];
    const x = render(1.6, times.map((at, i) => ({ at, kind: "tone", amp: 0.5, decay: 0.08, hz: 220 + 110 * i })));
    const cmp = errorsMs(times, detectOnsets(x, SR));
    expect(cmp.missing).toEqual([]);
    expect(cmp.extra).toEqual([]);
    expect(cmp.maxAbsError).toBeLessThan(0.0002);
  });

  it("finds a noise burst struck while a louder low tone still rings (a snare over a kick)", () => {
    const bursts: Burst[] = [
      { at: 0.2, kind: "sweep", amp: 0.8, decay: 0.3, hz: 48 },
      { at: 0.32, kind: "noise", amp: 0.3, decay: 0.1 },
      { at: 0.61, kind: "noise", amp: 0.15, decay: 0.05 },
    ];
    const cmp = errorsMs([0.2, 0.32, 0.61], detectOnsets(render(1, bursts), SR));
    expect(cmp.missing).toEqual([]);
    expect(cmp.extra).toEqual([]);
    expect(cmp.maxAbsError).toBeLessThan(0.0005);
  });

  it("finds a soft tone struck under a ringing noise (a ghost note under a cymbal) within 1 ms", () => {
    const bursts: Burst[] = [
      { at: 0.05, kind: "noise", amp: 0.2, decay: 0.6 },
      { at: 0.4, kind: "tone", amp: 0.25, decay: 0.1, hz: 330 },
    ];
    const cmp = errorsMs([0.05, 0.4], detectOnsets(render(1, bursts, 7), SR));
    expect(cmp.missing).toEqual([]);
    expect(cmp.extra).toEqual([]);
    expect(cmp.maxAbsError).toBeLessThan(0.001);
  });

  it("does not mistake two low tones beating for new sounds", () => {
    // Two sustained low tones (48 Hz and 105 Hz) struck together: their sum swells and fades, but nothing new starts.
    const bursts: Burst[] = [
      { at: 0.1, kind: "tone", amp: 0.5, decay: 2, hz: 48 },
      { at: 0.1, kind: "tone", amp: 0.45, decay: 2, hz: 105 },
    ];
    const onsets = detectOnsets(render(1.5, bursts), SR);
    expect(onsets).toHaveLength(1);
    expect(Math.abs(onsets[0]! - 0.1)).toBeLessThan(0.0002);
  });

  it("does not mistake a kick ringing into a floor tom for a third sound", () => {
    // Two pitch-swept low drums 120 ms apart (a tom from 483 Hz down to 105 Hz, a kick from 3 kHz down to 48 Hz):
    // as they ring together their sum swells and fades, which is no new stroke.
    const x = new Float32Array(SR);
    const drum = (at: number, hz: number, octaves: number, sweep: number, ring: number, amp: number) => {
      const s = Math.round(at * SR);
      let phase = 0;
      for (let n = s; n < x.length; n++) {
        const t = (n - s) / SR;
        phase += (2 * Math.PI * hz * (1 + (2 ** octaves - 1) * Math.exp(-t / sweep))) / SR;
        x[n]! += amp * Math.min(1, t / 0.0005) * Math.exp(-t / ring) * Math.sin(phase);
      }
    };
    drum(0.1, 105, 2.2, 0.07 / 5.3, 0.19, 0.8);
    drum(0.22, 48, 6, 0.045 / 5.3, 0.07, 0.8);
    const cmp = compareOnsets([0.1, 0.22], detectOnsets(x, SR));
    expect(cmp.missing).toEqual([]);
    expect(cmp.extra).toEqual([]);
    expect(cmp.maxAbsError).toBeLessThan(0.0002);
  });

  it("does not mistake a swelling sustained tone (tremolo) for new sounds", () => {
    // A 330 Hz tone whose level swells and fades 6 times a second between −14 dB and 0 dB, from 0.1 s.
    const x = new Float32Array(Math.round(1.5 * SR));
    for (let n = Math.round(0.1 * SR); n < x.length; n++) {
      const t = n / SR - 0.1;
      const depth = 0.6 + 0.4 * Math.sin(2 * Math.PI * 6 * t - Math.PI / 2);
      x[n] = 0.5 * Math.min(1, t / 0.001) * depth * Math.sin(2 * Math.PI * 330 * t);
    }
    const onsets = detectOnsets(x, SR);
    expect(onsets).toHaveLength(1);
    expect(Math.abs(onsets[0]! - 0.1)).toBeLessThan(0.0002);
  });

  it("counts sounds struck together (or closer than the minimum gap) as one onset", () => {
    const bursts: Burst[] = [
      { at: 0.2, kind: "tone", amp: 0.5, decay: 0.1, hz: 200 },
      { at: 0.2, kind: "noise", amp: 0.2, decay: 0.05 },
      { at: 0.205, kind: "noise", amp: 0.2, decay: 0.05 },
    ];
    expect(detectOnsets(render(0.6, bursts), SR)).toHaveLength(1);
  });

  it("finds nothing in silence, and ignores sounds far below the loudest (the floor)", () => {
    expect(detectOnsets(new Float32Array(SR), SR)).toEqual([]);
    const x = render(1, [
      { at: 0.1, kind: "tone", amp: 0.8, decay: 0.05, hz: 300 },
      { at: 0.6, kind: "tone", amp: 0.8 * 10 ** (-50 / 20), decay: 0.05, hz: 300 }, // −50 dB: under the −40 dB floor
    ]);
    expect(detectOnsets(x, SR)).toHaveLength(1);
  });

  it("mixDown averages channels", () => {
    const a = Float32Array.from([1, 0, 0.5]);
    const b = Float32Array.from([0, 1, 0.5]);
    expect(Array.from(mixDown([a, b]))).toEqual([0.5, 0.5, 0.5]);
  });
});

describe("compareOnsets", () => {
  it("matches nearest onsets once each and reports the missing and the extra", () => {
    const cmp = compareOnsets([0, 0.5, 1, 1.5], [0.0004, 0.4998, 1.2, 1.5001]);
    expect(cmp.missing).toEqual([1]);
    expect(cmp.extra).toEqual([1.2]);
    expect(cmp.errors.map((e) => Math.round(e * 1e4))).toEqual([4, -2, 1]);
    expect(cmp.maxAbsError).toBeCloseTo(0.0004, 9);
  });

  it("merges scheduled events that sound together", () => {
    expect(distinctTimes([0.5, 0, 0, 0.5005, 1])).toEqual([0, 0.5, 1]);
    expect(compareOnsets([0, 0, 0.25], [0, 0.25]).extra).toEqual([]);
  });
});
