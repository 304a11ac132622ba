/** Changing the grid resolution without moving anything. */
import { barLength, RhythmError, type GrooveDocument } from "../document";
import { q, type RationalInput } from "../rational";

/**
 * Set the grid step. Nothing moves: the new step must divide the bar and every position and duration
 * (a finer grid always does when it divides the old step). Useful before displacing by less than the
 * current step, e.g. an eighth after double time turned a 1/8 grid into a 1/4 grid.
 * @example displace(setGrid(doubleTime(doc), "1/8"), "1/8")
 */
export function setGrid(doc: GrooveDocument, step: RationalInput): GrooveDocument {
  const s = q(step);
  if (s.s < 0n || s.n === 0n) throw new RhythmError(`the grid step must be positive, got ${s.toFraction()}`);
  const fits = (x: RationalInput) => q(x).div(s).d === 1n;
  if (!fits(barLength(doc.meter))) throw new RhythmError(`a grid step of ${s.toFraction()} does not divide a ${doc.meter.beatsPerBar}/${doc.meter.beatUnit} bar`);
  if (!fits(doc.grid.step)) {
    for (const lane of doc.kit.lanes)
      for (const h of lane.hits) if (!fits(h.at)) throw new RhythmError(`${lane.piece} at ${h.at} is not on a ${s.toFraction()} grid`);
    for (const n of doc.keys.notes)
      if (!fits(n.at) || !fits(n.duration)) throw new RhythmError(`the note at ${n.at} lasting ${n.duration} is not on a ${s.toFraction()} grid`);
  }
  return { ...doc, grid: { step: s.toFraction() } };
}
