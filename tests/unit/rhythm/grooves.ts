/**
 * Small grooves and checks shared by the rhythm core's tests (invented data; the patterns are common practice).
 */
import { expect } from "vitest";
import { assertGroove, emptyGroove, parseGroove, type GrooveDocument, type GrooveDocumentInput } from "../../../src/lib/rhythm";

/** Hits at the given positions, normal dynamic. */
export const hits = (...at: string[]) => at.map((a) => ({ at: a }));

type Lane = { piece: string; hits: { at: string; dynamic?: "ghost" | "normal" | "accent" }[] };

/**
 * A valid, normalised document: the empty groove (one bar of 4/4 at 96 bpm, sixteenth grid) with a patch;
 * `lanes` is a shortcut for `kit.lanes`.
 */
export function groove(patch: Partial<GrooveDocumentInput> & { lanes?: Lane[] } = {}): GrooveDocument {
  const { lanes, ...rest } = patch;
  return assertGroove({ ...emptyGroove(), ...(lanes ? { kit: { lanes } } : {}), ...rest } as GrooveDocumentInput);
}

/** Asserts the document passes validation (listing the issues when it does not) and returns it. */
export function valid(doc: GrooveDocument): GrooveDocument {
  const r = parseGroove(doc);
  expect(r.ok ? [] : r.issues).toEqual([]);
  return doc;
}

/**
 * The common-practice rock beat in 4/4 on a sixteenth grid: hi-hat eighths, snare on 2 and 4, kick on 1 and 3,
 * repeated over `bars`; `shift` moves everything by that many sixteenths inside the loop (wrapping).
 */
export function rockBeat({ bpm = "120", bars = 1, shift = 0 }: { bpm?: string; bars?: number; shift?: number } = {}): GrooveDocument {
  const total = 16 * bars;
  const at = (sixteenths: number[]) =>
    Array.from({ length: bars }, (_, b) => sixteenths.map((s) => `${(((b * 16 + s + shift) % total) + total) % total}/16`)).flat();
  return groove({
    bars,
    tempo: { bpm, beatNote: "1/4" },
    lanes: [
      { piece: "hihat-closed", hits: hits(...at([0, 2, 4, 6, 8, 10, 12, 14])) },
      { piece: "snare", hits: hits(...at([4, 12])) },
      { piece: "kick", hits: hits(...at([0, 8])) },
    ],
  });
}
