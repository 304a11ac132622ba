/**
 * One-line descriptions of a groove for link previews and oEmbed titles (pure).
 */
import type { GrooveDocument } from "../rhythm/document";

/**
 * @example grooveSummary(doc) // "4/4 at 96 bpm, 2 bars, drum kit and keys"
 */
export function grooveSummary(doc: Pick<GrooveDocument, "meter" | "tempo" | "bars" | "keys">): string {
  const [n, d] = doc.tempo.bpm.split("/").map(Number) as [number, number | undefined];
  const bpm = Math.round((d ? n / d : n) * 100) / 100;
  const parts = doc.keys.notes.length > 0 ? "drum kit and keys" : "drum kit";
  return `${doc.meter.beatsPerBar}/${doc.meter.beatUnit} at ${bpm} bpm, ${doc.bars} bar${doc.bars === 1 ? "" : "s"}, ${parts}`;
}

/**
 * The description of a link preview.
 * @example previewDescription("Salt Road", "Odile Marsh", doc) // "6/8 at 58 bpm, 2 bars, drum kit and keys. Notation by Odile Marsh on Tactus: open it to hear it."
 */
export function previewDescription(ownerName: string, doc: Pick<GrooveDocument, "meter" | "tempo" | "bars" | "keys">): string {
  return `${grooveSummary(doc)}. Notation by ${ownerName} on Tactus: open it to hear it.`;
}
