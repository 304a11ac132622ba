/**
 * Offline rendering of a groove (Tone.Offline): the same plan, transport scheduling and voices as live playback,
 * rendered as fast as the machine can into a buffer. Used by tests and the benchmark to check timing.
 */
import type { GrooveDocument } from "../../lib/rhythm/document";
import { buildPlaybackPlan, type PlaybackOptions, type PlaybackPlan, type Voice } from "../../lib/rhythm/playback-plan";
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
   * everything by a constant; "stems" renders each voice alone on its own channel, at full level, with no volume
   * or limiter (timing analysis of every instrument, unmasked by the others).
   */
  tap?: "output" | "pre-limiter" | "stems";
  sampleRate?: number;
  channels?: number;
  /** Seconds of silence after the last bar (decays). */
  tail?: number;
}

export interface OfflineRender {
  /** One Float32Array per channel. */
  channels: Float32Array[];
  /** With tap "stems": the voice on each channel. */
  stems?: Voice[];
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
  const voices = [...new Set(plan.events.map((e) => e.voice))];
  const stems = options.tap === "stems";
  if (stems && voices.length > 32) throw new Error("too many voices for one render");
  const buffer = await T.Offline(
    (context) => {
      context.lookAhead = OFFLINE_LOOK_AHEAD;
      let bank;
      if (stems) {
        const merge = new T.Merge({ channels: Math.max(1, voices.length) });
        merge.connect(context.rawContext.destination);
        const inputs = new Map(voices.map((v, i) => [v, new T.Gain(1).connect(merge, 0, i)]));
        bank = createVoiceBank(T, (v) => inputs.get(v)!);
      } else {
        const master = createMasterChain(T, { volumeDb: options.volumeDb, limiter: options.tap !== "pre-limiter" });
        bank = createVoiceBank(T, master.input);
      }
      bank.prepare(voices);
      const transport = T.getTransport();
      schedulePlan(T, transport, plan, bank, {}, { tempoFactor: factor, passes });
      transport.start(0);
    },
    duration,
    stems ? Math.max(1, voices.length) : (options.channels ?? 1),
    sampleRate,
  );
  const audio = buffer.get();
  if (!audio) throw new Error("the offline render produced no audio");
  const channels = Array.from({ length: audio.numberOfChannels }, (_, i) => audio.getChannelData(i));
  const result: OfflineRender = { channels, sampleRate: audio.sampleRate, duration, plan, renderSeconds: (performance.now() - began) / 1000 };
  if (stems) result.stems = voices;
  return result;
}
