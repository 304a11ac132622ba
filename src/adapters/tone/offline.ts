/**
 * Offline rendering of a groove (Tone.Offline): the same plan, transport scheduling and voices as live playback,
 * rendered as fast as the machine can into a buffer. Used by tests and the benchmark to check timing.
 */
import type { GrooveDocument } from "../../lib/rhythm/document";
import { buildPlaybackPlan, type PlaybackOptions, type PlaybackPlan } from "../../lib/rhythm/playback-plan";
import { OFFLINE_LOOK_AHEAD, OFFLINE_TAIL_SECONDS } from "./config";
import { schedulePlan } from "./engine";
import { createMasterChain } from "./master";
import { loadTone } from "./tone-loader";
import { createVoiceBank } from "./voices";

export interface OfflineOptions extends PlaybackOptions {
  /** Times through the loop body when `loopRange` is set (default 1). */
  passes?: number;
  tempoFactor?: number;
  volumeDb?: number;
  /**
   * "output" (default) renders the whole chain; "pre-limiter" taps before the limiter, whose look-ahead delays
   * everything by a constant (for timing analysis).
   */
  tap?: "output" | "pre-limiter";
  sampleRate?: number;
  channels?: number;
  /** Seconds of silence after the last bar (decays). */
  tail?: number;
}

export interface OfflineRender {
  /** One Float32Array per channel. */
  channels: Float32Array[];
  sampleRate: number;
  /** Seconds rendered. */
  duration: number;
  plan: PlaybackPlan;
  /** Seconds the render took (wall clock). */
  renderSeconds: number;
}

/**
 * Render a groove offline.
 * @example const { channels, sampleRate, plan } = await renderOffline(doc, { tap: "pre-limiter" });
 */
export async function renderOffline(doc: GrooveDocument, options: OfflineOptions = {}): Promise<OfflineRender> {
  const T = await loadTone();
  const plan = buildPlaybackPlan(doc, options);
  const factor = options.tempoFactor ?? 1;
  const passes = Math.max(1, Math.floor(options.passes ?? 1));
  const musicEnd = plan.loop ? plan.loop.start + passes * (plan.loop.end - plan.loop.start) : plan.end;
  const duration = musicEnd / factor + (options.tail ?? OFFLINE_TAIL_SECONDS);
  const sampleRate = options.sampleRate ?? 44100;
  const began = performance.now();
  const buffer = await T.Offline(
    (context) => {
      context.lookAhead = OFFLINE_LOOK_AHEAD;
      const master = createMasterChain(T, { volumeDb: options.volumeDb, limiter: options.tap !== "pre-limiter" });
      const bank = createVoiceBank(T, master.input);
      bank.prepare(new Set(plan.events.map((e) => e.voice)));
      const transport = T.getTransport();
      schedulePlan(T, transport, plan, bank, {}, { tempoFactor: factor, passes });
      transport.start(0);
    },
    duration,
    options.channels ?? 1,
    sampleRate,
  );
  const audio = buffer.get();
  if (!audio) throw new Error("the offline render produced no audio");
  const channels = Array.from({ length: audio.numberOfChannels }, (_, i) => audio.getChannelData(i));
  return { channels, sampleRate: audio.sampleRate, duration, plan, renderSeconds: (performance.now() - began) / 1000 };
}
