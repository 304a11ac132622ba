/**
 * Tap tempo: tap times in milliseconds → beats per minute and how steady the tapping was.
 *
 * Pure and clock-free: `analyzeTaps` works on a list of times; `createTapTempo` keeps the running list
 * with an injected clock, so tests are deterministic and the UI can pass `performance.now`.
 */

/** How steady the taps were, in plain words, from the spread of the intervals relative to their mean. */
export type Steadiness = "steady" | "fairly steady" | "unsteady";

export interface TapAnalysis {
  /** Number of taps considered. */
  taps: number;
  /** Beats per minute from the mean interval, or null with fewer than two taps. */
  bpm: number | null;
  /** Mean interval between taps in ms. */
  meanMs: number | null;
  /** Population standard deviation of the intervals in ms (0 with a single interval). */
  sdMs: number | null;
  /** sd / mean: 0.01 means the taps wander by about 1 % of a beat. */
  variation: number | null;
  steadiness: Steadiness | null;
}

/**
 * Limits for the plain word, as a share of the beat (our own choice: a 2 % wobble at 120 bpm is 10 ms,
 * about the spread of a practised player's taps; 6 % is 30 ms, clearly audible against a click).
 */
const STEADINESS_LIMITS = { steady: 0.02, fairlySteady: 0.06 } as const;

/** Only the most recent intervals count, so the reading follows a tempo that settles. */
const DEFAULT_WINDOW = 8;

/**
 * Analyse tap times (ms, ascending). Uses the last `window` intervals.
 * @example analyzeTaps([0, 500, 1000, 1500]).bpm // 120
 */
export function analyzeTaps(times: readonly number[], window = DEFAULT_WINDOW): TapAnalysis {
  const recent = times.slice(-(window + 1));
  const intervals: number[] = [];
  for (let i = 1; i < recent.length; i++) intervals.push(recent[i]! - recent[i - 1]!);
  if (intervals.length === 0 || intervals.some((d) => !(d > 0)))
    return { taps: recent.length, bpm: null, meanMs: null, sdMs: null, variation: null, steadiness: null };
  const mean = intervals.reduce((a, b) => a + b, 0) / intervals.length;
  const sd = Math.sqrt(intervals.reduce((a, d) => a + (d - mean) ** 2, 0) / intervals.length);
  const variation = sd / mean;
  return {
    taps: recent.length,
    bpm: 60_000 / mean,
    meanMs: mean,
    sdMs: sd,
    variation,
    // One interval says nothing about steadiness.
    steadiness: intervals.length < 2 ? null : steadinessWord(variation),
  };
}

/**
 * The plain word for a relative spread.
 * @example steadinessWord(0.04) // "fairly steady"
 */
export function steadinessWord(variation: number): Steadiness {
  if (variation <= STEADINESS_LIMITS.steady) return "steady";
  if (variation <= STEADINESS_LIMITS.fairlySteady) return "fairly steady";
  return "unsteady";
}

export interface TapTempoOptions {
  /** Clock in ms (inject `performance.now` in the browser, a fake in tests). */
  now: () => number;
  /** A pause longer than this starts a new measurement. */
  resetAfterMs?: number;
  window?: number;
}

export interface TapTempo {
  /** Register a tap now; returns the running analysis. */
  tap(): TapAnalysis;
  reset(): void;
  /** The analysis so far without tapping. */
  current(): TapAnalysis;
}

/**
 * A running tap counter with an injected clock. A pause longer than `resetAfterMs` (2 s, slower than
 * 30 bpm) starts over.
 * @example const t = createTapTempo({ now: () => performance.now() }); button.onclick = () => show(t.tap());
 */
export function createTapTempo({ now, resetAfterMs = 2000, window = DEFAULT_WINDOW }: TapTempoOptions): TapTempo {
  let times: number[] = [];
  return {
    tap() {
      const t = now();
      const last = times[times.length - 1];
      if (last !== undefined && (t - last > resetAfterMs || t <= last)) times = [];
      times.push(t);
      if (times.length > window + 1) times = times.slice(-(window + 1));
      return analyzeTaps(times, window);
    },
    reset() {
      times = [];
    },
    current() {
      return analyzeTaps(times, window);
    },
  };
}

/**
 * A tapped tempo rounded for the document to a whole bpm (tempo markings in whole numbers: common practice).
 * @example roundBpm(119.7) // 120
 */
export function roundBpm(bpm: number): number {
  return Math.round(bpm);
}
