/**
 * The core's equivalence verdict (compareGrooves) in plain words, for the compare page and its embed: the
 * educator's sentence. Pure.
 *
 *   identical  "These two readings sound the same: 64 onsets match."
 *   offset     "These two readings sound the same: 64 onsets match, start offset one eighth note = 197 ms."
 *   different  "These two readings do not sound the same: 58 onsets match; the first differences:" + a list in
 *              bars and beats of the reading where each sound is ("bar 2, beat 3 and: snare (accent), only in B").
 */
import type { Equivalence, Mismatch } from "../rhythm/equivalence";
import { KIT_PIECES, type KitPieceId } from "../rhythm/kit";
import { valueWords } from "../rhythm/readings";

export interface VerdictWords {
  /** The readings sound the same (identical, or identical up to a start offset). */
  same: boolean;
  /** One sentence. */
  headline: string;
  /** Further sentences, or the first differences. */
  details: string[];
}

const SHARPS = ["C", "C♯", "D", "D♯", "E", "F", "F♯", "G", "G♯", "A", "A♯", "B"];

/**
 * A MIDI note number as a pitch name with octave (middle C = C4, the MIDI Manufacturers Association convention).
 * @example pitchName(60) // "C4"
 */
export function pitchName(midi: number): string {
  return `${SHARPS[((midi % 12) + 12) % 12]}${Math.floor(midi / 12) - 1}`;
}

/**
 * An offset in whole notes as a note value: "one eighth note", "one dotted quarter note", "5 sixteenths".
 * @example offsetWords("1/8") // "one eighth note"
 */
export function offsetWords(notes: string): string {
  const w = valueWords(notes);
  const single = /^an? /.exec(w);
  return single ? `one ${w.slice(single[0].length)} note` : w;
}

const ordinal = (n: number) => `${n}${n % 10 === 1 && n % 100 !== 11 ? "st" : n % 10 === 2 && n % 100 !== 12 ? "nd" : n % 10 === 3 && n % 100 !== 13 ? "rd" : "th"}`;

/**
 * One difference in words: where, what, and on which side.
 * @example mismatchWords(m, { a: "A", b: "B" }) // "bar 2, beat 3 and: snare (accent), only in B"
 */
export function mismatchWords(m: Mismatch, names: { a: string; b: string }): string {
  const colon = m.text.indexOf(":");
  const where = colon > 0 ? m.text.slice(0, colon) : `bar ${m.bar}, beat ${m.beat}`;
  let what: string;
  if (m.kind === "kit" && m.piece) {
    const detail = colon > 0 ? m.text.slice(colon + 1).replace(/ only in [ab]$/, "").trim().slice(m.piece.length).trim() : "";
    what = `${KIT_PIECES[m.piece as KitPieceId]?.name.toLowerCase() ?? m.piece}${detail ? ` ${detail}` : ""}`;
  } else {
    what = `keys ${m.pitch !== undefined ? pitchName(m.pitch) : "note"} (velocity ${m.velocity})`;
  }
  const pass = m.pass + 1 !== m.bar ? ` (${ordinal(m.pass + 1)} bar played)` : "";
  return `${where}${pass}: ${what}, only in ${m.side === "a" ? names.a : names.b}`;
}

const onsets = (n: number) => `${n} onset${n === 1 ? "" : "s"} match${n === 1 ? "es" : ""}`;

/**
 * The verdict in words.
 * @example verdictWords({ verdict: "identical", matched: 12 }).headline // "These two readings sound the same: 12 onsets match."
 */
export function verdictWords(eq: Equivalence, names: { a: string; b: string } = { a: "A", b: "B" }): VerdictWords {
  if (eq.verdict === "identical") {
    return {
      same: true,
      headline: `These two readings sound the same: ${onsets(eq.matched)}.`,
      details: ["Every sound falls at the same moment in both."],
    };
  }
  if (eq.verdict === "offset") {
    const ms = Math.round(Math.abs(eq.offsetMs));
    const value = offsetWords(eq.offsetNotes.replace(/^-/, ""));
    const later = eq.offsetSeconds > 0;
    const details = [
      `${names.b} sounds ${value} (${ms} ms) ${later ? "later" : "earlier"} than ${names.a}, the note value counted in ${names.a}'s notation; otherwise every sound matches.`,
    ];
    if (eq.rotation) details.push(`Played as loops, they are the same cycle heard from a different starting point.`);
    return { same: true, headline: `These two readings sound the same: ${onsets(eq.matched)}, start offset ${value} = ${ms} ms.`, details };
  }
  return {
    same: false,
    headline: `These two readings do not sound the same: ${onsets(eq.matched)}; the first differences are below.`,
    details: eq.mismatches.map((m) => mismatchWords(m, names)),
  };
}
