/**
 * Unlock audio inside the click handler itself, before Tone.js has loaded: some browsers (iOS Safari) only let an
 * AudioContext start during the user's gesture, and the first press of play must still wait for `import('tone')`.
 * No Tone.js import here, so pages can call it synchronously from their click handler at no cost.
 */
let primed: AudioContext | null = null;

/**
 * Create and resume the page's AudioContext now (call it synchronously in a click or key handler).
 * @example button.onclick = () => { primeAudio(); void player.play(doc, options); };
 */
export function primeAudio(): void {
  if (primed || typeof window === "undefined") return;
  const Ctor = window.AudioContext ?? (window as unknown as { webkitAudioContext?: typeof AudioContext }).webkitAudioContext;
  if (!Ctor) return;
  primed = new Ctor({ latencyHint: "interactive" });
  void primed.resume().catch(() => undefined);
}

/** The context made by `primeAudio`, handed to Tone.js once it has loaded (then forgotten here). */
export function takePrimedContext(): AudioContext | null {
  const c = primed;
  primed = null;
  return c;
}
