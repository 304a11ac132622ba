/**
 * Loads Tone.js on demand (the first press of play): with tone-lib.ts, the only place the `tone` package is
 * imported at run time.
 */
export type Tone = typeof import("./tone-lib");

let loading: Promise<Tone> | null = null;

/**
 * The Tone.js module, loaded once.
 * @example const Tone = await loadTone();
 */
export function loadTone(): Promise<Tone> {
  if (!loading) {
    // Tone prints a banner on import; keep the console for real messages.
    (globalThis as { TONE_SILENCE_LOGGING?: boolean }).TONE_SILENCE_LOGGING = true;
    loading = import("./tone-lib").catch((e: unknown) => {
      loading = null;
      throw e;
    });
  }
  return loading;
}
