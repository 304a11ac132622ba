/**
 * What a printed chart says above the music, in words: tempo, meter, swing and song form.
 * Note names are the common American ones ("quarter note"), the usual words on charts in English.
 */
import type { GrooveDocument } from "../rhythm/document";
import { beatLengths } from "../rhythm/meter";
import { noteValueOf } from "../rhythm/notation/durations";
import { q } from "../rhythm/rational";

const NOTE_WORDS: Record<string, string> = {
  whole: "whole note",
  half: "half note",
  quarter: "quarter note",
  eighth: "eighth note",
  "16th": "sixteenth note",
  "32nd": "thirty-second note",
};

/** "96", "75.5": a tempo for print, at most two decimals. */
export function bpmText(bpm: string): string {
  return String(Math.round(q(bpm).valueOf() * 100) / 100);
}

/**
 * The tempo in words.
 * @example tempoText({ bpm: "58", beatNote: "3/8" }) // "58 bpm (dotted quarter note)"
 */
export function tempoText(tempo: GrooveDocument["tempo"]): string {
  const value = noteValueOf(tempo.beatNote);
  const word = value && NOTE_WORDS[value.type] ? `${value.dots ? "dotted " : ""}${NOTE_WORDS[value.type]}` : `${tempo.beatNote} of a whole note`;
  return `${bpmText(tempo.bpm)} bpm (${word})`;
}

/**
 * The meter, with the grouping of its beats when the groups differ (how the notation beams it).
 * @example meterText({ beatsPerBar: 7, beatUnit: 8, grouping: [2, 2, 3] }) // "7/8 (2+2+3)"
 * @example meterText({ beatsPerBar: 6, beatUnit: 8 }) // "6/8"
 */
export function meterText(meter: GrooveDocument["meter"]): string {
  const base = `${meter.beatsPerBar}/${meter.beatUnit}`;
  const groups = beatLengths(meter).map((f) => f.mul(meter.beatUnit).valueOf());
  return groups.some((g) => g !== groups[0]) ? `${base} (${groups.join("+")})` : base;
}

/** "Swung eighths, 2:1", or null when straight. */
export function swingText(swing: GrooveDocument["swing"]): string | null {
  if (swing.ratio === 0.5) return null;
  const unit = swing.unit === "1/8" ? "eighths" : swing.unit === "1/16" ? "sixteenths" : `${swing.unit} notes`;
  for (let d = 2; d <= 100; d++) {
    const n = Math.round(swing.ratio * d);
    if (Math.abs(n / d - swing.ratio) < 1e-6) return `Swung ${unit}, ${n}:${d - n}`;
  }
  return `Swung ${unit}, ${Math.round(swing.ratio * 100)}%`;
}

/** "Verse ×4 · Chorus", or null without sections. */
export function formText(sections: GrooveDocument["sections"]): string | null {
  if (sections.length === 0) return null;
  return sections.map((s) => (s.repeats > 1 ? `${s.name} ×${s.repeats}` : s.name)).join(" · ");
}
