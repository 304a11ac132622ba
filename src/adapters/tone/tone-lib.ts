/**
 * The parts of Tone.js that Tactus uses, as named exports so the bundler leaves the rest out (about 67 KB
 * gzipped instead of 86 KB for the whole namespace). Loaded only by tone-loader.ts, on the first press of play.
 */
export {
  Filter,
  Gain,
  getContext,
  getDestination,
  getDraw,
  getTransport,
  Limiter,
  MembraneSynth,
  Merge,
  NoiseSynth,
  now,
  Offline,
  PolySynth,
  setContext,
  start,
  Synth,
  Volume,
} from "tone";
