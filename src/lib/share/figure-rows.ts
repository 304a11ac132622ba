/**
 * Both readings' readability figures as table rows for the lesson view, with which reading reads easier on each
 * line. Pure. What "easier" means per figure:
 *   lower is easier   syncopation (Longuet-Higgins & Lee 1984), WNBD (Gómez et al. 2005), off-beat notes
 *                     (Toussaint 2005), anticipations, symbols on the page (notes + rests + ties), events per bar
 *   higher is easier  bars with the backbeat on the weak beats, bars with a kick on beat 1 (common practice)
 *   in range          written tempo inside the usual 60–180 bpm (common practice, from memory)
 */
import type { ReadabilityFigures } from "../rhythm/readability";

export interface FigureRow {
  label: string;
  /** What the figure measures, one short sentence. */
  hint: string;
  a: string;
  b: string;
  /** The reading that reads easier on this line, or null (equal, or no preference). */
  easier: "a" | "b" | null;
}

const fmt = (x: number, digits = 2) => String(Math.round(x * 10 ** digits) / 10 ** digits);
const share = (n: number, of: number) => (of === 0 ? "—" : `${n} of ${of} bar${of === 1 ? "" : "s"}`);

function prefer(a: number | null, b: number | null, lowerIsEasier: boolean): "a" | "b" | null {
  if (a === null || b === null || Math.abs(a - b) < 1e-9) return null;
  return (a < b) === lowerIsEasier ? "a" : "b";
}

/**
 * @example figureRows(figuresA, figuresB)[0] // { label: "Written tempo", a: "76 bpm", b: "152 bpm", easier: "b", … }
 */
export function figureRows(fa: ReadabilityFigures, fb: ReadabilityFigures): FigureRow[] {
  const rows: FigureRow[] = [];
  const inRange = (f: ReadabilityFigures) => (f.tempo.inUsualRange ? 1 : 0);
  rows.push({
    label: "Written tempo",
    hint: `Beats per minute of the written beat; ${fa.tempo.range.min}–${fa.tempo.range.max} reads comfortably.`,
    a: `${fmt(fa.tempo.bpm)} bpm${fa.tempo.inUsualRange ? "" : " (outside the usual range)"}`,
    b: `${fmt(fb.tempo.bpm)} bpm${fb.tempo.inUsualRange ? "" : " (outside the usual range)"}`,
    easier: prefer(inRange(fa), inRange(fb), false),
  });
  rows.push({ label: "Meter and length", hint: "Time signature and written bars.", a: `${fa.meter}, ${fa.bars} bar${fa.bars === 1 ? "" : "s"}`, b: `${fb.meter}, ${fb.bars} bar${fb.bars === 1 ? "" : "s"}`, easier: null });
  const backbeat = (f: ReadabilityFigures) => f.backbeat.share;
  const beats = fa.backbeat.beats.length ? `beats ${fa.backbeat.beats.join(" and ")}` : "the weak beats";
  rows.push({
    label: "Backbeat in place",
    hint: `Bars whose snare or cross-stick lands on ${beats}, of the bars with a snare.`,
    a: share(fa.backbeat.barsWithBackbeat, fa.backbeat.barsWithSnare),
    b: share(fb.backbeat.barsWithBackbeat, fb.backbeat.barsWithSnare),
    easier: prefer(backbeat(fa), backbeat(fb), false),
  });
  rows.push({
    label: "Kick on beat 1",
    hint: "Bars with a kick on the downbeat, of the bars with a kick.",
    a: share(fa.downbeatKick.barsWithKickOnOne, fa.downbeatKick.barsWithKick),
    b: share(fb.downbeatKick.barsWithKickOnOne, fb.downbeatKick.barsWithKick),
    easier: prefer(fa.downbeatKick.share, fb.downbeatKick.share, false),
  });
  const ink = (f: ReadabilityFigures) => (f.notation ? f.notation.notes + f.notation.rests + f.notation.ties : null);
  rows.push({
    label: "Symbols on the page",
    hint: "Notes, rests and ties the reader takes in.",
    a: fa.notation ? `${fa.notation.notes} notes, ${fa.notation.rests} rests, ${fa.notation.ties} ties` : "—",
    b: fb.notation ? `${fb.notation.notes} notes, ${fb.notation.rests} rests, ${fb.notation.ties} ties` : "—",
    easier: prefer(ink(fa), ink(fb), true),
  });
  rows.push({
    label: "Syncopation",
    hint: "Longuet-Higgins & Lee: how strongly notes fall before stronger silent beats (all parts).",
    a: `${fmt(fa.overall.lhl)} (${fa.overall.lhlSyncopations} syncopated)`,
    b: `${fmt(fb.overall.lhl)} (${fb.overall.lhlSyncopations} syncopated)`,
    easier: prefer(fa.overall.lhl, fb.overall.lhl, true),
  });
  rows.push({
    label: "Distance from the beat",
    hint: "Weighted note-to-beat distance (WNBD), mean per onset.",
    a: fmt(fa.overall.wnbd),
    b: fmt(fb.overall.wnbd),
    easier: prefer(fa.overall.wnbd, fb.overall.wnbd, true),
  });
  rows.push({
    label: "Off-beat notes",
    hint: "Off-beatness: onsets on pulses that share no divisor with the bar.",
    a: fmt(fa.overall.offBeatness, 0),
    b: fmt(fb.overall.offBeatness, 0),
    easier: prefer(fa.overall.offBeatness, fb.overall.offBeatness, true),
  });
  rows.push({
    label: "Anticipations",
    hint: "Off-beat notes held over the next beat.",
    a: fmt(fa.overall.anticipations, 0),
    b: fmt(fb.overall.anticipations, 0),
    easier: prefer(fa.overall.anticipations, fb.overall.anticipations, true),
  });
  return rows;
}
