/**
 * Property tests of notation spelling over random valid groove documents (fast-check).
 *
 * What must hold for every valid document:
 * - spelling never throws;
 * - every voice of every bar adds up exactly to the bar length, using the written values (type, dots and
 *   tuplet ratio), and each event's `at`/`duration` agree with those values;
 * - only real note values (MusicXML note types, at most one dot);
 * - beams and tuplets never cross a beat group; beams join notes of an eighth or shorter only;
 * - ties join the same pitch, and nothing else;
 * - the sound is kept: the onsets of kit hits and keys notes and the spans that keys notes sound are exactly
 *   those of the document;
 * - rests are never dotted in simple time (OpenLearn 2016, 4.2, via the project's reference notes);
 * - `spellBars` gives the same bars as `spellGroove`.
 * Apart from the rests rule, these are the notation model's own promises (notation/model.ts) and common
 * practice (beams join flagged notes only; a tie joins two notes of the same pitch).
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  Fraction,
  NOTE_TYPES,
  isBeamable,
  q,
  spellBars,
  spellGroove,
  valueLength,
  type GrooveDocument,
  type KeysHead,
  type KitHead,
  type Meter,
  type NotationScore,
  type NoteEvent,
  type VoiceEvent,
} from "../../../src/lib/rhythm";
import { METERS, grooveArb } from "./arbitraries";

/** The shared arbitrary's meters plus a few more the spelling must survive (ungrouped odd meters, long beat units). */
const MORE_METERS: readonly Meter[] = [
  ...METERS,
  { beatsPerBar: 5, beatUnit: 8 },
  { beatsPerBar: 7, beatUnit: 8 },
  { beatsPerBar: 6, beatUnit: 4 },
  { beatsPerBar: 3, beatUnit: 2 },
  { beatsPerBar: 4, beatUnit: 2 },
  { beatsPerBar: 4, beatUnit: 4, grouping: [2, 2] },
  { beatsPerBar: 8, beatUnit: 8, grouping: [3, 3, 2] },
  { beatsPerBar: 2, beatUnit: 16 },
  { beatsPerBar: 2, beatUnit: 1 },
  { beatsPerBar: 15, beatUnit: 16 },
  { beatsPerBar: 5, beatUnit: 8, grouping: [5] },
  { beatsPerBar: 4, beatUnit: 4, grouping: [3, 1] },
];
/** Plain, triplet, quintuplet, septuplet and odd-length steps (quarter triplets 1/6, dotted eighths 3/16). */
const MORE_GRIDS = ["1/4", "1/8", "1/16", "1/32", "1/12", "1/24", "1/20", "1/48", "1/6", "1/28", "1/40", "3/16"];

const docs = () => grooveArb({ meters: MORE_METERS, grids: MORE_GRIDS, maxBars: 4 });
const RUNS = { numRuns: 200 };
/** Generous: property runs share two cores with the rest of the suite. */
const TIMEOUT = 60_000;

type Voice = { name: string; bar: number; barStart: Fraction; length: Fraction; events: readonly VoiceEvent[] };

function voices(score: NotationScore): Voice[] {
  return score.bars.flatMap((b) => {
    const common = { bar: b.index, barStart: q(b.start), length: q(b.length) };
    const vs: Voice[] = [
      { ...common, name: "kit up", events: b.kit.up },
      { ...common, name: "kit down", events: b.kit.down },
    ];
    if (b.keys) vs.push({ ...common, name: "treble", events: b.keys.treble }, { ...common, name: "bass", events: b.keys.bass });
    return vs;
  });
}

/** Beat groups of a bar as [start, end) in whole notes. */
function groupSpans(score: NotationScore): [Fraction, Fraction][] {
  const unit = new Fraction(1, score.meter.beatUnit);
  let at = new Fraction(0);
  return score.meter.grouping.map((g) => {
    const span: [Fraction, Fraction] = [at, at.add(unit.mul(g))];
    at = span[1];
    return span;
  });
}

function within(spans: [Fraction, Fraction][], from: Fraction, to: Fraction): boolean {
  return spans.some(([s, e]) => from.compare(s) >= 0 && to.compare(e) <= 0);
}

describe("notation spelling: properties over random valid documents", () => {
  it("never throws, and every voice of every bar sums exactly to the bar length by its written values", () => {
    fc.assert(
      fc.property(docs(), (doc) => {
        const score = spellGroove(doc);
        expect(score.bars).toHaveLength(doc.bars);
        for (const v of voices(score)) {
          let at = new Fraction(0);
          let sum = new Fraction(0);
          for (const ev of v.events) {
            expect(q(ev.at).equals(at), `${v.name} bar ${v.bar}: events are contiguous`).toBe(true);
            const len = ev.kind === "rest" && ev.measure ? v.length : valueLength(ev.value, ev.tuplet);
            expect(q(ev.duration).equals(len), `${v.name} bar ${v.bar}: duration matches value`).toBe(true);
            sum = sum.add(len);
            at = at.add(q(ev.duration));
          }
          expect(sum.equals(v.length), `${v.name} bar ${v.bar}: sums to the bar`).toBe(true);
        }
      }),
      RUNS,
    );
  }, TIMEOUT);

  it("writes only real note values, one dot at most, and a measure rest only alone", () => {
    fc.assert(
      fc.property(docs(), (doc) => {
        for (const v of voices(spellGroove(doc))) {
          for (const ev of v.events) {
            expect(NOTE_TYPES).toContain(ev.value.type);
            expect([0, 1]).toContain(ev.value.dots);
            if (ev.kind === "rest" && ev.measure) {
              expect(v.events).toHaveLength(1);
              expect(ev.value).toEqual({ type: "whole", dots: 0 }); // a whole-bar rest is a whole rest in any meter
            }
          }
        }
      }),
      RUNS,
    );
  }, TIMEOUT);

  it("never lets a beam or a tuplet cross a beat group, and beams only eighths or shorter", () => {
    fc.assert(
      fc.property(docs(), (doc) => {
        const score = spellGroove(doc);
        const spans = groupSpans(score);
        for (const v of voices(score)) {
          const beams = new Map<number, NoteEvent[]>();
          const tuplets = new Map<number, VoiceEvent[]>();
          for (const ev of v.events) {
            if (ev.kind === "note" && ev.beam !== undefined) beams.set(ev.beam, [...(beams.get(ev.beam) ?? []), ev]);
            if (ev.tuplet) tuplets.set(ev.tuplet.group, [...(tuplets.get(ev.tuplet.group) ?? []), ev]);
          }
          for (const members of [...beams.values(), ...tuplets.values()]) {
            expect(members.length).toBeGreaterThanOrEqual(2);
            const from = q(members[0]!.at);
            const last = members[members.length - 1]!;
            const to = q(last.at).add(q(last.duration));
            expect(within(spans, from, to), `${v.name} bar ${v.bar}: group ${from.toFraction()}–${to.toFraction()}`).toBe(true);
          }
          for (const members of beams.values()) for (const ev of members) expect(isBeamable(ev.value)).toBe(true);
          for (const members of tuplets.values()) {
            expect(members[0]!.tuplet!.position).toBe("start");
            expect(members[members.length - 1]!.tuplet!.position).toBe("end");
          }
        }
      }),
      RUNS,
    );
  }, TIMEOUT);

  it("ties join the same pitch into the next note, across bar lines too; kit notes are never tied", () => {
    fc.assert(
      fc.property(docs(), (doc) => {
        const score = spellGroove(doc);
        for (const staff of ["treble", "bass"] as const) {
          const notes = score.bars.flatMap((b) => (b.keys ? b.keys[staff] : []));
          notes.forEach((ev, i) => {
            if (ev.kind !== "note") return;
            const next = notes[i + 1];
            const prev = notes[i - 1];
            for (const h of ev.heads as KeysHead[]) {
              if (h.tieStart) {
                expect(next?.kind).toBe("note");
                const partner = (next as NoteEvent).heads.find((x) => (x as KeysHead).midi === h.midi) as KeysHead | undefined;
                expect(partner?.tieStop, `${staff}: tie from ${h.midi}`).toBe(true);
              }
              if (h.tieStop) {
                expect(prev?.kind).toBe("note");
                const partner = (prev as NoteEvent).heads.find((x) => (x as KeysHead).midi === h.midi) as KeysHead | undefined;
                expect(partner?.tieStart, `${staff}: tie into ${h.midi}`).toBe(true);
              }
            }
          });
        }
        // Kit notes are never tied and stay short: a dotted quarter at most (drum notation writes short values).
        for (const b of score.bars)
          for (const ev of [...b.kit.up, ...b.kit.down])
            if (ev.kind === "note") {
              for (const h of ev.heads) expect(h.tieStart || h.tieStop).toBe(false);
              expect(valueLength(ev.value).compare("3/8")).toBeLessThanOrEqual(0);
            }
      }),
      RUNS,
    );
  }, TIMEOUT);

  it("keeps the sound: every onset is written, and keys notes sound exactly as long as in the document", () => {
    fc.assert(
      fc.property(docs(), (doc) => {
        const score = spellGroove(doc);
        // Kit: written onsets are the document's hits, piece by piece.
        const docHits = doc.kit.lanes.flatMap((l) => l.hits.map((h) => `${l.piece}@${h.at}`)).sort();
        const written = score.bars
          .flatMap((b) =>
            [...b.kit.up, ...b.kit.down].flatMap((ev) =>
              ev.kind === "note" ? (ev.heads as KitHead[]).map((h) => `${h.piece}@${q(b.start).add(q(ev.at)).toFraction()}`) : [],
            ),
          )
          .sort();
        expect(written).toEqual(docHits);
        // Keys: onsets (heads not tied into) and the union of sounding spans, pitch by pitch.
        const docOnsets = doc.keys.notes.map((n) => `${n.pitch}@${n.at}`).sort();
        const wOnsets: string[] = [];
        const spans = new Map<number, [Fraction, Fraction][]>();
        const docSpans = new Map<number, [Fraction, Fraction][]>();
        for (const n of doc.keys.notes) docSpans.set(n.pitch, [...(docSpans.get(n.pitch) ?? []), [q(n.at), q(n.at).add(q(n.duration))]]);
        for (const b of score.bars) {
          if (!b.keys) continue;
          for (const ev of [...b.keys.treble, ...b.keys.bass]) {
            if (ev.kind !== "note") continue;
            const at = q(b.start).add(q(ev.at));
            for (const h of ev.heads as KeysHead[]) {
              if (!h.tieStop) wOnsets.push(`${h.midi}@${at.toFraction()}`);
              spans.set(h.midi, [...(spans.get(h.midi) ?? []), [at, at.add(q(ev.duration))]]);
            }
          }
        }
        expect(wOnsets.sort()).toEqual(docOnsets);
        expect(new Set(spans.keys())).toEqual(new Set(docSpans.keys()));
        for (const [pitch, list] of docSpans) expect(union(spans.get(pitch)!), `pitch ${pitch}`).toEqual(union(list));
      }),
      RUNS,
    );
  }, TIMEOUT);

  it("writes no dotted rests in simple time", () => {
    fc.assert(
      fc.property(docs(), (doc) => {
        const score = spellGroove(doc);
        const simple = score.meter.grouping.every((g) => (g & (g - 1)) === 0);
        if (!simple) return;
        for (const v of voices(score)) for (const ev of v.events) if (ev.kind === "rest") expect(ev.value.dots).toBe(0);
      }),
      RUNS,
    );
  }, TIMEOUT);

  it("spells a range of bars exactly as the whole groove spells them", () => {
    fc.assert(
      fc.property(
        docs().chain((doc) => fc.tuple(fc.constant(doc), fc.integer({ min: 0, max: doc.bars - 1 }), fc.integer({ min: 1, max: doc.bars }))),
        ([doc, from, count]: [GrooveDocument, number, number]) => {
          const to = Math.min(doc.bars, from + count);
          // A fresh copy so the per-document cache cannot make the two calls agree by construction.
          const copy = structuredClone(doc);
          expect(spellBars(copy, from, to)).toEqual(spellGroove(doc).bars.slice(from, to));
        },
      ),
      { numRuns: 150 },
    );
  }, TIMEOUT);
});

/** Union of half-open spans as canonical strings, for comparing what sounds. */
function union(spans: [Fraction, Fraction][]): string[] {
  const sorted = [...spans].sort((a, b) => a[0].compare(b[0]));
  const out: [Fraction, Fraction][] = [];
  for (const [s, e] of sorted) {
    const last = out[out.length - 1];
    if (last && s.compare(last[1]) <= 0) last[1] = e.compare(last[1]) > 0 ? e : last[1];
    else out.push([s, e]);
  }
  return out.map(([s, e]) => `${s.toFraction()}-${e.toFraction()}`);
}
