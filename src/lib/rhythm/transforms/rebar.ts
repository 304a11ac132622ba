/**
 * Re-bar: write the same onsets under another meter (4/4 ↔ 2/2, two bars of 4/4 ↔ one of 8/4, 3/4 ↔ 6/8).
 */
import { barLength, grooveLength, meterSchema, RhythmError, type GrooveDocument, type Meter } from "../document";
import { naturalBeatNote, timeSignature } from "../meter";
import { Fraction, q } from "../rational";
import { isStraight, swingTilesBar } from "../swing";
import { checkBars, checkBpm, mixed, scaleSections, whole } from "./common";

/**
 * Change the meter keeping every position in whole notes, so every onset keeps its time in seconds.
 * Bars and sections are recounted; the tempo marking moves to the new meter's natural beat note (a dotted
 * value in compound meters) with the bpm adjusted so the duration of each note value is unchanged
 * (4/4 quarter = 120 → 2/2 half = 60; 3/4 quarter = 120 → 6/8 dotted quarter = 80). A meter with the same
 * time signature (only the grouping differs) keeps the tempo marking as it is.
 *
 * Throws a RhythmError when the groove does not fill whole bars of the new meter, a section would not start
 * on a barline, the grid does not divide the new bar, or swing pairs would stop lining up with the barlines.
 *
 * @example rebar(doc, { beatsPerBar: 2, beatUnit: 2 }) // 4/4 at quarter = 120 → 2/2 at half = 60
 */
export function rebar(doc: GrooveDocument, meter: Meter): GrooveDocument {
  const parsed = meterSchema.safeParse(meter);
  if (!parsed.success) throw new RhythmError(`invalid meter: ${parsed.error.issues.map((i) => `${i.path.join(".") || "meter"}: ${i.message}`).join("; ")}`);
  const m: Meter = parsed.data;
  if (m.grouping && m.grouping.reduce((a, b) => a + b, 0) !== m.beatsPerBar)
    throw new RhythmError(`grouping ${m.grouping.join("+")} does not add up to ${m.beatsPerBar} beats`);
  const sig = timeSignature(m);
  const oldBar = barLength(doc.meter);
  const newBar = barLength(m);
  const total = grooveLength(doc);
  const ratio = oldBar.div(newBar);
  const bars = whole(total.div(newBar), (x) =>
    `${doc.bars} bar${doc.bars === 1 ? "" : "s"} of ${timeSignature(doc.meter)} make ${mixed(x)} bars of ${sig}; add bars first so the groove fills whole bars`);
  checkBars(bars, `re-barring to ${sig}`);
  if (newBar.div(q(doc.grid.step)).d !== 1n)
    throw new RhythmError(`the ${doc.grid.step} grid does not divide a bar of ${sig}`);
  const sections = scaleSections(doc.sections, ratio, `re-barring to ${sig}`);
  if (!isStraight(doc.swing) && !oldBar.equals(newBar) && !(swingTilesBar(doc.swing, doc.meter) && swingTilesBar(doc.swing, m)))
    throw new RhythmError(`with ${doc.swing.unit} swing, bars of ${sig} would cut swing pairs and change the feel; make the groove straight first`);

  let tempo = doc.tempo;
  if (m.beatsPerBar !== doc.meter.beatsPerBar || m.beatUnit !== doc.meter.beatUnit) {
    const beatNote = q(naturalBeatNote(m));
    const bpm: Fraction = q(doc.tempo.bpm).mul(q(doc.tempo.beatNote)).div(beatNote);
    checkBpm(bpm, `re-barring to ${sig}`);
    tempo = { bpm: bpm.toFraction(), beatNote: beatNote.toFraction() };
  }
  return { ...doc, meter: m, tempo, bars, sections };
}
