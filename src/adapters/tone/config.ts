/**
 * Audio settings of Tactus, as plain values (no Tone.js import, so tests and the interface can read them).
 */

/** Default output level before the limiter: moderate, well below full scale (listening safety). */
export const DEFAULT_VOLUME_DB = -12;
/** The volume control's range in dB (the top stays below full scale; the limiter catches peaks anyway). */
export const VOLUME_RANGE_DB = { min: -40, max: 0 } as const;
/** The master limiter's ceiling in dBFS: nothing leaves Tactus louder than this. */
export const LIMITER_THRESHOLD_DB = -1;
/**
 * How far ahead Tone's clock schedules while playing live, in seconds. Latency from a press of play equals it
 * (Tone's default is 0.1 s); small enough to feel immediate, large enough for a busy main thread.
 */
export const LIVE_LOOK_AHEAD = 0.03;
/**
 * Look-ahead inside an offline render. The offline context starts with 0, which makes instruments start at the
 * next 128-sample render block instead of on their sample; a small look-ahead makes onsets exact.
 */
export const OFFLINE_LOOK_AHEAD = 0.01;
/**
 * Transport ticks per quarter note: 192 = 2⁶·3, so every grid the editor offers (quarters to 32nds, eighth and
 * sixteenth triplets) and every bar length falls on whole ticks; positions between ticks (swing, other tuplets)
 * keep their fraction, which Tone's transport events carry. More ticks would only cost clock work.
 */
export const PPQ = 192;
/** Silence added after the last note of an offline render, so decays are not cut. */
export const OFFLINE_TAIL_SECONDS = 1.2;

/**
 * MIDI velocity (1–127) → amplitude (0–1): the square law, amplitude = (v/127)², i.e. 40·log10(v/127) dB, the
 * usual default velocity curve of General MIDI synthesizers (common practice, from memory of the DLS Level 1 default).
 * @example velocityGain(127) // 1
 */
export function velocityGain(velocity: number): number {
  const v = Math.max(0, Math.min(127, velocity)) / 127;
  return v * v;
}

/** dB → linear gain. */
export function dbToGain(db: number): number {
  return Number.isFinite(db) ? 10 ** (db / 20) : 0;
}
