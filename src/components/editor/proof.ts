/** The core's equivalence verdict in plain words, for the renotation preview. */
import type { compareGrooves } from "../../lib/rhythm";
import { valueWords } from "../../lib/rhythm/readings";

export type Equivalence = ReturnType<typeof compareGrooves>;

/**
 * The proof in plain words.
 * @example proofText({ verdict: "offset", matched: 64, offsetNotes: "1/8", offsetMs: 200, … }) // "Same sound: 64 onsets match, start offset 1/8 (an eighth) = 200 ms."
 */
export function proofText(eq: Equivalence): { same: boolean; text: string; details: string[] } {
  if (eq.verdict === "identical") return { same: true, text: `Same sound: ${eq.matched} onsets match at the same times.`, details: [] };
  if (eq.verdict === "offset") {
    const ms = Math.round(Math.abs(eq.offsetMs) * 10) / 10;
    const dir = eq.offsetMs < 0 ? "earlier" : "later";
    const notes = eq.offsetNotes.replace(/^-/, "");
    return {
      same: true,
      text: `Same sound: ${eq.matched} onsets match, start offset ${notes} (${valueWords(notes)}) = ${ms} ms ${dir}${eq.rotation ? ", the loop heard from another point" : ""}.`,
      details: [],
    };
  }
  return {
    same: false,
    text: `Different sound: ${eq.matched} onsets match, ${eq.mismatches.length}${eq.mismatches.length >= 10 ? "+" : ""} do not. First differences:`,
    details: eq.mismatches.slice(0, 5).map((m) => m.text),
  };
}

