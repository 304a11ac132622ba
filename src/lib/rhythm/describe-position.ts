/**
 * Positions and note values in words, the way musicians say them: "bar 2, beat 3 and", "a dotted eighth".
 *
 * Beats are the counted beats of meter.ts (quarters in 4/4, dotted quarters in 6/8, the groups of 7/8).
 * Inside a beat of two or four parts, common counting: "1 e and a" for sixteenths, "1 trip let" for
 * triplets; inside a beat of three parts (compound meters, groups of three): "1 and a". Other positions
 * are given as the note value after the beat ("beat 2 +1/32").
 */
import { barLength, type GrooveDocument, type Meter } from "./document";
import { beatLengths } from "./meter";
import { Fraction, q, type Rational, type RationalInput } from "./rational";

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

/**
 * Same as `describePosition`, from the meter alone.
 * @example describeInMeter({ beatsPerBar: 6, beatUnit: 8 }, "1/2").text // "bar 1, beat 2 and"
 */
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

const VALUE_NAMES: [Rational, string, string][] = [
  ["1", "a whole note", "whole notes"],
  ["3/4", "a dotted half", "dotted halves"],
  ["1/2", "a half note", "half notes"],
  ["3/8", "a dotted quarter", "dotted quarters"],
  ["1/4", "a quarter", "quarters"],
  ["1/6", "a quarter-note triplet", "quarter-note triplets"],
  ["3/16", "a dotted eighth", "dotted eighths"],
  ["1/8", "an eighth", "eighths"],
  ["1/12", "an eighth-note triplet", "eighth-note triplets"],
  ["1/16", "a sixteenth", "sixteenths"],
  ["1/24", "a sixteenth-note triplet", "sixteenth-note triplets"],
  ["1/32", "a thirty-second", "thirty-seconds"],
  ["1/48", "a thirty-second triplet", "thirty-second triplets"],
  ["1/64", "a sixty-fourth", "sixty-fourths"],
];

/**
 * A note value in words: "an eighth", "a dotted quarter", "5 sixteenths".
 * @example valueWords("3/16") // "a dotted eighth"
 */
export function valueWords(x: RationalInput): string {
  const v = q(x).abs();
  for (const [r, one] of VALUE_NAMES) if (v.equals(q(r))) return one;
  for (const [r, , many] of VALUE_NAMES) {
    const n = v.div(q(r));
    if (n.d === 1n && !r.startsWith("3/")) return `${n.toFraction()} ${many}`;
  }
  return `${v.toFraction()} of a whole note`;
}
