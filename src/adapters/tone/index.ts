/**
 * The audio adapter's public face (the only folder that imports Tone.js). Loaded lazily: importing this module
 * does not load Tone.js; the first `play` does.
 *
 * - `createTransport()`: the editor's seam (see src/components/editor/transport-port.ts).
 * - `createPlayer()`: the player for any island (the embed's play island, the compare page).
 * - `renderOffline()`: offline rendering for tests and benchmarks.
 * - With `?audio-test=1` in the page address, `window.__tactusAudio` exposes an offline render of the last played
 *   document with its detected onsets (browser tests only).
 */
import { assertGroove, type GrooveDocument } from "../../lib/rhythm/document";
import { detectOnsets, mixDown } from "../../lib/rhythm/onsets";
import type { PlaybackOptions } from "../../lib/rhythm/playback-plan";
import { createPlayer, type PlayerOptions } from "./player";
import { renderOffline, type OfflineOptions } from "./offline";

export { createPlayer, type Player, type PlayerOptions, type PlayPosition } from "./player";
export { renderOffline, type OfflineOptions, type OfflineRender } from "./offline";
export { primeAudio } from "./unlock";
export * from "./config";

/** The editor's transport contract (structural copy of src/components/editor/transport-port.ts). */
interface EditorPlayOptions {
  loop: { startBar: number; endBar: number } | null;
  metronome: boolean;
  countInBars: number;
  volumeDb: number;
  onPosition?: (pos: { bar: number; beat: number } | null) => void;
  onEnded?: () => void;
}

const toPlayer = (o: EditorPlayOptions): PlayerOptions => ({ loopRange: o.loop, metronome: o.metronome, countInBars: o.countInBars });

/**
 * The editor's transport: plays the document with the editor's options and reports the bar and beat heard
 * (nothing during the count-in).
 * @example const t = createTransport(); await t.play(doc, { loop: null, metronome: true, countInBars: 1, volumeDb: -12 });
 */
export function createTransport() {
  const player = createPlayer();
  let options: EditorPlayOptions | null = null;
  player.onPosition((p) => options?.onPosition?.(p && !p.countIn ? { bar: p.bar, beat: p.beat } : null));
  player.onEnded(() => options?.onEnded?.());
  return {
    async play(doc: GrooveDocument, o: EditorPlayOptions) {
      options = o;
      player.setVolume(o.volumeDb);
      installTestHook(doc);
      await player.play(doc, toPlayer(o));
    },
    stop() {
      player.stop();
    },
    update(doc: GrooveDocument, o: EditorPlayOptions) {
      options = o;
      player.setVolume(o.volumeDb);
      installTestHook(doc);
      player.update(doc, toPlayer(o));
    },
    setVolume(db: number) {
      player.setVolume(db);
    },
    dispose() {
      options = null;
      player.dispose();
    },
  };
}

export interface AudioTestHook {
  /** The document last given to play or update. */
  doc: GrooveDocument | null;
  /** The playback options given with it (the embed's play island; {} from the editor). */
  options: PlaybackOptions;
  /**
   * Render a document offline (the last played one unless `doc` is given; before the limiter) and detect its
   * onsets; `windows` asks for the RMS level of stretches of the render ([from, to] seconds).
   */
  renderAndDetect(options?: OfflineOptions & { doc?: unknown; windows?: [number, number][] }): Promise<{
    onsets: number[];
    duration: number;
    sampleRate: number;
    renderSeconds: number;
    peak: number;
    rms: number[];
    /** With tap "stems": each voice's onsets, detected on its own channel. */
    stems?: { voice: string; onsets: number[] }[];
  }>;
}

/**
 * Exposes `window.__tactusAudio` for the browser tests, only when the page address has `?audio-test`; a no-op
 * otherwise. Call it with what is about to play (editor transport, embed play island).
 * @example installTestHook(doc, { metronome: false });
 */
export function installTestHook(doc: GrooveDocument, options: PlaybackOptions = {}): void {
  if (typeof window === "undefined" || !new URLSearchParams(window.location.search).has("audio-test")) return;
  const w = window as unknown as { __tactusAudio?: AudioTestHook };
  const hook: AudioTestHook = (w.__tactusAudio ??= {
    doc: null,
    options: {},
    async renderAndDetect({ doc: given, windows = [], ...opts } = {}) {
      const doc = given === undefined ? hook.doc : assertGroove(given);
      if (!doc) throw new Error("nothing has been played yet");
      const r = await renderOffline(doc, { tap: "pre-limiter", ...opts });
      const mono = mixDown(r.channels);
      let peak = 0;
      for (const v of mono) peak = Math.max(peak, Math.abs(v));
      const stems = r.stems?.map((voice, i) => ({ voice, onsets: detectOnsets(r.channels[i]!, r.sampleRate) }));
      const rms = windows.map(([from, to]) => {
        const a = Math.max(0, Math.round(from * r.sampleRate));
        const b = Math.min(mono.length, Math.round(to * r.sampleRate));
        let sum = 0;
        for (let i = a; i < b; i++) sum += mono[i]! * mono[i]!;
        return b > a ? Math.sqrt(sum / (b - a)) : 0;
      });
      return { onsets: detectOnsets(mono, r.sampleRate), duration: r.duration, sampleRate: r.sampleRate, renderSeconds: r.renderSeconds, peak, rms, ...(stems ? { stems } : {}) };
    },
  });
  hook.doc = doc;
  hook.options = options;
}
