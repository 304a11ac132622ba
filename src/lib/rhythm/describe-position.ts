/**
 * Positions in words, the way musicians count them: "bar 2, beat 3 and".
 *
 * Beats are the counted beats of meter.ts (quarters in 4/4, dotted quarters in 6/8, the groups of 7/8).
 * Inside a beat of two or four parts, common counting: "1 e and a" for sixteenths, "1 trip let" for
 * triplets; inside a beat of three parts (compound meters, groups of three): "1 and a". Other positions
 * are given as the note value after the beat ("beat 2 +1/32").
 */
import { barLength, type GrooveDocument, type Meter } from "./document";
import { beatLengths } from "./meter";
import { Fraction, q, type RationalInput } from "./rational";

export interface PositionWords {
  /** 1-based written bar. */
  bar: number;
  /** 1-based counted beat in the bar. */
  beat: number;
  /** Where inside the beat, when not on it: "e", "and", "a", "trip", "let" or "+1/32". */
  sub?: string;
  text: string;
}

const DUPLE: Record<string, string> = { "1/4": "e", "1/2": "and", "3/4": "a", "1/3": "trip", "2/3": "let" };
const TRIPLE: Record<string, string> = { "1/3": "and", "2/3": "a" };

/**
 * Describe a written position (whole notes from the start of the groove) in bars and beats.
 * @example describePosition(doc44, "5/4").text // "bar 2, beat 2"
 * @example describePosition(doc44, "13/8").text // "bar 2, beat 3 and"
 */
export function describePosition(doc: Pick<GrooveDocument, "meter">, at: RationalInput): PositionWords {
  return describeInMeter(doc.meter, at);
}

/** Same as `describePosition`, from the meter alone. */
export function describeInMeter(meter: Meter, at: RationalInput): PositionWords {
  const bar = barLength(meter);
  const a = q(at);
  const barIndex = a.div(bar).floor();
  let rest = a.sub(bar.mul(barIndex));
  const lengths = beatLengths(meter);
  let beat = 0;
  while (beat < lengths.length - 1 && rest.compare(lengths[beat]!) >= 0) {
    rest = rest.sub(lengths[beat]!);
    beat++;
  }
  const len = lengths[beat] ?? new Fraction(1, meter.beatUnit);
  const parts = len.mul(meter.beatUnit); // units in this beat
  let sub: string | undefined;
  if (rest.n !== 0n) {
    const f = rest.div(len).toFraction();
    sub = (parts.equals(3) ? TRIPLE[f] : DUPLE[f]) ?? `+${rest.toFraction()}`;
  }
  const barNo = Number(barIndex.s * barIndex.n) + 1;
  const out: PositionWords = { bar: barNo, beat: beat + 1, text: `bar ${barNo}, beat ${beat + 1}${sub ? ` ${sub}` : ""}` };
  if (sub) out.sub = sub;
  return out;
}
