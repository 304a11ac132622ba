/**
 * Rescale: write the same sound with every note value multiplied by k and the tempo multiplied by k
 * (k = 2 is double time, k = 1/2 half time). Common practice: doubling the tempo and every duration leaves
 * the sound unchanged.
 */
import { barLength, RhythmError, type GrooveDocument } from "../document";
import { q, type RationalInput } from "../rational";
import { isStraight, swingTilesBar } from "../swing";
import { TickCodec } from "../ticks";
import { checkBars, checkBpm, factorWords, mixed, scaleSections, whole } from "./common";

/**
 * Multiply every position and duration by `factor` and the tempo by the same factor, so every onset keeps
 * its time in seconds. The meter is kept; the bar count, grid step, swing unit and sections follow.
 *
 * Throws a RhythmError (saying why) when the result cannot be written: the bar count or a section would
 * not be whole, the new grid step would not divide the bar, the tempo would leave 10–1000 bpm, or swing
 * pairs would stop lining up with the barlines. Exact: `rescale(rescale(d, k), 1/k)` deep-equals `d`.
 *
 * @example rescale(doc, 2) // 1 bar of 4/4 at 75 → 2 bars of 4/4 at 150, an eighth becomes a quarter
 */
export function rescale(doc: GrooveDocument, factor: RationalInput): GrooveDocument {
  const k = q(factor);
  if (k.s < 0n || k.n === 0n) throw new RhythmError(`the rescale factor must be positive, got ${k.toFraction()}`);
  const why = factorWords(k);
  const bar = barLength(doc.meter);
  const bars = whole(k.mul(doc.bars), (x) => `${why} a ${doc.bars}-bar groove gives ${mixed(x)} bars; add a bar or re-bar first`);
  checkBars(bars, `${why} a ${doc.bars}-bar groove`);
  const step = q(doc.grid.step).mul(k);
  if (bar.div(step).d !== 1n)
    throw new RhythmError(`${why} turns the ${doc.grid.step} grid into ${step.toFraction()} steps, which do not divide a ${doc.meter.beatsPerBar}/${doc.meter.beatUnit} bar`);
  const bpm = q(doc.tempo.bpm).mul(k);
  checkBpm(bpm, `${why} ${mixed(doc.tempo.bpm)} bpm`);
  const swing = { ...doc.swing, unit: q(doc.swing.unit).mul(k).toFraction() };
  if (!isStraight(doc.swing) && !(swingTilesBar(doc.swing, doc.meter) && swingTilesBar(swing, doc.meter)))
    throw new RhythmError(`${why} with ${doc.swing.unit} swing would put swing pairs across the barlines and change the feel; make the groove straight first`);
  const sections = scaleSections(doc.sections, k, why);

  const from = new TickCodec(doc.grid.step);
  const to = new TickCodec(step);
  const map = (s: string) => to.fromTicks(from.toTicks(s));
  return {
    ...doc,
    tempo: { ...doc.tempo, bpm: bpm.toFraction() },
    grid: { step: step.toFraction() },
    swing,
    bars,
    sections,
    kit: { lanes: doc.kit.lanes.map((l) => ({ ...l, hits: l.hits.map((h) => ({ ...h, at: map(h.at) })) })) },
    keys: { ...doc.keys, notes: doc.keys.notes.map((n) => ({ ...n, at: map(n.at), duration: map(n.duration) })) },
  };
}

/**
 * Double time: the same sound written with every value doubled and the tempo doubled.
 * @example doubleTime(doc).tempo.bpm // "150" when doc was at 75
 */
export function doubleTime(doc: GrooveDocument): GrooveDocument {
  return rescale(doc, 2);
}

/**
 * Half time: the same sound written with every value halved and the tempo halved.
 * @example halfTime(doubleTime(doc)) // deep-equals doc
 */
export function halfTime(doc: GrooveDocument): GrooveDocument {
  return rescale(doc, "1/2");
}
