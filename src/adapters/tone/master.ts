/**
 * The master chain: every voice → master volume (moderate by default) → limiter (ceiling −1 dBFS) → output.
 * Analysis renders can tap before the limiter: a compressor delays its output by a fixed look-ahead (about 6 ms in
 * Chromium), which would shift every onset equally and hide the timing under test.
 */
import type * as ToneNS from "tone";
import { DEFAULT_VOLUME_DB, LIMITER_THRESHOLD_DB, VOLUME_RANGE_DB } from "./config";
import type { Tone } from "./tone-loader";

export interface MasterChain {
  /** Where voices connect. */
  input: ToneNS.ToneAudioNode;
  limiter: ToneNS.Limiter | null;
  setVolume(db: number): void;
  dispose(): void;
}

/** Clamp a volume to the control's range (−Infinity mutes). */
export function clampVolume(db: number): number {
  if (db === -Infinity) return db;
  if (!Number.isFinite(db)) return DEFAULT_VOLUME_DB;
  return Math.max(VOLUME_RANGE_DB.min, Math.min(VOLUME_RANGE_DB.max, db));
}

/**
 * Build the chain on the current Tone context.
 * @example const master = createMasterChain(Tone); voice.connect(master.input);
 */
export function createMasterChain(T: Tone, options: { volumeDb?: number; limiter?: boolean } = {}): MasterChain {
  const volume = new T.Volume(clampVolume(options.volumeDb ?? DEFAULT_VOLUME_DB));
  const limiter = options.limiter === false ? null : new T.Limiter(LIMITER_THRESHOLD_DB);
  if (limiter) volume.chain(limiter, T.getDestination());
  else volume.connect(T.getDestination());
  return {
    input: volume,
    limiter,
    setVolume(db) {
      const v = clampVolume(db);
      if (v === -Infinity) volume.mute = true;
      else {
        volume.mute = false;
        volume.volume.rampTo(v, 0.05);
      }
    },
    dispose() {
      volume.dispose();
      limiter?.dispose();
    },
  };
}
