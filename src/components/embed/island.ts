/**
 * The play island of embed and compare pages, as small as it can be: it wires the server-rendered buttons and
 * loads the audio engine (./engine.ts, with Tone.js) only inside the first click on play. Nothing on the page
 * changes when this script runs, so waking up shifts no layout.
 *
 * Markup (see PlayControls.astro and EmbedNotation.astro), inside an element with `data-tx-island`:
 *   script[type="application/json"][data-tx-data]  the IslandData
 *   button[data-tx-play]                          play / stop (aria-pressed)
 *   button[data-tx-loop], button[data-tx-metronome]  toggles (aria-pressed)
 *   input[name=tx-reading]                        which reading plays (compare pages)
 *   [data-tx-status]                              a polite live region
 */
import { primeAudio } from "../../adapters/tone/unlock";
import type { IslandData } from "./island-data";

export interface IslandState {
  loop: boolean;
  metronome: boolean;
  /** Index of the reading that plays. */
  reading: number;
}

export interface Session {
  play(state: IslandState): Promise<void>;
  update(state: IslandState): void;
  stop(): void;
  onStopped(cb: () => void): void;
}

type Engine = typeof import("./engine");

function pressed(button: HTMLElement | null): boolean {
  return button?.getAttribute("aria-pressed") === "true";
}

function mount(root: HTMLElement): void {
  if (root.dataset.txMounted) return;
  root.dataset.txMounted = "1";
  const play = root.querySelector<HTMLButtonElement>("[data-tx-play]");
  const loop = root.querySelector<HTMLButtonElement>("[data-tx-loop]");
  const metronome = root.querySelector<HTMLButtonElement>("[data-tx-metronome]");
  const status = root.querySelector<HTMLElement>("[data-tx-status]");
  if (!play) return;
  let session: Promise<Session> | null = null;
  let playing = false;

  const state = (): IslandState => {
    const chosen = root.querySelector<HTMLInputElement>("input[name=tx-reading]:checked");
    return { loop: pressed(loop), metronome: pressed(metronome), reading: chosen ? Number(chosen.value) : 0 };
  };
  const say = (text: string) => {
    if (status) status.textContent = text;
  };
  const show = (on: boolean) => {
    playing = on;
    play.setAttribute("aria-pressed", String(on));
    play.dataset.state = on ? "playing" : "stopped";
    const label = play.querySelector("[data-tx-label]");
    if (label) label.textContent = on ? "Stop" : "Play";
  };
  const open = (): Promise<Session> =>
    (session ??= import("./engine").then((engine: Engine) => {
      const data = JSON.parse(root.querySelector("script[data-tx-data]")?.textContent ?? "null") as IslandData;
      const s = engine.createSession(root, data);
      s.onStopped(() => show(false));
      return s;
    }));

  play.addEventListener("click", () => {
    if (playing) {
      show(false);
      void session?.then((s) => s.stop());
      say("Stopped.");
      return;
    }
    primeAudio(); // inside the gesture: some browsers only start audio here
    show(true);
    say("Loading the player…");
    open()
      .then((s) => s.play(state()))
      .then(() => say("Playing."))
      .catch((e: unknown) => {
        show(false);
        session = null;
        say(`Could not start the sound: ${e instanceof Error ? e.message : String(e)}`);
      });
  });

  const toggle = (button: HTMLButtonElement | null) =>
    button?.addEventListener("click", () => {
      button.setAttribute("aria-pressed", String(!pressed(button)));
      if (playing) void session?.then((s) => s.update(state()));
    });
  toggle(loop);
  toggle(metronome);
  root.querySelectorAll<HTMLInputElement>("input[name=tx-reading]").forEach((input) =>
    input.addEventListener("change", () => {
      if (playing) void session?.then((s) => s.play(state()));
    }),
  );
}

/** Wire every island on the page (idempotent). */
export function mountIslands(): void {
  document.querySelectorAll<HTMLElement>("[data-tx-island]").forEach(mount);
}
