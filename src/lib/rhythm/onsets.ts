/**
 * Onset detection on a rendered buffer, and comparison of detected onsets with a schedule. Pure (plain arrays),
 * so tests can check the audio engine's timing: render offline, detect, compare with the core's schedule.
 *
 * Detector, in two steps:
 * 1. Energy rise: the mean power of short windows (WINDOW samples, every HOP) is compared with the window just
 *    before; a clear rise (in the signal or in its first difference, which favours bright attacks over low,
 *    sustained sounds) that is the strongest nearby marks an onset. Decays never rise; a new sound does.
 * 2. Placement on the sample: what was sounding is modelled by linear prediction (LPC, autocorrelation method,
 *    Levinson–Durbin) fitted on the 23 ms before the rise; the onset is where the prediction error's power jumps
 *    well above its level in that stretch, located by a change-point sum (Page's CUSUM). A new sound is what the
 *    past cannot predict; a rise that the past predicts (two low tones beating) is no onset.
 * Events closer than `minGap` are one onset (a kick and a hi-hat struck together).
 */

export interface OnsetOptions {
  /** Energy rise over the background that may be a new sound (power ratio; 2 ≈ +3 dB); step 2 confirms it. */
  rise?: number;
  /** Level below which nothing is an onset, relative to the loudest sample of the signal (0.01 = −40 dB). */
  floor?: number;
  /** Two onsets closer than this (seconds) are one. */
  minGap?: number;
}

/** Analysis window and hop, in samples (≈2.9 ms and 0.7 ms at 44.1 kHz). */
const WINDOW = 128;
const HOP = 32;

/**
 * Mix channels to one (mean).
 * @example mixDown([left, right]) // the mono signal detectOnsets reads
 */
export function mixDown(channels: readonly Float32Array[]): Float32Array {
  if (channels.length === 1) return channels[0]!;
  const n = channels[0]!.length;
  const out = new Float32Array(n);
  for (const c of channels) for (let i = 0; i < n; i++) out[i]! += c[i]! / channels.length;
  return out;
}

/** How far back the background reaches: a period of the lowest sounds (a kick's 45 Hz is 22 ms). */
const BACKGROUND_SECONDS = 0.025;

/** out[i] = max(a[i − span + 1 … i]). */
function slidingMax(a: Float64Array, span: number): Float64Array {
  const out = new Float64Array(a.length);
  const q: number[] = [];
  let head = 0;
  for (let i = 0; i < a.length; i++) {
    while (q.length > head && a[q[q.length - 1]!]! <= a[i]!) q.pop();
    q.push(i);
    if (q[head]! <= i - span) head++;
    out[i] = a[q[head]!]!;
  }
  return out;
}

/** Mean power of each hop-spaced window, of the signal and of its first difference (which favours the bright attacks). */
function framePowers(x: Float32Array): { full: Float64Array; bright: Float64Array } {
  const frames = Math.max(0, Math.floor((x.length - WINDOW) / HOP) + 1);
  const full = new Float64Array(frames);
  const bright = new Float64Array(frames);
  for (let f = 0; f < frames; f++) {
    let a = 0;
    let b = 0;
    const s = f * HOP;
    for (let i = s; i < s + WINDOW; i++) {
      const v = x[i]!;
      const d = v - (i > 0 ? x[i - 1]! : 0);
      a += v * v;
      b += d * d;
    }
    full[f] = a / WINDOW;
    bright[f] = b / WINDOW;
  }
  return { full, bright };
}

/**
 * Onset times in seconds of a mono signal.
 * @example detectOnsets(buffer.getChannelData(0), 44100) // [0, 0.5, 1.0002, …]
 */
export function detectOnsets(signal: Float32Array, sampleRate: number, options: OnsetOptions = {}): number[] {
  const rise = options.rise ?? 2;
  let loudest = 0;
  for (const v of signal) if (Math.abs(v) > loudest) loudest = Math.abs(v);
  if (loudest === 0) return [];
  const floorAmp = (options.floor ?? 0.01) * loudest;
  const floorPower = (floorAmp * floorAmp) / 2;
  const gapFrames = Math.max(1, Math.round(((options.minGap ?? 0.012) * sampleRate) / HOP));
  const { full, bright } = framePowers(signal);
  const lag = WINDOW / HOP; // the window just before, not overlapping
  const span = Math.round((BACKGROUND_SECONDS * sampleRate) / HOP);
  const eps = floorPower * 0.01 + 1e-15;
  // Rise of each frame over the loudest window of the stretch before it (long enough to hold a period of a low
  // sound, whose power in short windows swings with its phase), in whichever band rises more.
  const fullBg = slidingMax(full, span);
  const brightBg = slidingMax(bright, span);
  const ratio = new Float64Array(full.length);
  for (let f = 0; f < full.length; f++) {
    if (full[f]! < floorPower) continue;
    const pf = f >= lag ? fullBg[f - lag]! : 0;
    const pb = f >= lag ? brightBg[f - lag]! : 0;
    ratio[f] = Math.max(full[f]! / (pf + eps), bright[f]! / (pb + eps));
  }
  const onsets: number[] = [];
  let last = -Infinity;
  for (let f = 0; f < ratio.length; f++) {
    const r = ratio[f]!;
    if (r < rise) continue;
    // The strongest rise nearby is the one (a rise shows in several overlapping windows).
    let isPeak = true;
    for (let g = Math.max(0, f - lag); g <= Math.min(ratio.length - 1, f + lag); g++)
      if (ratio[g]! > r || (ratio[g] === r && g < f)) isPeak = false;
    if (!isPeak) continue;
    const start = refineOnset(signal, f * HOP, floorAmp);
    if (start < 0) continue;
    if (start - last < gapFrames * HOP) continue;
    onsets.push(start / sampleRate);
    last = start;
  }
  return onsets;
}

const LPC_ORDER = 16;
const FIT_SAMPLES = 1024;
/** Power of the prediction error, relative to the background's, that separates a new sound from what sounded. */
const CUSUM_DRIFT = 2.5;
/** Samples after the change (≈1.5 ms at 44.1 kHz) over which the error's power must stay CONFIRM_RATIO × the background's. */
const CONFIRM_SAMPLES = 64;
const CONFIRM_RATIO = 4;
/** The error's power after the change over its power just before: a new sound starts, it does not swell. */
const STEP_CONTRAST = 3;

/** LPC coefficients a[1..p] (x[n] ≈ Σ a[k]·x[n−k]) of a stretch, by Levinson–Durbin on its autocorrelation. */
function lpc(x: Float32Array, from: number, to: number, order: number): Float64Array {
  const r = new Float64Array(order + 1);
  for (let lag = 0; lag <= order; lag++) {
    let acc = 0;
    for (let n = from + lag; n < to; n++) acc += x[n]! * x[n - lag]!;
    r[lag] = acc;
  }
  r[0]! *= 1 + 1e-9; // a whisper of white noise keeps the recursion stable on pure tones
  const a = new Float64Array(order + 1);
  if (r[0]! <= 0) return a;
  let err = r[0]!;
  const tmp = new Float64Array(order + 1);
  for (let i = 1; i <= order; i++) {
    let acc = r[i]!;
    for (let j = 1; j < i; j++) acc -= a[j]! * r[i - j]!;
    const k = acc / err;
    tmp.set(a);
    a[i] = k;
    for (let j = 1; j < i; j++) a[j] = tmp[j]! - k * tmp[i - j]!;
    err *= 1 - k * k;
    if (err <= 0) break;
  }
  return a;
}

/**
 * The sample where the sound that rises in the window starting at `at` begins (see the module comment, step 2),
 * searched from one window before to two windows after `at`; -1 when the rise is predictable from what was already
 * sounding (two low tones beating), which is no new sound.
 */
function refineOnset(x: Float32Array, at: number, floorAmp: number): number {
  const s0 = Math.max(0, at - WINDOW);
  const end = Math.min(x.length, at + 2 * WINDOW);
  const fitFrom = Math.max(0, s0 - FIT_SAMPLES);
  if (s0 - fitFrom < LPC_ORDER * 4) {
    // Nothing (or too little) before: the first sample above a small fraction of the floor.
    for (let n = fitFrom; n < end; n++) if (Math.abs(x[n]!) > floorAmp * 0.05) return n;
    return at;
  }
  const a = lpc(x, fitFrom, s0, LPC_ORDER);
  const predictErr = (n: number) => {
    let p = 0;
    for (let k = 1; k <= LPC_ORDER; k++) p += a[k]! * (n - k >= 0 ? x[n - k]! : 0);
    return x[n]! - p;
  };
  let e2 = 0;
  for (let n = fitFrom + LPC_ORDER; n < s0; n++) e2 += predictErr(n) ** 2;
  const sigma = Math.sqrt(e2 / Math.max(1, s0 - fitFrom - LPC_ORDER));
  const level = Math.max(sigma, (floorAmp * 0.02) / 4);
  // Page's CUSUM of (e²/σ² − DRIFT): it falls while only the background sounds and climbs once a new sound makes
  // the error's power several times the background's; the change is just after its lowest point.
  const ratio = new Float64Array(end - s0);
  for (let n = s0; n < end; n++) ratio[n - s0] = (predictErr(n) / level) ** 2;
  let sum = 0;
  let lowest = 0;
  let change = -1;
  for (let i = 0; i < ratio.length; i++) {
    sum += ratio[i]! - CUSUM_DRIFT;
    if (sum < lowest) {
      lowest = sum;
      change = i + 1;
    }
  }
  if (change < 0) change = 0;
  // A new sound keeps the error up after the change; two low tones beating are predicted and leave it at the
  // background's level.
  const confirm = ratio.subarray(change, Math.min(ratio.length, change + CONFIRM_SAMPLES));
  if (confirm.length < CONFIRM_SAMPLES / 2) return -1;
  let mean = 0;
  for (const r of confirm) mean += r / confirm.length;
  // …and the change is a step, not a swell: just before it the error was still near the background's.
  // (With no quiet stretch before the change inside the search, the rise began earlier: not a clean onset.)
  const lead = ratio.subarray(Math.max(0, change - CONFIRM_SAMPLES), change);
  if (lead.length < 8) return -1;
  let before = 0;
  for (const r of lead) before += r / lead.length;
  return mean >= CONFIRM_RATIO && mean >= STEP_CONTRAST * before ? s0 + change : -1;
}

export interface OnsetComparison {
  /** Expected onset times after merging events closer than `mergeWithin` (seconds). */
  expected: number[];
  detected: number[];
  /** detected − expected for each matched onset (seconds). */
  errors: number[];
  missing: number[];
  extra: number[];
  maxAbsError: number;
  meanAbsError: number;
}

/**
 * Distinct onset times of a schedule: times closer than `mergeWithin` seconds sound as one onset.
 * @example distinctTimes([0, 0, 0.5]) // [0, 0.5]
 */
export function distinctTimes(times: readonly number[], mergeWithin = 0.002): number[] {
  const sorted = [...times].sort((a, b) => a - b);
  const out: number[] = [];
  for (const t of sorted) if (out.length === 0 || t - out[out.length - 1]! > mergeWithin) out.push(t);
  return out;
}

/**
 * Match detected onsets to expected ones (nearest, each used once, within `window` seconds).
 * @example compareOnsets([0, 0.5], [0.0001, 0.5002]).maxAbsError // ≈ 0.0002
 */
export function compareOnsets(expectedTimes: readonly number[], detected: readonly number[], window = 0.01): OnsetComparison {
  const expected = distinctTimes(expectedTimes);
  const used = new Set<number>();
  const errors: number[] = [];
  const missing: number[] = [];
  let j = 0;
  for (const e of expected) {
    while (j < detected.length && detected[j]! < e - window) j++;
    let best = -1;
    for (let k = j; k < detected.length && detected[k]! <= e + window; k++) {
      if (used.has(k)) continue;
      if (best < 0 || Math.abs(detected[k]! - e) < Math.abs(detected[best]! - e)) best = k;
    }
    if (best < 0) missing.push(e);
    else {
      used.add(best);
      errors.push(detected[best]! - e);
    }
  }
  const extra = detected.filter((_, k) => !used.has(k));
  const abs = errors.map(Math.abs);
  return {
    expected,
    detected: [...detected],
    errors,
    missing,
    extra,
    maxAbsError: abs.length ? Math.max(...abs) : 0,
    meanAbsError: abs.length ? abs.reduce((a, b) => a + b, 0) / abs.length : 0,
  };
}
