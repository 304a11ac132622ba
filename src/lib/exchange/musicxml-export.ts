/**
 * MusicXML 4.0 export (score-partwise) from the core's notation model, written by xmlbuilder2.
 *
 * Facts from the MusicXML 4.0 schema and specification (W3C Music Notation Community Group), as listed in the
 * project's reference notes:
 * - percussion part: `<clef><sign>percussion</sign></clef>`, unpitched notes with `display-step`/`display-octave`
 *   (read as in treble clef) at the positions the notation model gives (kit-staff.ts, after the PAS guide),
 *   noteheads from the model (x, circle-x, diamond, triangle), hands in voice 1 stems up, feet in voice 2 stems
 *   down, laid out with `<backup>`; a `score-instrument` per kit piece with a `midi-instrument` on channel 10
 *   whose `midi-unpitched` is the General MIDI key + 1 (MusicXML numbers them 1–128);
 * - keys part on two staves (treble and bass clef), one voice each, ties (`<tie>` and `<tied>`), accidentals;
 * - tuplets as `time-modification` plus `<tuplet>` notations; beams from the model's beam groups, with one
 *   `<beam>` per beam level (begin / continue / end, hooks for lone short notes);
 * - tempo as a metronome direction and `<sound tempo>` (quarter notes per minute); swing as `<sound><swing>`;
 * - element order inside `<note>`: grace, chord, pitch/unpitched/rest, duration, tie, instrument, voice, type,
 *   dot, accidental, time-modification, stem, notehead, staff, beam, notations.
 * `<divisions>` (per quarter note) is the least common multiple that makes every duration a whole number.
 *
 * xmlbuilder2 writes every element. It takes several microseconds per element, so the notes of a bar are written
 * once per distinct bar content and reused for identical bars (a song repeats its grooves): a 1,000-bar song
 * form stays well under a second.
 */
import { create, fragment } from "xmlbuilder2";
import type { XMLBuilder } from "xmlbuilder2/lib/interfaces";
import type { GrooveDocument } from "../rhythm/document";
import { KIT_PIECES, KIT_ROW_ORDER, type KitPieceId } from "../rhythm/kit";
import { NOTE_TYPES, type KeysHead, type KitHead, type NotationBar, type NotationScore, type NoteEvent, type NoteValue, type VoiceEvent } from "../rhythm/notation/model";
import { spellGroove } from "../rhythm/notation/spell";
import { q } from "../rhythm/rational";


/** Largest `<divisions>` written (common practice: readers expect a 16-bit value). */
export const MAX_DIVISIONS = 16383;
export const KIT_PART_ID = "P1";
export const KEYS_PART_ID = "P2";

export interface MusicXmlOptions {
  title?: string;
  /** Names for the credits; each is written only when given. */
  credits?: { composer?: string; arranger?: string; transcriber?: string; rights?: string };
  /** Encoding date (injected for reproducible files); today when absent. */
  date?: Date;
}

/**
 * Export a groove document as MusicXML 4.0 (partwise), through `spellGroove`.
 * @example exportMusicXml(doc, { title: "Salt Road" }).includes("<sign>percussion</sign>") // true
 */
export function exportMusicXml(doc: GrooveDocument, options: MusicXmlOptions = {}): string {
  return scoreToMusicXml(spellGroove(doc), options);
}

const gcd = (a: number, b: number): number => {
  while (b) [a, b] = [b, a % b];
  return a;
};

/** Numerator and denominator of a canonical rational string. */
function parts(r: string): [number, number] {
  const i = r.indexOf("/");
  return i < 0 ? [Number(r), 1] : [Number(r.slice(0, i)), Number(r.slice(i + 1))];
}

/**
 * Divisions per quarter note that make every event's duration whole.
 * @example musicXmlDivisions(spellGroove(sixteenthsAndTriplets)) // 12
 */
export function musicXmlDivisions(score: NotationScore): number {
  const seen = new Set<string>();
  let div = 1;
  const visit = (events: readonly VoiceEvent[]) => {
    for (const e of events) {
      if (seen.has(e.duration)) continue;
      seen.add(e.duration);
      const [n, d] = parts(e.duration);
      const den = d / gcd(4 * n, d); // quarters = 4n/d
      div = (div / gcd(div, den)) * den;
    }
  };
  for (const bar of score.bars) {
    visit(bar.kit.up);
    visit(bar.kit.down);
    if (bar.keys) {
      visit(bar.keys.treble);
      visit(bar.keys.bass);
    }
  }
  if (div > MAX_DIVISIONS) throw new RangeError(`this groove needs ${div} divisions per quarter note; MusicXML readers accept at most ${MAX_DIVISIONS}`);
  return div;
}

/** Decimal text for a tempo (at most three decimals, no trailing zeros). */
function decimal(x: number): string {
  return String(Math.round(x * 1000) / 1000);
}

const BEAMS_OF = (type: NoteValue["type"]) => Math.max(0, NOTE_TYPES.indexOf(type) - 2); // eighth 1, 16th 2, …

/**
 * A stateful cursor over xmlbuilder2's element builder, so nested elements read as open / close pairs:
 * `w.ele("note").ele("rest").up().up()`.
 */
class Writer {
  constructor(private node: XMLBuilder) {}
  ele(name: string, attributes: Record<string, string> = {}): this {
    this.node = this.node.ele(name, attributes);
    return this;
  }
  txt(text: string): this {
    this.node.txt(text);
    return this;
  }
  up(): this {
    this.node = this.node.up();
    return this;
  }
}

/** Serialise a fragment written by `write`, indented to `depth` levels of two spaces. */
function piece(depth: number, write: (w: Writer) => void): string {
  const root = fragment();
  write(new Writer(root));
  const text = root.end({ prettyPrint: true, indent: "  " });
  if (!text) return "";
  const pad = "  ".repeat(depth);
  return `${pad}${text.replace(/\n/g, `\n${pad}`)}\n`;
}

/**
 * The score as a MusicXML 4.0 partwise document.
 * @example scoreToMusicXml(spellGroove(doc)).startsWith("<?xml") // true
 */
export function scoreToMusicXml(score: NotationScore, options: MusicXmlOptions = {}): string {
  const divisions = musicXmlDivisions(score);
  const dur = (r: string) => {
    const [n, d] = parts(r);
    return String((4 * n * divisions) / d);
  };
  const withKit = score.hasKit || !score.hasKeys;
  const pieces = withKit ? usedPieces(score) : [];

  const doc = create({ version: "1.0", encoding: "UTF-8" });
  doc.dtd({ name: "score-partwise", pubID: "-//Recordare//DTD MusicXML 4.0 Partwise//EN", sysID: "http://www.musicxml.org/dtds/partwise.dtd" });
  const xml = new Writer(doc.ele("score-partwise", { version: "4.0" }));
  if (options.title) xml.ele("work").ele("work-title").txt(options.title).up().up();
  identification(xml, options);
  if (options.title) xml.ele("credit", { page: "1" }).ele("credit-type").txt("title").up().ele("credit-words", { justify: "center", valign: "top" }).txt(options.title).up().up();

  xml.ele("part-list");
  if (withKit) {
    xml.ele("score-part", { id: KIT_PART_ID }).ele("part-name").txt("Drum kit").up().ele("part-abbreviation").txt("Dr.").up();
    for (const p of pieces) xml.ele("score-instrument", { id: instrumentId(p) }).ele("instrument-name").txt(KIT_PIECES[p].name).up().up();
    for (const p of pieces) {
      xml.ele("midi-instrument", { id: instrumentId(p) });
      xml.ele("midi-channel").txt("10").up();
      xml.ele("midi-unpitched").txt(String(KIT_PIECES[p].gmNote + 1)).up(); // MusicXML numbers keys 1–128
      xml.up();
    }
    xml.up();
  }
  if (score.hasKeys) {
    xml.ele("score-part", { id: KEYS_PART_ID }).ele("part-name").txt("Keys").up().ele("part-abbreviation").txt("Kb.").up();
    xml.ele("score-instrument", { id: `${KEYS_PART_ID}-I1` }).ele("instrument-name").txt("Piano").up().up();
    xml.ele("midi-instrument", { id: `${KEYS_PART_ID}-I1` }).ele("midi-channel").txt("1").up().ele("midi-program").txt("1").up().up();
    xml.up();
  }
  xml.up();
  // A marker element where the parts go, replaced by their text after serialising.
  xml.ele("tactus-parts").up();
  const head = doc.end({ prettyPrint: true, indent: "  " });

  const ctx: Ctx = { score, divisions, dur };
  const partTexts: string[] = [];
  if (withKit) partTexts.push(writePart(ctx, KIT_PART_ID, "kit", true));
  if (score.hasKeys) partTexts.push(writePart(ctx, KEYS_PART_ID, "keys", !withKit));
  return head.replace(/ *<tactus-parts\/>\n/, partTexts.join(""));
}

interface Ctx {
  score: NotationScore;
  divisions: number;
  dur: (r: string) => string;
}

const instrumentId = (piece: KitPieceId) => `${KIT_PART_ID}-${piece}`;

function usedPieces(score: NotationScore): KitPieceId[] {
  const used = new Set<KitPieceId>();
  for (const bar of score.bars)
    for (const voice of [bar.kit.up, bar.kit.down])
      for (const e of voice) if (e.kind === "note") for (const h of e.heads) if (h.kind === "kit") used.add(h.piece);
  // An empty kit still needs one instrument for a valid, readable part.
  if (used.size === 0) used.add("snare");
  return KIT_ROW_ORDER.filter((p) => used.has(p));
}

function identification(xml: Writer, options: MusicXmlOptions): void {
  xml.ele("identification");
  const c = options.credits ?? {};
  for (const type of ["composer", "arranger", "transcriber"] as const) {
    const name = c[type]?.trim();
    if (name) xml.ele("creator", { type }).txt(name).up();
  }
  if (c.rights?.trim()) xml.ele("rights").txt(c.rights.trim()).up();
  const date = (options.date ?? new Date()).toISOString().slice(0, 10);
  xml.ele("encoding").ele("software").txt("Tactus").up().ele("encoding-date").txt(date).up().up();
  xml.up();
}

/** One part; `first`: the top part, which carries the tempo, rehearsal marks and repeat counts. */
function writePart(ctx: Ctx, id: string, kind: "kit" | "keys", first: boolean): string {
  const { score } = ctx;
  const starts = new Map(score.sections.map((s) => [s.startBar, s]));
  const ends = new Map(score.sections.map((s) => [s.startBar + s.bars - 1, s]));
  const bodies = new Map<string, string>();
  const out: string[] = [`  <part id="${id}">\n`];
  for (const bar of score.bars) {
    out.push(`    <measure number="${bar.index + 1}">\n`);
    const start = starts.get(bar.index);
    const end = ends.get(bar.index);
    out.push(
      piece(3, (w) => {
        if (start && start.repeats > 1) w.ele("barline", { location: "left" }).ele("bar-style").txt("heavy-light").up().ele("repeat", { direction: "forward" }).up().up();
        if (bar.index === 0) attributes(w, ctx, kind);
        if (start && first) w.ele("direction", { placement: "above" }).ele("direction-type").ele("rehearsal").txt(start.name).up().up().up();
        if (bar.index === 0 && first) tempo(w, ctx);
      }),
    );
    // The notes depend on the bar's events only: identical bars share one written body.
    const key = kind === "kit" ? `${bar.length}|${voiceKey(bar.kit.up)}|${voiceKey(bar.kit.down)}` : `${bar.length}|${bar.keys ? `${voiceKey(bar.keys.treble)}|${voiceKey(bar.keys.bass)}` : ""}`;
    let body = bodies.get(key);
    if (body === undefined) {
      body = piece(3, (w) => {
        if (kind === "kit") {
          const wrote = voice(w, ctx, bar, bar.kit.up, "1", null, false);
          voice(w, ctx, bar, bar.kit.down, "2", null, wrote);
        } else if (bar.keys) {
          voice(w, ctx, bar, bar.keys.treble, "1", "1", false);
          voice(w, ctx, bar, bar.keys.bass, "5", "2", true);
        }
      });
      bodies.set(key, body);
    }
    out.push(body);
    if (end && end.repeats > 1) {
      out.push(
        piece(3, (w) => {
          if (first) w.ele("direction", { placement: "above" }).ele("direction-type").ele("words").txt(`${end.repeats}×`).up().up().up();
          w.ele("barline", { location: "right" }).ele("bar-style").txt("light-heavy").up().ele("repeat", { direction: "backward", times: String(end.repeats) }).up().up();
        }),
      );
    }
    out.push("    </measure>\n");
  }
  out.push("  </part>\n");
  return out.join("");
}

/** Everything a voice's written notes depend on, as text (equal texts, equal XML). */
function voiceKey(events: readonly VoiceEvent[]): string {
  let k = "";
  for (const e of events) {
    k += `${e.kind === "note" ? "n" : e.measure ? "M" : e.hidden ? "h" : "r"}${e.at},${e.duration},${e.value.type}${e.value.dots}`;
    if (e.tuplet) k += `t${e.tuplet.actual}:${e.tuplet.normal}:${e.tuplet.group}${e.tuplet.position[0]}`;
    if (e.kind === "note") {
      k += `${e.stem[0]}${e.beam ?? ""}`;
      for (const h of e.heads) {
        k += h.kind === "kit" ? `[${h.piece}${h.dynamic[0]}${h.articulation ?? ""}]` : `[${h.midi}${h.step}${h.alter}${h.octave}${h.accidental ?? ""}${h.tieStart ? "s" : ""}${h.tieStop ? "p" : ""}]`;
      }
    }
    k += ";";
  }
  return k;
}

function attributes(xml: Writer, ctx: Ctx, kind: "kit" | "keys"): void {
  const { score } = ctx;
  xml.ele("attributes");
  xml.ele("divisions").txt(String(ctx.divisions)).up();
  if (kind === "keys") xml.ele("key").ele("fifths").txt("0").up().up();
  xml.ele("time").ele("beats").txt(String(score.meter.beatsPerBar)).up().ele("beat-type").txt(String(score.meter.beatUnit)).up().up();
  if (kind === "kit") {
    xml.ele("clef").ele("sign").txt("percussion").up().up();
    xml.ele("staff-details").ele("staff-lines").txt("5").up().up();
  } else {
    xml.ele("staves").txt("2").up();
    xml.ele("clef", { number: "1" }).ele("sign").txt("G").up().ele("line").txt("2").up().up();
    xml.ele("clef", { number: "2" }).ele("sign").txt("F").up().ele("line").txt("4").up().up();
  }
  xml.up();
}

function tempo(xml: Writer, ctx: Ctx): void {
  const { score } = ctx;
  const bpm = q(score.tempo.bpm);
  const quarter = bpm.mul(q(score.tempo.beatNote)).mul(4).valueOf();
  const beat = score.tempo.beatNoteValue;
  xml.ele("direction", { placement: "above" }).ele("direction-type").ele("metronome");
  if (beat) {
    xml.ele("beat-unit").txt(beat.type).up();
    for (let i = 0; i < beat.dots; i++) xml.ele("beat-unit-dot").up();
    xml.ele("per-minute").txt(decimal(bpm.valueOf())).up();
  } else {
    xml.ele("beat-unit").txt("quarter").up().ele("per-minute").txt(decimal(quarter)).up();
  }
  xml.up().up();
  xml.ele("sound", { tempo: decimal(quarter) }).up();
  xml.up();
  if (score.swing) {
    const { unit, ratio } = score.swing;
    const [first, second] = swingRatio(ratio);
    const type = unit === "1/8" ? "eighth" : unit === "1/16" ? "16th" : null;
    xml.ele("direction", { placement: "above" }).ele("direction-type").ele("words").txt(`Swing ${type === "16th" ? "sixteenths" : "eighths"} (${first}:${second})`).up().up();
    if (type) xml.ele("sound").ele("swing").ele("first").txt(String(first)).up().ele("second").txt(String(second)).up().ele("swing-type").txt(type).up().up().up();
    xml.up();
  }
}

/**
 * A swing ratio (share of the pair given to its first note) as two small whole numbers.
 * @example swingRatio(2 / 3) // [2, 1]
 */
export function swingRatio(ratio: number): [number, number] {
  for (let d = 2; d <= 100; d++) {
    const n = Math.round(ratio * d);
    if (Math.abs(n / d - ratio) < 1e-6) return [n, d - n];
  }
  return [Math.round(ratio * 100), 100 - Math.round(ratio * 100)];
}

/**
 * One voice of one bar. Returns whether anything was written; a voice whose events are all hidden rests is left
 * out. `backup`: move back to the start of the bar first.
 */
function voice(xml: Writer, ctx: Ctx, bar: NotationBar, events: readonly VoiceEvent[], number: string, staff: string | null, backup: boolean): boolean {
  if (events.every((e) => e.kind === "rest" && e.hidden)) return false;
  const { dur } = ctx;
  if (backup) xml.ele("backup").ele("duration").txt(dur(bar.length)).up().up();
  const beams = beamLevels(events);
  const tupletSize = new Map<number, number>();
  for (const e of events) if (e.tuplet) tupletSize.set(e.tuplet.group, (tupletSize.get(e.tuplet.group) ?? 0) + 1);
  events.forEach((e, i) => {
    const tuplet = e.tuplet && (tupletSize.get(e.tuplet.group) ?? 0) > 1 ? e.tuplet.position : null;
    if (e.kind === "rest") {
      xml.ele("note", e.hidden ? { "print-object": "no" } : {});
      xml.ele("rest", e.measure ? { measure: "yes" } : {}).up();
      xml.ele("duration").txt(dur(e.measure ? bar.length : e.duration)).up();
      xml.ele("voice").txt(number).up();
      if (!e.measure) typeAndDots(xml, e.value);
      if (e.tuplet) timeModification(xml, e.tuplet);
      if (staff) xml.ele("staff").txt(staff).up();
      if (tuplet === "start" || tuplet === "end") xml.ele("notations").ele("tuplet", { type: tuplet === "start" ? "start" : "stop" }).up().up();
      xml.up();
      return;
    }
    graces(xml, e, number, staff);
    // Beams and tuplet marks go on the first note of a chord (the others share its stem).
    e.heads.forEach((h, k) => note(xml, ctx, e, h, k > 0, number, staff, k === 0 ? beams[i] : undefined, k === 0 ? tuplet : null));
  });
  return true;
}

/** Flams: one slashed grace note per flammed head, before the chord. */
function graces(xml: Writer, e: NoteEvent, number: string, staff: string | null): void {
  let first = true;
  for (const h of e.heads) {
    if (h.kind !== "kit" || !h.display.flam) continue;
    xml.ele("note");
    xml.ele("grace", { slash: "yes" }).up();
    if (!first) xml.ele("chord").up();
    first = false;
    xml.ele("unpitched").ele("display-step").txt(h.display.step).up().ele("display-octave").txt(String(h.display.octave)).up().up();
    xml.ele("instrument", { id: instrumentId(h.piece) }).up();
    xml.ele("voice").txt(number).up();
    xml.ele("type").txt("eighth").up();
    xml.ele("stem").txt(e.stem).up();
    if (h.display.notehead !== "normal") xml.ele("notehead").txt(h.display.notehead).up();
    if (staff) xml.ele("staff").txt(staff).up();
    xml.up();
  }
}

function note(xml: Writer, ctx: Ctx, e: NoteEvent, h: KitHead | KeysHead, chord: boolean, number: string, staff: string | null, beams: readonly string[] | undefined, tuplet: "start" | "middle" | "end" | null): void {
  const { dur } = ctx;
  xml.ele("note");
  if (chord) xml.ele("chord").up();
  if (h.kind === "kit") {
    xml.ele("unpitched").ele("display-step").txt(h.display.step).up().ele("display-octave").txt(String(h.display.octave)).up().up();
  } else {
    xml.ele("pitch").ele("step").txt(h.step).up();
    if (h.alter !== 0) xml.ele("alter").txt(String(h.alter)).up();
    xml.ele("octave").txt(String(h.octave)).up().up();
  }
  xml.ele("duration").txt(dur(e.duration)).up();
  if (h.tieStop) xml.ele("tie", { type: "stop" }).up();
  if (h.tieStart) xml.ele("tie", { type: "start" }).up();
  if (h.kind === "kit") xml.ele("instrument", { id: instrumentId(h.piece) }).up();
  xml.ele("voice").txt(number).up();
  typeAndDots(xml, e.value);
  if (h.kind === "pitch" && h.accidental) xml.ele("accidental").txt(h.accidental).up();
  if (e.tuplet) timeModification(xml, e.tuplet);
  xml.ele("stem").txt(e.stem).up();
  if (h.kind === "kit" && (h.display.notehead !== "normal" || h.display.ghost)) {
    xml.ele("notehead", h.display.ghost ? { parentheses: "yes" } : {}).txt(h.display.notehead).up();
  }
  if (staff) xml.ele("staff").txt(staff).up();
  if (beams) beams.forEach((value, level) => xml.ele("beam", { number: String(level + 1) }).txt(value).up());
  notations(xml, h, tuplet);
  xml.up();
}

function typeAndDots(xml: Writer, value: NoteValue): void {
  xml.ele("type").txt(value.type).up();
  for (let i = 0; i < value.dots; i++) xml.ele("dot").up();
}

function timeModification(xml: Writer, t: { actual: number; normal: number }): void {
  xml.ele("time-modification").ele("actual-notes").txt(String(t.actual)).up().ele("normal-notes").txt(String(t.normal)).up().up();
}

function notations(xml: Writer, h: KitHead | KeysHead, tuplet: "start" | "middle" | "end" | null): void {
  const tuplets = tuplet === "start" || tuplet === "end";
  const d = h.kind === "kit" ? h.display : null;
  const technical = d && (d.open || d.choke);
  if (!h.tieStop && !h.tieStart && !tuplets && !d?.accent && !technical) return;
  xml.ele("notations");
  if (h.tieStop) xml.ele("tied", { type: "stop" }).up();
  if (h.tieStart) xml.ele("tied", { type: "start" }).up();
  if (tuplet === "start") xml.ele("tuplet", { type: "start", bracket: "yes" }).up();
  if (tuplet === "end") xml.ele("tuplet", { type: "stop" }).up();
  if (d?.accent) xml.ele("articulations").ele("accent").up().up();
  if (technical) {
    xml.ele("technical");
    if (d.open) xml.ele("open").up();
    if (d.choke) xml.ele("other-technical").txt("choke").up();
    xml.up();
  }
  xml.up();
}

/**
 * MusicXML `<beam>` values per note, level by level, from the model's beam groups: level 1 joins the group;
 * deeper levels join neighbouring notes that both have them, and a lone short note gets a hook (forward at the
 * start of the group, backward elsewhere: a dotted eighth and a sixteenth, common practice).
 */
export function beamLevels(events: readonly VoiceEvent[]): (string[] | undefined)[] {
  const out: (string[] | undefined)[] = new Array(events.length).fill(undefined);
  const groups = new Map<number, number[]>();
  events.forEach((e, i) => {
    if (e.kind !== "note" || e.beam === undefined) return;
    const g = groups.get(e.beam);
    if (g) g.push(i);
    else groups.set(e.beam, [i]);
  });
  for (const members of groups.values()) {
    if (members.length < 2) continue;
    const counts = members.map((i) => BEAMS_OF(events[i]!.value.type));
    members.forEach((i, k) => {
      const levels: string[] = [];
      for (let level = 1; level <= counts[k]!; level++) {
        const prev = k > 0 && counts[k - 1]! >= level;
        const next = k < members.length - 1 && counts[k + 1]! >= level;
        if (level === 1) levels.push(k === 0 ? "begin" : k === members.length - 1 ? "end" : "continue");
        else if (prev && next) levels.push("continue");
        else if (prev) levels.push("end");
        else if (next) levels.push("begin");
        else levels.push(k === 0 ? "forward hook" : "backward hook");
      }
      out[i] = levels;
    });
  }
  return out;
}
