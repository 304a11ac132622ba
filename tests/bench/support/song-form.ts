/**
 * The song form the exchange and notation benchmarks share: `bars` bars of 4/4 on a sixteenth grid, eight kit
 * lanes (accents, ghost notes, flams, a fill every eighth bar), a keys part on both staves (chords held across
 * beats and bar lines, a syncopated bass line) and sections with repeats. Invented data, built deterministically.
 */
import { assertGroove, type GrooveDocument, type GrooveDocumentInput } from "../../../src/lib/rhythm";

/** @example const doc = buildSongForm(1000); */
export function buildSongForm(bars: number): GrooveDocument {
  const at = (bar: number, sixteenth: number) => `${bar * 16 + sixteenth}/16`;
  const lanes: Record<string, { at: string; dynamic?: "ghost" | "normal" | "accent"; articulation?: "open" | "flam" }[]> = {
    "hihat-closed": [],
    "hihat-open": [],
    ride: [],
    crash: [],
    snare: [],
    "tom-high": [],
    "tom-floor": [],
    kick: [],
  };
  const notes: GrooveDocumentInput["keys"]["notes"] = [];
  for (let b = 0; b < bars; b++) {
    const chorus = Math.floor(b / 8) % 2 === 1;
    const fill = b % 8 === 7;
    for (let i = 0; i < 16; i++) {
      if (fill && i >= 8) {
        (i < 12 ? lanes["tom-high"] : lanes["tom-floor"])!.push({ at: at(b, i) });
        continue;
      }
      if (chorus) {
        if (i % 2 === 0) lanes.ride!.push({ at: at(b, i), dynamic: i % 4 === 0 ? "accent" : "normal" });
      } else if (i === 14) lanes["hihat-open"]!.push({ at: at(b, i) });
      else lanes["hihat-closed"]!.push({ at: at(b, i), dynamic: i % 4 === 0 ? "accent" : i % 2 ? "ghost" : "normal" });
    }
    for (const i of [0, 7, 10]) lanes.kick!.push({ at: at(b, i) });
    for (const i of fill ? [4] : [4, 12]) lanes.snare!.push({ at: at(b, i), dynamic: "accent" });
    if (!fill) lanes.snare!.push({ at: at(b, 15), dynamic: "ghost", articulation: "flam" });
    if (b % 8 === 0) lanes.crash!.push({ at: at(b, 0), dynamic: "accent" });
    // Keys: a chord held a dotted quarter, an anticipation tied over the bar line, a syncopated bass line.
    const root = 60 + ((b * 7) % 12);
    for (const p of [root, root + 4, root + 7]) notes.push({ at: at(b, 0), duration: "3/8", pitch: p, velocity: 80 });
    if (b < bars - 1) for (const p of [root + 2, root + 5]) notes.push({ at: at(b, 14), duration: "1/4", pitch: p, velocity: 92 });
    const bass = root - 24;
    notes.push({ at: at(b, 0), duration: "3/16", pitch: bass, velocity: 100 });
    notes.push({ at: at(b, 3), duration: "1/16", pitch: bass + 7, velocity: 90 });
    notes.push({ at: at(b, 6), duration: "5/16", pitch: bass + 12, velocity: 90 });
  }
  const sections: GrooveDocumentInput["sections"] = [];
  const names = ["Intro", "Verse", "Chorus", "Verse", "Chorus", "Bridge", "Chorus", "Outro"];
  for (let start = 0, k = 0; start < bars; k++) {
    const length = Math.min(k === 0 ? 8 : 16, bars - start);
    sections.push({ name: names[k % names.length]!, startBar: start, bars: length, repeats: k % 3 === 2 ? 2 : 1 });
    start += length;
  }
  return assertGroove({
    schemaVersion: 1,
    meter: { beatsPerBar: 4, beatUnit: 4 },
    tempo: { bpm: 112, beatNote: "1/4" },
    grid: { step: "1/16" },
    bars,
    sections,
    kit: { lanes: Object.entries(lanes).map(([piece, hits]) => ({ piece: piece as never, hits })) },
    keys: { notes, splitPitch: 60 },
  });
}
