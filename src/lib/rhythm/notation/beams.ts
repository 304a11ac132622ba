/**
 * Beam groups and stem directions.
 *
 * Beaming follows the meter (The Open University, "An introduction to music theory", OpenLearn 2016,
 * section 3.6; E. Gould, "Behind Bars", 2011, from memory): beam to show each beat in simple meters,
 * each dotted group in compound meters (6/8 → 3+3), each group in odd meters (7/8 → 2+2+3). Only notes of
 * an eighth or shorter are beamed; a beam never leaves its beat (or group); a rest between two beamed
 * notes of the same beat stays under the beam, and a quarter or longer note breaks it.
 */
import { NOTE_TYPES, type NoteValue } from "./model";

interface Beamable {
  readonly s: number;
  readonly len: number;
  readonly value: NoteValue;
  readonly note: unknown;
}

const EIGHTH = NOTE_TYPES.indexOf("eighth");

/**
 * True for values that carry a flag or beam (an eighth or shorter).
 * @example isBeamable({ type: "eighth", dots: 0 }) // true; a quarter: false
 */
export function isBeamable(value: NoteValue): boolean {
  return NOTE_TYPES.indexOf(value.type) >= EIGHTH;
}

/**
 * Beam numbers (1, 2, …) per event, or undefined; events sorted by start.
 * @example beamGroups(eightEighths, [[0, 16], [16, 32], [32, 48], [48, 64]]) // [1, 1, 2, 2, 3, 3, 4, 4]
 */
export function beamGroups(events: readonly Beamable[], units: readonly (readonly [number, number])[]): (number | undefined)[] {
  const beams: (number | undefined)[] = new Array(events.length).fill(undefined);
  let id = 0;
  let runStart = -1; // first event of the current run of beamable notes (same unit), or -1
  let runCount = 0;
  let runUnit = -1;
  let u = 0;
  const close = (upTo: number) => {
    if (runCount >= 2) {
      id++;
      for (let j = runStart; j < upTo; j++) if (events[j]!.note !== null) beams[j] = id;
    }
    runStart = -1;
    runCount = 0;
  };
  let lastNote = -1;
  for (let i = 0; i < events.length; i++) {
    const ev = events[i]!;
    while (u < units.length - 1 && ev.s >= units[u]![1]) u++;
    if (u !== runUnit) close(lastNote + 1);
    runUnit = u;
    if (ev.note === null) continue;
    if (!isBeamable(ev.value) || ev.s + ev.len > units[u]![1]) {
      close(lastNote + 1);
      continue;
    }
    if (runStart < 0) runStart = i;
    runCount++;
    lastNote = i;
  }
  close(lastNote + 1);
  return beams;
}

/**
 * Stem direction for notes on a staff whose middle line has diatonic index `middle`: the note farthest from
 * the middle line decides; down when it is above (or on) the line (common practice).
 * @example stemFor([38], 34) // "down" (D6 above the treble middle line B4)
 */
export function stemFor(indices: readonly number[], middle: number): "up" | "down" {
  let far = 0;
  for (const i of indices) if (Math.abs(i - middle) > Math.abs(far)) far = i - middle;
  return far >= 0 ? "down" : "up";
}
