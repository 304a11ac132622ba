/**
 * MIDI note numbers to written pitches (step, alter, octave), 60 = C4 (the MIDI convention of middle C as C4).
 *
 * Black keys are spelled with sharps unless the material fits a flat key better: the groove has no key
 * signature, so Tactus picks the key signature (0–5 sharps or flats) under which most of its notes are
 * diatonic, ties going to fewer accidentals, then to sharps.
 */
import type { Step } from "./model";

export type Accidentals = "sharps" | "flats";

export interface SpelledPitch {
  readonly step: Step;
  readonly alter: -1 | 0 | 1;
  readonly octave: number;
}

const SHARP: readonly (readonly [Step, 0 | 1])[] = [
  ["C", 0], ["C", 1], ["D", 0], ["D", 1], ["E", 0], ["F", 0], ["F", 1], ["G", 0], ["G", 1], ["A", 0], ["A", 1], ["B", 0],
];
const FLAT: readonly (readonly [Step, 0 | -1])[] = [
  ["C", 0], ["D", -1], ["D", 0], ["E", -1], ["E", 0], ["F", 0], ["G", -1], ["G", 0], ["A", -1], ["A", 0], ["B", -1], ["B", 0],
];

/**
 * Spell one MIDI note.
 * @example spellMidi(61) // { step: "C", alter: 1, octave: 4 }
 * @example spellMidi(70, "flats") // { step: "B", alter: -1, octave: 4 }
 */
export function spellMidi(midi: number, accidentals: Accidentals = "sharps"): SpelledPitch {
  const pc = ((midi % 12) + 12) % 12;
  const octave = Math.floor(midi / 12) - 1;
  const [step, alter] = (accidentals === "flats" ? FLAT : SHARP)[pc]!;
  return { step, alter, octave };
}

/** Pitch classes of the major scale on C. */
const MAJOR = [0, 2, 4, 5, 7, 9, 11];

/**
 * Sharps or flats for a set of pitches: the key signature (up to five sharps or flats) that makes the most
 * notes diatonic wins; ties go to fewer accidentals, then sharps.
 * @example chooseAccidentals([58, 63, 65, 70]) // "flats" (B♭ and E♭ fit B♭ major)
 */
export function chooseAccidentals(pitches: Iterable<number>): Accidentals {
  const count = new Array<number>(12).fill(0);
  for (const p of pitches) count[((p % 12) + 12) % 12]!++;
  let best: { fit: number; size: number; acc: Accidentals } = { fit: -1, size: 0, acc: "sharps" };
  // Keys by the circle of fifths: k sharps has tonic 7k mod 12, k flats tonic −7k mod 12 (= 5k).
  for (let size = 0; size <= 5; size++) {
    for (const acc of ["sharps", "flats"] as const) {
      const tonic = acc === "sharps" ? (7 * size) % 12 : (5 * size) % 12;
      const fit = MAJOR.reduce((sum, d) => sum + count[(tonic + d) % 12]!, 0);
      if (fit > best.fit) best = { fit, size, acc: size === 0 ? "sharps" : acc };
    }
  }
  return best.acc;
}
