/**
 * The tempo as a musician writes it above the staff: a note value, "=", beats per minute.
 * @example tempoLabel({ bpm: "96", beatNote: "1/4" }) // { note: "♩", bpm: "96", words: "96 quarter notes per minute" }
 */
export function tempoLabel(tempo: { bpm: string; beatNote: string }): { note: string; bpm: string; words: string } {
  const [n, d] = tempo.bpm.split("/").map(Number) as [number, number | undefined];
  const bpmValue = d ? n / d : n;
  const bpm = String(Math.round(bpmValue * 100) / 100);
  const names: Record<string, [string, string]> = {
    "1/4": ["♩", "quarter notes"],
    "3/8": ["♩.", "dotted quarter notes"],
    "1/8": ["♪", "eighth notes"],
    "3/16": ["♪.", "dotted eighth notes"],
    "1/2": ["half =", "half notes"],
    "3/4": ["dotted half =", "dotted half notes"],
    "1/16": ["sixteenth =", "sixteenth notes"],
  };
  const [note, plural] = names[tempo.beatNote] ?? [`${tempo.beatNote} =`, `beats of ${tempo.beatNote}`];
  return { note, bpm, words: `${bpm} ${plural} per minute` };
}
