/**
 * The synthesized kit, keys and metronome: Tone.js instruments only, nothing downloaded. Each voice is built on the
 * current Tone context (inside Tone.Offline that is the offline one) the first time a plan needs it.
 *
 * Drum voices are struck (attack only) and die away by their own envelope; the open hi-hat and choked cymbals are
 * released at the time the plan says (the next closed stroke, the choke), keys notes at the end of their length.
 */
import type * as ToneNS from "tone";
import type { PlanEvent, Voice } from "../../lib/rhythm/playback-plan";
import { velocityGain } from "./config";
import type { Tone } from "./tone-loader";

type Node = ToneNS.ToneAudioNode;

interface VoiceUnit {
  /** Start a stroke or note at `time` with linear gain `gain`; `duration` is in seconds. */
  hit(time: number, gain: number, duration: number, e: PlanEvent): void;
  /** Stop everything still sounding (stop pressed). */
  silence(time: number): void;
  dispose(): void;
}

export interface VoiceBank {
  /** Play one plan event at an audio-clock time; `stretch` scales its durations (a slower tempo factor > 1). */
  play(e: PlanEvent, time: number, stretch?: number): void;
  /** Build the voices of these events now (so the first stroke does not pay for it). */
  prepare(voices: Iterable<Voice>): void;
  silence(time: number): void;
  dispose(): void;
}

/** MIDI note → Hz (A4 = 440 Hz, MIDI 69: the General MIDI tuning). */
export const midiToHz = (m: number) => 440 * 2 ** ((m - 69) / 12);

/**
 * A struck envelope that dies away with time constant `ring` seconds (the level falls by e every `ring`). Tone's
 * `decay` is the time its exponential approach takes to fall to 1/200 (−46 dB), so decay = 200^ring − 1.
 */
const drumEnv = (ring: number, release = 0.05) => ({ attack: 0.0005, decay: 200 ** ring - 1, sustain: 0, release });

function membrane(T: Tone, out: Node, hz: number, o: { ring: number; octaves: number; pitchDecay: number; db: number; wave?: "sine" | "triangle" }): VoiceUnit {
  const s = new T.MembraneSynth({
    pitchDecay: o.pitchDecay,
    octaves: o.octaves,
    oscillator: { type: o.wave ?? "sine" },
    envelope: drumEnv(o.ring),
    volume: o.db,
  }).connect(out);
  return {
    hit: (t, g) => void s.triggerAttack(hz, t, g),
    silence: (t) => void s.triggerRelease(t),
    dispose: () => void s.dispose(),
  };
}

// White noise only: Tone loops a 5 s noise buffer, and the loop point of a coloured noise is an audible click.
function noise(T: Tone, out: Node, o: { type: "white"; ring: number; filter: BiquadFilterType; hz: number; q?: number; db: number; release?: number }): VoiceUnit {
  const f = new T.Filter({ type: o.filter, frequency: o.hz, Q: o.q ?? 0.8 }).connect(out);
  const s = new T.NoiseSynth({ noise: { type: o.type }, envelope: drumEnv(o.ring, o.release), volume: o.db }).connect(f);
  return {
    hit: (t, g) => void s.triggerAttack(t, g),
    silence: (t) => void s.triggerRelease(t),
    dispose: () => {
      s.dispose();
      f.dispose();
    },
  };
}

function tonal(T: Tone, out: Node, hz: number[], o: { wave: "square" | "triangle" | "sine"; ring: number; filterHz: number; db: number; release?: number }): VoiceUnit {
  const f = new T.Filter({ type: "bandpass", frequency: o.filterHz, Q: 1.2 }).connect(out);
  const synths = hz.map(() => new T.Synth({ oscillator: { type: o.wave }, envelope: drumEnv(o.ring, o.release), volume: o.db }).connect(f));
  return {
    hit: (t, g) => synths.forEach((s, i) => s.triggerAttack(hz[i]!, t, g)),
    silence: (t) => synths.forEach((s) => s.triggerRelease(t)),
    dispose: () => {
      synths.forEach((s) => s.dispose());
      f.dispose();
    },
  };
}

/** Several units struck together as one piece (a snare: the head and the wires). */
function layered(...units: VoiceUnit[]): VoiceUnit {
  return {
    hit: (t, g, d, e) => units.forEach((u) => u.hit(t, g, d, e)),
    silence: (t) => units.forEach((u) => u.silence(t)),
    dispose: () => units.forEach((u) => u.dispose()),
  };
}

/** A cymbal that can be stopped: released at time + duration (open hi-hat closed by the pedal, a choke). */
function releasedAfter(unit: VoiceUnit, when: (e: PlanEvent) => boolean): VoiceUnit {
  return {
    ...unit,
    hit: (t, g, d, e) => {
      unit.hit(t, g, d, e);
      if (when(e)) unit.silence(t + d);
    },
  };
}

const choked = (e: PlanEvent) => e.articulation === "choke";

function keys(T: Tone, out: Node): VoiceUnit {
  const s = new T.PolySynth({
    maxPolyphony: 48,
    voice: T.Synth,
    options: { oscillator: { type: "triangle" }, envelope: { attack: 0.001, decay: 0.5, sustain: 0.35, release: 0.35 } },
    volume: -6,
  }).connect(out);
  return {
    hit: (t, g, d, e) => void s.triggerAttackRelease(midiToHz(e.pitch ?? 60), Math.max(0.02, d), t, g),
    silence: (t) => void s.releaseAll(t),
    dispose: () => void s.dispose(),
  };
}

function click(T: Tone, out: Node): VoiceUnit {
  const s = new T.Synth({ oscillator: { type: "square" }, envelope: { attack: 0.0005, decay: 0.03, sustain: 0, release: 0.01 }, volume: -10 }).connect(out);
  // Common practice: a higher, louder click marks the first beat of the bar.
  return {
    hit: (t, g, _d, e) => void s.triggerAttack(e.downbeat ? 1760 : 1320, t, g),
    silence: (t) => void s.triggerRelease(t),
    dispose: () => void s.dispose(),
  };
}

function build(T: Tone, out: Node, voice: Voice): VoiceUnit {
  switch (voice) {
    case "kick":
      return membrane(T, out, 48, { ring: 0.07, octaves: 6, pitchDecay: 0.045, db: 0 });
    case "snare":
      return layered(
        membrane(T, out, 185, { ring: 0.035, octaves: 1.5, pitchDecay: 0.02, db: -6, wave: "triangle" }),
        noise(T, out, { type: "white", ring: 0.07, filter: "highpass", hz: 1400, db: -4 }),
      );
    case "cross-stick":
      return layered(
        membrane(T, out, 520, { ring: 0.012, octaves: 1, pitchDecay: 0.008, db: -6, wave: "triangle" }),
        noise(T, out, { type: "white", ring: 0.006, filter: "bandpass", hz: 2500, q: 1.5, db: -8 }),
      );
    // Cymbals from filtered noise (cheap to run; FM metal voices cost several times real time to render), with a
    // few inharmonic partials for the ride's ping and the bell.
    case "hihat-closed":
      return noise(T, out, { type: "white", ring: 0.018, filter: "highpass", hz: 7000, db: -10 });
    case "hihat-open":
      return releasedAfter(noise(T, out, { type: "white", ring: 0.35, filter: "highpass", hz: 6500, db: -13, release: 0.06 }), () => true);
    case "hihat-foot":
      return noise(T, out, { type: "white", ring: 0.012, filter: "bandpass", hz: 6000, q: 1.2, db: -14 });
    case "ride":
      return releasedAfter(
        layered(
          noise(T, out, { type: "white", ring: 0.5, filter: "bandpass", hz: 8000, q: 0.9, db: -28, release: 0.08 }),
          noise(T, out, { type: "white", ring: 0.01, filter: "bandpass", hz: 5500, q: 1.4, db: -3 }), // the stick's tick
          tonal(T, out, [3150, 4710], { wave: "sine", ring: 0.35, filterHz: 4000, db: -29 }),
        ),
        choked,
      );
    case "ride-bell":
      return releasedAfter(tonal(T, out, [740, 1110, 1790], { wave: "triangle", ring: 0.3, filterHz: 1200, db: -14 }), choked);
    case "crash":
      return releasedAfter(
        layered(
          noise(T, out, { type: "white", ring: 0.6, filter: "highpass", hz: 3500, db: -12, release: 0.08 }),
          noise(T, out, { type: "white", ring: 0.25, filter: "bandpass", hz: 5000, q: 0.7, db: -14, release: 0.08 }),
        ),
        choked,
      );
    case "tom-high":
      return membrane(T, out, 210, { ring: 0.13, octaves: 2.2, pitchDecay: 0.06, db: -3 });
    case "tom-mid":
      return membrane(T, out, 155, { ring: 0.15, octaves: 2.2, pitchDecay: 0.06, db: -3 });
    case "tom-floor":
      return membrane(T, out, 105, { ring: 0.19, octaves: 2.2, pitchDecay: 0.07, db: -2 });
    case "clap":
      return noise(T, out, { type: "white", ring: 0.035, filter: "bandpass", hz: 1300, q: 1.1, db: -2 });
    case "tambourine":
      return noise(T, out, { type: "white", ring: 0.045, filter: "highpass", hz: 6500, db: -8 });
    case "cowbell":
      return tonal(T, out, [540, 800], { wave: "square", ring: 0.08, filterHz: 800, db: -14 });
    case "keys":
      return keys(T, out);
    case "click":
      return click(T, out);
  }
}

/**
 * The voices, built on demand on the current Tone context and connected to `output` (one node for all, or a node
 * per voice: stems for analysis).
 * @example const bank = createVoiceBank(Tone, master); bank.play(event, time);
 */
export function createVoiceBank(T: Tone, output: Node | ((voice: Voice) => Node)): VoiceBank {
  const units = new Map<Voice, VoiceUnit>();
  const get = (v: Voice) => {
    let u = units.get(v);
    if (!u) units.set(v, (u = build(T, typeof output === "function" ? output(v) : output, v)));
    return u;
  };
  return {
    play(e, time, stretch = 1) {
      get(e.voice).hit(time, velocityGain(e.velocity), e.duration * stretch, e);
    },
    prepare(voices) {
      for (const v of voices) get(v);
    },
    silence(time) {
      for (const u of units.values()) u.silence(time);
    },
    dispose() {
      for (const u of units.values()) u.dispose();
      units.clear();
    },
  };
}
