/**
 * The live player: plays a groove document through the synthesized kit, keys and metronome, follows edits and
 * tempo changes while playing, and reports the bar and beat being heard.
 *
 * Tone.js loads on the first `play` (call `primeAudio()` in the click handler first on pages that must work on
 * iOS). Audio starts only after a user gesture: `play` is meant to be called from one.
 */
import type { GrooveDocument } from "../../lib/rhythm/document";
import { buildPlaybackPlan, carryPosition, type PlaybackOptions, type PlaybackPlan, type Voice } from "../../lib/rhythm/playback-plan";
import { DEFAULT_VOLUME_DB, LIVE_LOOK_AHEAD } from "./config";
import { schedulePlan, type PlayPosition, type ScheduledPlan } from "./engine";
import { createMasterChain, type MasterChain } from "./master";
import { loadTone, type Tone } from "./tone-loader";
import { takePrimedContext } from "./unlock";
import { createVoiceBank, type VoiceBank } from "./voices";

export type { PlayPosition } from "./engine";

export interface PlayerOptions extends PlaybackOptions {
  /** Play at this multiple of the written tempo (practice slower or faster); default 1. */
  tempoFactor?: number;
}

export interface Player {
  /** Start playing (from a user gesture). Resolves once sound is scheduled. */
  play(doc: GrooveDocument, options?: PlayerOptions): Promise<void>;
  stop(): void;
  /** New document or options while playing: rescheduled from the current position in the music. */
  update(doc: GrooveDocument, options?: PlayerOptions): void;
  setTempoFactor(factor: number): void;
  /** Output level in dB before the limiter. */
  setVolume(db: number): void;
  /** The bar and beat being heard (null when stopped); returns an unsubscribe function. */
  onPosition(cb: (p: PlayPosition | null) => void): () => void;
  /** A play without loop reached its end. */
  onEnded(cb: () => void): () => void;
  readonly playing: boolean;
  dispose(): void;
}

interface Live {
  T: Tone;
  master: MasterChain;
  bank: VoiceBank;
}

const voicesOf = (plan: PlaybackPlan) => new Set<Voice>(plan.events.map((e) => e.voice));

/**
 * A player bound to the page's audio context.
 * @example
 * const player = createPlayer();
 * button.onclick = () => void player.play(doc, { loopRange: { startBar: 0, endBar: doc.bars }, metronome: true });
 */
export function createPlayer(initialVolumeDb = DEFAULT_VOLUME_DB): Player {
  let live: Live | null = null;
  let starting: Promise<Live> | null = null;
  let scheduled: ScheduledPlan | null = null;
  let volumeDb = initialVolumeDb;
  let factor = 1;
  let playing = false;
  let generation = 0;
  const positionListeners = new Set<(p: PlayPosition | null) => void>();
  const endListeners = new Set<() => void>();
  const emit = (p: PlayPosition | null) => positionListeners.forEach((cb) => cb(p));

  const init = (): Promise<Live> =>
    (starting ??= (async () => {
      const T = await loadTone();
      const primed = takePrimedContext();
      if (primed) T.setContext(primed);
      const ctx = T.getContext();
      ctx.lookAhead = LIVE_LOOK_AHEAD;
      const master = createMasterChain(T, { volumeDb });
      return (live = { T, master, bank: createVoiceBank(T, master.input) });
    })().catch((e: unknown) => {
      starting = null;
      throw e;
    }));

  const hooks = (l: Live, gen: number) => ({
    draw: (fn: () => void, time: number) => l.T.getDraw().schedule(() => gen === generation && fn(), time),
    onPosition: (p: PlayPosition) => emit(p),
    onEnded: () => {
      if (gen !== generation) return;
      playing = false;
      scheduled?.clear();
      scheduled = null;
      emit(null);
      endListeners.forEach((cb) => cb());
    },
  });

  const player: Player = {
    async play(doc, options = {}) {
      const gen = ++generation;
      factor = options.tempoFactor ?? factor;
      const l = await init();
      await l.T.start();
      if (gen !== generation) return; // stopped or replayed meanwhile
      const transport = l.T.getTransport();
      transport.stop();
      scheduled?.clear();
      transport.cancel(0);
      transport.ticks = 0;
      const plan = buildPlaybackPlan(doc, options);
      l.bank.prepare(voicesOf(plan));
      scheduled = schedulePlan(l.T, transport, plan, l.bank, hooks(l, gen), { tempoFactor: factor });
      playing = true;
      transport.start();
    },

    stop() {
      generation++;
      if (!live) return;
      const { T, bank } = live;
      const transport = T.getTransport();
      transport.stop();
      scheduled?.clear();
      scheduled = null;
      bank.silence(T.now());
      if (playing) {
        playing = false;
        emit(null);
      }
    },

    update(doc, options = {}) {
      if (!live || !scheduled || !playing) return;
      const { T, bank } = live;
      factor = options.tempoFactor ?? factor;
      const transport = T.getTransport();
      const old = scheduled;
      const plan = buildPlaybackPlan(doc, options);
      // Where are we in the music? The same bar and place in it, in the new plan.
      const tOld = old.secondsOf(transport.ticks);
      const pastFirst = old.pastFirstPass;
      old.clear();
      bank.prepare(voicesOf(plan));
      scheduled = schedulePlan(T, transport, plan, bank, hooks(live, generation), { tempoFactor: factor, pastFirstPass: pastFirst });
      const tNew = carryPosition(old.plan, tOld, plan, pastFirst);
      if (tNew === null) {
        player.stop();
        endListeners.forEach((cb) => cb());
        return;
      }
      const ticksNow = transport.ticks;
      const ticksNew = scheduled.ticksOf(tNew);
      if (Math.abs(ticksNew - ticksNow) > 0.5) transport.ticks = Math.round(ticksNew);
    },

    setTempoFactor(f) {
      if (!(f > 0)) return;
      factor = f;
      if (live && scheduled) live.T.getTransport().bpm.value = (240 / scheduled.plan.secondsPerWhole) * f;
    },

    setVolume(db) {
      volumeDb = db;
      live?.master.setVolume(db);
    },

    onPosition(cb) {
      positionListeners.add(cb);
      return () => positionListeners.delete(cb);
    },

    onEnded(cb) {
      endListeners.add(cb);
      return () => endListeners.delete(cb);
    },

    get playing() {
      return playing;
    },

    dispose() {
      player.stop();
      positionListeners.clear();
      endListeners.clear();
      if (live) {
        live.bank.dispose();
        live.master.dispose();
      }
      live = null;
      starting = null;
    },
  };
  return player;
}
