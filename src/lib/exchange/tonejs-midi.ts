/**
 * @tonejs/midi, loaded the same way everywhere: its main file is a CommonJS bundle whose names Node's ESM loader
 * cannot see (only `default`), while bundlers and test runners see `Midi` directly.
 */
import * as tonejs from "@tonejs/midi";

type Module = typeof tonejs;
const mod: Module = (tonejs as unknown as { default?: Module }).default?.Midi ? (tonejs as unknown as { default: Module }).default : tonejs;

/** The @tonejs/midi Midi class (reads and writes Standard MIDI Files). */
export const Midi: typeof tonejs.Midi = mod.Midi;
export type Midi = tonejs.Midi;
