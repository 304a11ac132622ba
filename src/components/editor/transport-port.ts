/**
 * The seam between the editor and the audio adapter (src/adapters/tone/). The editor never imports Tone.js:
 * it loads `src/adapters/tone/index.ts` lazily on the first press of play (a user gesture, so audio may
 * start) and talks to it through `TransportHandle`.
 *
 * Contract for the adapter (structural; no import of this file needed):
 *   export function createTransport(): TransportHandle | Promise<TransportHandle>
 * `play` compiles the document's schedule with the core's `compileSchedule` and plays it, calling
 * `onPosition` with the bar and beat being heard (from Tone's Draw callbacks) and `onEnded` when a
 * non-looping play finishes. `update` is called when the document or the options change while playing
 * (tempo, swing, edits): the adapter reschedules from the current position.
 */
import type { GrooveDocument } from "../../lib/rhythm";
import type { EditorStore, PlayPosition } from "../../stores/editor-store";

export interface PlayOptions {
  /** Bars to loop (0-based start, exclusive end), or null to play the groove once. */
  loop: { startBar: number; endBar: number } | null;
  metronome: boolean;
  /** Bars of metronome clicks before the groove starts (0 = none). */
  countInBars: number;
  /** Output level in dB, applied before the master limiter. */
  volumeDb: number;
  onPosition?: (pos: PlayPosition | null) => void;
  onEnded?: () => void;
}

export interface TransportHandle {
  play(doc: GrooveDocument, options: PlayOptions): Promise<void> | void;
  stop(): void;
  update(doc: GrooveDocument, options: PlayOptions): void;
  setVolume(db: number): void;
  dispose(): void;
}

export type TransportModule = { createTransport?: () => TransportHandle | Promise<TransportHandle> };

// Vite resolves this at build time; when the adapter file does not exist yet the map is empty.
const adapters = import.meta.glob<TransportModule>("../../adapters/tone/index.ts");

// The adapter's tiny unlock module (no Tone.js inside) is bundled eagerly: some browsers let audio start only
// synchronously inside the user's gesture, before the lazy import of the adapter has finished.
const unlockers = import.meta.glob<{ primeAudio?: () => void }>("../../adapters/tone/unlock.ts", { eager: true });

/** Create and resume the audio context now, inside the gesture (no-op without the adapter). */
function primeAudio(): void {
  for (const m of Object.values(unlockers)) m.primeAudio?.();
}

/** Whether an audio adapter is part of this build. */
export const audioAvailable = Object.keys(adapters).length > 0;

async function loadAdapter(): Promise<TransportHandle | null> {
  const load = Object.values(adapters)[0];
  if (!load) return null;
  const mod = await load();
  return mod.createTransport ? await mod.createTransport() : null;
}

export interface TransportController {
  readonly available: boolean;
  toggle(): Promise<void>;
  play(): Promise<void>;
  stop(): void;
  setVolume(db: number): void;
  dispose(): void;
}

/**
 * Tie a transport to an editor store: play state and playhead go into the store; edits and settings
 * changes while playing are passed on. `load` is injectable for tests.
 * @example const transport = createTransportController(store); button.onclick = () => transport.toggle();
 */
export function createTransportController(store: EditorStore, load: () => Promise<TransportHandle | null> = loadAdapter): TransportController {
  let handle: TransportHandle | null = null;
  let loading: Promise<TransportHandle | null> | null = null;
  const available = load !== loadAdapter || audioAvailable;

  const options = (): PlayOptions => {
    const s = store.getState();
    const sel = s.selection;
    return {
      loop: s.transport.loop ? (sel ? { startBar: sel.start, endBar: sel.start + sel.count } : { startBar: 0, endBar: s.doc.bars }) : null,
      metronome: s.transport.metronome,
      countInBars: s.transport.countInBars,
      volumeDb: s.transport.volumeDb,
      onPosition: (pos) => store.getState().actions.setPlayhead(pos),
      onEnded: () => store.getState().actions.setPlaying(false),
    };
  };

  const unsubscribe = store.subscribe((s, prev) => {
    if (!s.playing || !handle) return;
    if (s.doc !== prev.doc || s.transport !== prev.transport || s.selection !== prev.selection) handle.update(s.doc, options());
  });

  const controller: TransportController = {
    available,
    async play() {
      const { actions } = store.getState();
      if (load === loadAdapter) primeAudio();
      if (!available) {
        actions.notify({ tone: "info", title: "Audio playback is not part of this build yet", lines: [], undoable: false });
        return;
      }
      loading ??= load();
      handle = await loading;
      if (!handle) {
        actions.notify({ tone: "error", title: "Audio could not start", lines: [], undoable: false });
        return;
      }
      actions.setPlaying(true);
      try {
        await handle.play(store.getState().doc, options());
      } catch (e) {
        actions.setPlaying(false);
        actions.notify({ tone: "error", title: "Audio could not start", lines: [e instanceof Error ? e.message : String(e)], undoable: false });
      }
    },
    stop() {
      handle?.stop();
      store.getState().actions.setPlaying(false);
    },
    async toggle() {
      if (store.getState().playing) controller.stop();
      else await controller.play();
    },
    setVolume(db) {
      store.getState().actions.setTransport({ volumeDb: db });
      handle?.setVolume(db);
    },
    dispose() {
      unsubscribe();
      handle?.dispose();
      handle = null;
    },
  };
  return controller;
}
