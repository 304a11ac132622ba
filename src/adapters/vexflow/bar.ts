/**
 * One bar of the notation model as VexFlow objects: staves, voices, beams, tuplets, ties and marks.
 *
 * A bar is built once, measured (the Formatter's minimum note width), placed at an x and width chosen by
 * the system layout, then drawn. Everything the model decides is taken as it is: beam groups (never
 * VexFlow's automatic beaming), stem directions, tuplets, ties, rests and noteheads.
 */
import { beatGrouping, beatStarts } from "../../lib/rhythm/meter";
import type { Head, KeysHead, KitHead, NotationBar, NotationScore, NoteEvent, NoteType, VoiceEvent } from "../../lib/rhythm/notation/model";
import {
  Accidental,
  Articulation,
  BarlineType,
  Beam,
  Dot,
  Formatter,
  GhostNote,
  GraceNote,
  GraceNoteGroup,
  ModifierPosition,
  Parenthesis,
  Stave,
  StaveConnector,
  StaveNote,
  StaveTempo,
  StaveTie,
  Tuplet,
  Voice,
  VexFlow,
  configureVexFlow,
  type RenderContext,
  type StemmableNote,
  type Tickable,
} from "./vexflow";

/** Vertical layout of one system, in pixels from the system's top (the top line of each staff). */
export interface SystemGeometry {
  readonly kitTop: number;
  readonly trebleTop: number;
  readonly bassTop: number;
  readonly height: number;
}

export const LINE_SPACING = 10;
const STAFF_HEIGHT = 4 * LINE_SPACING;

/** Room above the kit staff for tempo marks and section names, when a system has any. */
export const MARKS_HEIGHT = 26;
/** Baseline of tempo marks and section names, from the system's top. */
const MARKS_BASELINE = 18;

/**
 * Staff positions for a system, with or without the keys grand staff, and with or without a row of marks
 * (tempo, section names) above the kit staff.
 */
export function systemGeometry(keys: boolean, marks = false): SystemGeometry {
  // Above the kit staff: stems of cymbals above the staff, beams, accents and open/closed marks.
  const kitTop = 58 + (marks ? MARKS_HEIGHT : 0);
  if (!keys) return { kitTop, trebleTop: 0, bassTop: 0, height: kitTop + STAFF_HEIGHT + 50 };
  const trebleTop = kitTop + STAFF_HEIGHT + 80;
  const bassTop = trebleTop + STAFF_HEIGHT + 70;
  return { kitTop, trebleTop, bassTop, height: bassTop + STAFF_HEIGHT + 50 };
}

/** What a bar shows besides its notes; decided by the system layout. */
export interface BarFlags {
  /** First bar of a system: clefs, system bar line, brace, bar number. */
  readonly systemStart: boolean;
  /** Time signature (first bar of the score or range). */
  readonly timeSignature: boolean;
  /** Tempo mark (first bar of the score or range). */
  readonly tempo: boolean;
  /** Bar number to print above the system start, if any (1-based). */
  readonly barNumber: number | null;
  /** Section name starting at this bar, if any. */
  readonly section: string | null;
  /** Last bar drawn: a final bar line when it is also the last bar of the score. */
  readonly final: boolean;
  readonly keys: boolean;
}

/** Where a tie leaves or enters a bar (system coordinates), for ties drawn across a bar line. */
export interface TieAnchor {
  readonly midi: number;
  readonly staff: "treble" | "bass";
  readonly x: number;
  readonly y: number;
  /** 1 = curve below the heads, -1 = above (VexFlow's tie direction). */
  readonly direction: number;
}

export interface DrawnBar {
  /** Beat x positions (system coordinates), one per beat of the time signature. */
  readonly beats: number[];
  readonly noteStartX: number;
  readonly noteEndX: number;
  /** Ties that continue into the next bar, and ties arriving from the previous one. */
  readonly tiesOut: TieAnchor[];
  readonly tiesIn: TieAnchor[];
  /** Left edge where a tie from the previous system arrives, and right edge where one leaves. */
  readonly tieEntryX: number;
  readonly tieExitX: number;
}

const DURATION: Record<NoteType, string> = {
  whole: "w",
  half: "h",
  quarter: "q",
  eighth: "8",
  "16th": "16",
  "32nd": "32",
  "64th": "64",
  "128th": "128",
  "256th": "256",
  "512th": "256",
  "1024th": "256",
};

/** VexFlow notehead codes for the model's noteheads (the third part of a key such as "g/5/x"). */
const HEAD_CODE: Record<KitHead["display"]["notehead"], string> = {
  normal: "",
  x: "/x",
  "circle-x": "/cx",
  diamond: "/di",
  triangle: "/tu",
};

/** SMuFL glyphs for the open and closed hi-hat marks (Bravura: brassMuteOpen U+E5E7, brassMuteClosed U+E5E5). */
const OPEN_MARK = "\uE5E7";
const CLOSED_MARK = "\uE5E5";

type StaffName = "kit" | "treble" | "bass";

interface BuiltVoice {
  readonly staff: StaffName;
  readonly voice: Voice;
  readonly notes: Tickable[];
  readonly events: readonly VoiceEvent[];
}

/** Tick position (whole notes, as a float) → x, collected after formatting for the beat positions. */
interface Onset {
  readonly at: number;
  readonly note: Tickable;
}

function ratio(r: string): number {
  const slash = r.indexOf("/");
  return slash < 0 ? Number(r) : Number(r.slice(0, slash)) / Number(r.slice(slash + 1));
}

function kitKey(h: KitHead): string {
  return `${h.display.step.toLowerCase()}/${h.display.octave}${HEAD_CODE[h.display.notehead]}`;
}

function pitchKey(h: KeysHead): string {
  const acc = h.alter === 1 ? "#" : h.alter === -1 ? "b" : "";
  return `${h.step.toLowerCase()}${acc}/${h.octave}`;
}

/** Rest positions: hands' rests high, feet's rests low when both kit voices are drawn (common practice). */
function restKey(staff: StaffName, voice: "up" | "down" | "single"): string {
  if (staff === "kit" && voice === "up") return "e/5";
  if (staff === "kit" && voice === "down") return "e/4";
  if (staff === "bass") return "d/3";
  return "b/4";
}

/**
 * A StaveNote drawn without VexFlow's invisible hit-test rectangle: the editor never clicks the notation,
 * and computing that rectangle (a full bounding box per note) was a large part of drawing a bar.
 */
class InkNote extends StaveNote {
  override draw(): void {
    if (this.renderOptions.draw === false) return;
    const ctx = this.checkContext();
    const xBegin = this.getNoteHeadBeginX();
    for (const head of this.noteHeads) head.setX(xBegin);
    const stem = this.getStem();
    if (stem) {
      const stemX = this.getStemX();
      stem.setNoteHeadXBounds(stemX, stemX);
    }
    ctx.openGroup("stavenote", this.getAttribute("id"));
    this.drawLedgerLines();
    if (this.hasStem() && !this.getBeam()) this.drawStem();
    this.drawNoteHeads();
    this.drawFlag();
    ctx.closeGroup();
    this.setRendered();
  }
}

/**
 * The VexFlow objects of one bar, ready to be measured and drawn.
 * @example const b = new BarBuild(score, bar, flags); b.minWidth(); b.draw(ctx, x, width, geometry)
 */
export class BarBuild {
  private readonly staves = new Map<StaffName, Stave>();
  private readonly voices: BuiltVoice[] = [];
  private readonly beams: Beam[] = [];
  private readonly tuplets: Tuplet[] = [];
  private readonly ties: StaveTie[] = [];
  private readonly onsets: Onset[] = [];
  private readonly formatter = new Formatter();
  private readonly tieEnds: { staff: "treble" | "bass"; note: StaveNote; head: KeysHead; index: number; out: boolean }[] = [];
  private minNotes = -1;
  private readonly barLength: number;

  constructor(
    private readonly score: NotationScore,
    private readonly bar: NotationBar,
    readonly flags: BarFlags,
  ) {
    configureVexFlow();
    this.barLength = ratio(bar.length);
    const staffNames: StaffName[] = flags.keys && bar.keys ? ["kit", "treble", "bass"] : ["kit"];
    for (const name of staffNames) this.staves.set(name, this.makeStave(name));

    const kitUp = bar.kit.up.every((e) => e.kind === "rest" && e.hidden) ? null : bar.kit.up;
    const kitDown = bar.kit.down.every((e) => e.kind === "rest" && e.hidden) ? null : bar.kit.down;
    const both = kitUp !== null && kitDown !== null;
    if (kitUp) this.addVoice("kit", kitUp, both ? "up" : "single");
    if (kitDown) this.addVoice("kit", kitDown, both ? "down" : "single");
    if (!kitUp && !kitDown) this.addVoice("kit", bar.kit.up.map((e) => ({ ...e, hidden: false })), "single");
    if (flags.keys && bar.keys) {
      this.addVoice("treble", bar.keys.treble, "single");
      this.addVoice("bass", bar.keys.bass, "single");
    }
    for (const name of staffNames) {
      const vs = this.voices.filter((v) => v.staff === name).map((v) => v.voice);
      if (vs.length > 0) this.formatter.joinVoices(vs);
    }
  }

  private makeStave(name: StaffName): Stave {
    const s = new Stave(0, 0, 400);
    s.setBegBarType(BarlineType.NONE);
    s.setEndBarType(this.flags.final ? BarlineType.END : BarlineType.SINGLE);
    s.setDefaultLedgerLineStyle({ strokeStyle: "currentColor", lineWidth: 1.4 });
    const f = this.flags;
    if (f.systemStart) s.addClef(name === "kit" ? "percussion" : name);
    if (f.timeSignature) s.addTimeSignature(`${this.score.meter.beatsPerBar}/${this.score.meter.beatUnit}`);
    return s;
  }

  private addVoice(staff: StaffName, events: readonly VoiceEvent[], role: "up" | "down" | "single"): void {
    const stave = this.staves.get(staff)!;
    const clef = staff === "kit" ? "percussion" : staff;
    const notes: Tickable[] = [];
    const byBeam = new Map<number, number[]>();
    const byTuplet = new Map<number, number[]>();
    let firstNote = -1;
    let lastNote = -1;
    events.forEach((e, i) => {
      const duration = DURATION[e.value.type];
      let note: Tickable;
      if (e.kind === "rest") {
        if (e.hidden) {
          note = new GhostNote({ duration, dots: e.value.dots });
        } else if (e.measure) {
          // A whole rest hangs from the fourth line (common practice): D5 in treble (and on the kit staff), F3 in bass.
          const rest = new InkNote({ keys: [staff === "bass" ? "f/3" : "d/5"], duration: "w", type: "r", clef, alignCenter: true });
          // A whole rest fills the bar in any meter (MusicXML measure rest); give it the bar's ticks.
          rest.setIntrinsicTicks(Math.round(VexFlow.RESOLUTION * this.barLength));
          note = rest;
        } else {
          const rest = new InkNote({ keys: [restKey(staff, role)], duration, dots: e.value.dots, type: "r", clef });
          if (e.value.dots > 0) Dot.buildAndAttach([rest], { all: true });
          note = rest;
        }
      } else {
        note = this.makeNote(staff, e, clef);
        if (firstNote < 0) firstNote = i;
        lastNote = i;
        if (e.beam !== undefined) byBeam.set(e.beam, [...(byBeam.get(e.beam) ?? []), i]);
      }
      if (e.tuplet) byTuplet.set(e.tuplet.group, [...(byTuplet.get(e.tuplet.group) ?? []), i]);
      note.setStave(stave);
      notes.push(note);
      this.onsets.push({ at: ratio(e.at), note });
    });

    // Tuplets first: they change the notes' ticks, which the voice then adds up.
    for (const members of byTuplet.values()) {
      const first = events[members[0]!]!;
      const t = first.tuplet!;
      const tupletNotes = members.map((i) => notes[i]!).filter((n): n is StaveNote => n instanceof StaveNote);
      if (tupletNotes.length === 0) continue;
      const beamed = members.every((i) => {
        const e = events[i]!;
        return e.kind === "note" && e.beam !== undefined && e.beam === (events[members[0]!] as NoteEvent).beam;
      });
      const up = role === "up" || (role === "single" && this.stemOf(events, members) === "up");
      this.tuplets.push(
        new Tuplet(tupletNotes, {
          numNotes: t.actual,
          notesOccupied: t.normal,
          bracketed: !beamed,
          ratioed: false,
          location: up ? Tuplet.LOCATION_TOP : Tuplet.LOCATION_BOTTOM,
        }),
      );
    }

    const { beatsPerBar, beatUnit } = this.score.meter;
    const voice = new Voice({ numBeats: beatsPerBar, beatValue: beatUnit }).setMode(Voice.Mode.SOFT);
    voice.addTickables(notes);

    // Beams exactly as the model groups them; a rest between two notes of a group stays under the beam.
    for (const members of byBeam.values()) {
      const from = members[0]!;
      const to = members[members.length - 1]!;
      const group = notes.slice(from, to + 1) as StemmableNote[];
      // Rests under the beam take the group's stem direction, or VexFlow bends the beam towards them.
      const dir = (events[from] as NoteEvent).stem === "up" ? 1 : -1;
      for (const n of group) if (n.getStemDirection() !== dir) n.setStemDirection(dir);
      if (group.length >= 2) this.beams.push(new Beam(group, false));
    }

    if (staff !== "kit") this.collectTies(staff, events, notes, firstNote, lastNote);
    this.voices.push({ staff, voice, notes, events });
  }

  private stemOf(events: readonly VoiceEvent[], members: number[]): "up" | "down" {
    for (const i of members) {
      const e = events[i]!;
      if (e.kind === "note") return e.stem;
    }
    return "up";
  }

  private makeNote(staff: StaffName, e: NoteEvent, clef: string): StaveNote {
    const duration = DURATION[e.value.type];
    const stemDirection = e.stem === "up" ? 1 : -1;
    const keys = e.heads.map((h) => (h.kind === "kit" ? kitKey(h) : pitchKey(h)));
    const note = new InkNote({ keys, duration, dots: e.value.dots, clef, stemDirection, autoStem: false });
    if (e.value.dots > 0) Dot.buildAndAttach([note], { all: true });
    if (staff === "kit") this.kitMarks(note, e.heads as readonly Head[], stemDirection);
    else
      e.heads.forEach((h, i) => {
        if (h.kind !== "pitch" || !h.accidental) return;
        note.addModifier(new Accidental(h.accidental === "sharp" ? "#" : h.accidental === "flat" ? "b" : "n"), i);
      });
    return note;
  }

  /** Accents, open/closed marks, ghost parentheses, flams and chokes of kit heads. */
  private kitMarks(note: StaveNote, heads: readonly Head[], stemDirection: number): void {
    const side = stemDirection === 1 ? ModifierPosition.ABOVE : ModifierPosition.BELOW;
    let accent = false;
    let open = false;
    let closed = false;
    let choke = false;
    const flams: string[] = [];
    heads.forEach((h, i) => {
      if (h.kind !== "kit") return;
      const d = h.display;
      accent ||= d.accent === true;
      open ||= d.open === true;
      closed ||= d.closed === true;
      choke ||= d.choke === true;
      if (d.ghost) {
        note.addModifier(new Parenthesis(ModifierPosition.LEFT), i);
        note.addModifier(new Parenthesis(ModifierPosition.RIGHT), i);
      }
      if (d.flam) flams.push(kitKey(h));
    });
    if (accent) note.addModifier(new Articulation("a>").setPosition(side), 0);
    if (open) note.addModifier(new Articulation(OPEN_MARK).setPosition(ModifierPosition.ABOVE), 0);
    else if (closed) note.addModifier(new Articulation(CLOSED_MARK).setPosition(ModifierPosition.ABOVE), 0);
    if (choke) note.addModifier(new Articulation("a,").setPosition(ModifierPosition.ABOVE), 0);
    if (flams.length > 0) {
      const grace = new GraceNote({ keys: flams, duration: "8", slash: true, clef: "percussion", stemDirection: 1, autoStem: false });
      note.addModifier(new GraceNoteGroup([grace], true), 0);
    }
  }

  /** Ties inside the bar become StaveTies; ties at its edges are remembered for the system to draw. */
  private collectTies(staff: "treble" | "bass", events: readonly VoiceEvent[], notes: Tickable[], firstNote: number, lastNote: number): void {
    events.forEach((e, i) => {
      if (e.kind !== "note") return;
      const note = notes[i] as StaveNote;
      e.heads.forEach((h, hi) => {
        if (h.kind !== "pitch") return;
        if (h.tieStart) {
          const nextIndex = i + 1;
          const next = events[nextIndex];
          const target = next && next.kind === "note" ? next.heads.findIndex((n) => n.kind === "pitch" && n.midi === h.midi && n.tieStop) : -1;
          if (target >= 0) {
            this.ties.push(
              new StaveTie({ firstNote: note, lastNote: notes[nextIndex] as StaveNote, firstIndexes: [hi], lastIndexes: [target] }),
            );
          } else if (i === lastNote) {
            this.tieEnds.push({ staff, note, head: h, index: hi, out: true });
          }
        }
        if (h.tieStop && i === firstNote) this.tieEnds.push({ staff, note, head: h, index: hi, out: false });
      });
    });
  }

  /** Width of the staves' start modifiers (clef, time signature) plus the end padding. */
  private modifierWidth(): number {
    let w = 0;
    for (const s of this.staves.values()) w = Math.max(w, s.getNoteStartX() - s.getX());
    return w;
  }

  /** The narrowest comfortable width of this bar, modifiers included. */
  minWidth(): number {
    if (this.minNotes < 0) {
      const all = this.voices.map((v) => v.voice);
      this.minNotes = this.formatter.preCalculateMinTotalWidth(all);
    }
    return this.modifierWidth() + comfortable(this.minNotes) + Stave.defaultPadding;
  }

  /** Width taken by the clef and time signature before the first note. */
  startWidth(): number {
    return this.modifierWidth();
  }

  /** The minimum width of the notes alone (as the Formatter computes it, with breathing room). */
  notesWidth(): number {
    this.minWidth();
    return comfortable(this.minNotes);
  }

  /** Place the bar at x with the given width in a system, and draw it. */
  draw(ctx: RenderContext, x: number, width: number, g: SystemGeometry): DrawnBar {
    const f = this.flags;
    const kit = this.staves.get("kit")!;
    kit.setX(x).setWidth(width).setY(g.kitTop - 4 * LINE_SPACING);
    const treble = this.staves.get("treble");
    const bass = this.staves.get("bass");
    treble?.setX(x).setWidth(width).setY(g.trebleTop - 4 * LINE_SPACING);
    bass?.setX(x).setWidth(width).setY(g.bassTop - 4 * LINE_SPACING);

    // Section name (boxed) at the bar's left edge, the tempo mark after it, both on the marks row.
    let markX = 0;
    let swingX = 0;
    if (f.section) markX = drawSectionLabel(ctx, f.section, x, MARKS_BASELINE) + 12;
    if (f.tempo && this.score.tempo.beatNoteValue) {
      const v = this.score.tempo.beatNoteValue;
      const bpm = Math.round(ratio(this.score.tempo.bpm) * 10) / 10;
      const tempo = new StaveTempo({ duration: DURATION[v.type], dots: v.dots, bpm }, x, MARKS_BASELINE - (g.kitTop - 20));
      tempo.setXShift(markX);
      kit.addModifier(tempo);
      swingX = markX + tempoWidth(ctx, bpm) + 14;
    }
    let startX = 0;
    for (const s of this.staves.values()) startX = Math.max(startX, s.getNoteStartX());
    for (const s of this.staves.values()) s.setNoteStartX(startX);
    // The staves moved since the notes were measured: give the notes their staves again (recomputes ys).
    for (const v of this.voices) {
      const stave = this.staves.get(v.staff)!;
      for (const n of v.notes) n.setStave(stave);
    }
    const justify = kit.getNoteEndX() - startX - Stave.defaultPadding;
    const all = this.voices.map((v) => v.voice);
    this.formatter.format(all, Math.max(justify, 1));
    this.formatter.postFormat();

    for (const s of this.staves.values()) s.setContext(ctx).draw();
    if (treble && bass) {
      ctx.openGroup("staveconnector");
      new StaveConnector(treble, bass).setType("singleRight").setContext(ctx).draw();
      if (f.systemStart) {
        new StaveConnector(treble, bass).setType("brace").setContext(ctx).draw();
        new StaveConnector(kit, bass).setType("singleLeft").setContext(ctx).draw();
      }
      if (f.final) new StaveConnector(treble, bass).setType("boldDoubleRight").setContext(ctx).draw();
      ctx.closeGroup();
    }
    if (f.barNumber !== null) drawBarNumber(ctx, f.barNumber, x, g.kitTop - 7);
    // The tempo mark starts where the stave puts marks above it (after the clef and time signature).
    if (f.tempo && this.score.swing) drawSwing(ctx, this.score.swing, kit.getModifierXShift() + x + swingX, MARKS_BASELINE);
    for (const v of this.voices) v.voice.draw(ctx, this.staves.get(v.staff)!);
    for (const b of this.beams) b.setContext(ctx).draw();
    for (const t of this.tuplets) t.setContext(ctx).draw();
    for (const t of this.ties) t.setContext(ctx).draw();

    const noteEndX = kit.getNoteEndX();
    const tiesOut: TieAnchor[] = [];
    const tiesIn: TieAnchor[] = [];
    for (const t of this.tieEnds) {
      const ys = t.note.getYs();
      const direction = t.note.getStemDirection() === 1 ? 1 : -1;
      const anchor = { midi: t.head.midi, staff: t.staff, y: ys[t.index] ?? ys[0]!, direction };
      if (t.out) tiesOut.push({ ...anchor, x: t.note.getTieRightX() });
      else tiesIn.push({ ...anchor, x: t.note.getTieLeftX() });
    }
    return {
      beats: this.beatXs(startX, noteEndX),
      noteStartX: startX,
      noteEndX,
      tiesOut,
      tiesIn,
      tieEntryX: startX - 6,
      tieExitX: x + width,
    };
  }

  /** x of every counted beat: a note's x where one starts on the beat, else interpolated. */
  private beatXs(startX: number, endX: number): number[] {
    const points = new Map<number, number>();
    for (const o of this.onsets) {
      if (o.note instanceof GhostNote) continue;
      if (o.note instanceof StaveNote && o.note.isCenterAligned()) continue;
      const x = o.note.getAbsoluteX();
      const prev = points.get(o.at);
      points.set(o.at, prev === undefined ? x : Math.min(prev, x));
    }
    const known = [...points.entries()].sort((a, b) => a[0] - b[0]);
    if (!points.has(0)) known.unshift([0, startX]);
    known.push([this.barLength, endX]);
    const out: number[] = [];
    for (const t of countedBeats(this.score.meter)) {
      let j = 0;
      while (j < known.length - 1 && known[j + 1]![0] <= t + 1e-9) j++;
      const [t0, x0] = known[j]!;
      const [t1, x1] = known[Math.min(j + 1, known.length - 1)]!;
      out.push(Math.abs(t - t0) < 1e-9 || t1 === t0 ? x0 : x0 + ((x1 - x0) * (t - t0)) / (t1 - t0));
    }
    return out;
  }
}

/**
 * Starts of the counted beats of a bar (whole notes), as the metronome and the playhead count them (the core's
 * meter rules: 4/4 → four quarters, 6/8 → two dotted quarters, 7/8 → 2+2+3). The notation model always
 * fills in a grouping; only one that differs from the meter's default was the document's own.
 */
function countedBeats(meter: NotationScore["meter"]): number[] {
  const defaults = beatGrouping({ beatsPerBar: meter.beatsPerBar, beatUnit: meter.beatUnit });
  const own = meter.grouping.length !== defaults.length || meter.grouping.some((g, i) => g !== defaults[i]);
  return beatStarts({ beatsPerBar: meter.beatsPerBar, beatUnit: meter.beatUnit, ...(own ? { grouping: [...meter.grouping] } : {}) }).map((f) => f.valueOf());
}

/** The Formatter's minimum is tight: give notes some air so a bar reads comfortably. */
function comfortable(minNotes: number): number {
  return Math.ceil(minNotes * 1.15 + 12);
}

/** The bar number above the start of a system, centred on the system's left edge (its own group). */
function drawBarNumber(ctx: RenderContext, n: number, x: number, y: number): void {
  ctx.openGroup("barnumber");
  ctx.save();
  ctx.setFont("Academico", 8);
  const w = ctx.measureText(String(n)).width;
  ctx.fillText(String(n), x - w / 2, y);
  ctx.restore();
  ctx.closeGroup();
}

const UNIT_NAMES: Record<string, string> = { "1/4": "quarters", "1/8": "8ths", "1/16": "16ths", "1/32": "32nds" };

/** Width of a tempo mark "♩ = bpm" as StaveTempo draws it (note glyph at 25pt, text at 14pt, 3 px gaps). */
function tempoWidth(ctx: RenderContext, bpm: number): number {
  ctx.save();
  ctx.setFont("Bravura,Academico", 25);
  const glyph = ctx.measureText("\uECA5").width;
  ctx.setFont("Bravura,Academico", 14);
  const text = ctx.measureText("=").width + ctx.measureText(String(bpm)).width;
  ctx.restore();
  return glyph + text + 9;
}

/** The swing marking: "Swung 8ths 67%" (the long note's share of each pair). */
function drawSwing(ctx: RenderContext, swing: NonNullable<NotationScore["swing"]>, x: number, y: number): void {
  const unit = UNIT_NAMES[swing.unit] ?? `${swing.unit} notes`;
  ctx.openGroup("swing");
  ctx.save();
  ctx.setFont("Academico", 11, "normal", "italic");
  ctx.fillText(`Swung ${unit} ${Math.round(swing.ratio * 100)}%`, x, y);
  ctx.restore();
  ctx.closeGroup();
}

/** A boxed section name with its baseline at y; returns the box width. */
function drawSectionLabel(ctx: RenderContext, text: string, x: number, y: number): number {
  ctx.save();
  ctx.setFont("Academico", 10, "bold");
  const w = ctx.measureText(text).width;
  const pad = 3;
  ctx.setLineWidth(1.5);
  ctx.beginPath();
  ctx.rect(x, y - 11 - pad, w + 2 * pad, 14 + 2 * pad);
  ctx.stroke();
  ctx.fillText(text, x + pad, y);
  ctx.restore();
  return w + 2 * pad;
}

/**
 * Draw a tie between two anchors (across a bar line, or from or to a system edge): the curve VexFlow's
 * StaveTie draws between two notes (same control points), for ends that lie in different bars.
 */
export function drawTie(ctx: RenderContext, from: { x: number; y: number }, to: { x: number; y: number }, direction: number): void {
  const short = Math.abs(to.x - from.x) < 10;
  const cp1 = short ? 2 : 8;
  const cp2 = short ? 8 : 12;
  const firstY = from.y + 7 * direction;
  const lastY = to.y + 7 * direction;
  const cpX = (from.x + to.x) / 2;
  ctx.openGroup("stavetie");
  ctx.beginPath();
  ctx.moveTo(from.x, firstY);
  ctx.quadraticCurveTo(cpX, (firstY + lastY) / 2 + cp1 * direction, to.x, lastY);
  ctx.quadraticCurveTo(cpX, (firstY + lastY) / 2 + cp2 * direction, from.x, firstY);
  ctx.closePath();
  ctx.fill();
  ctx.closeGroup();
}
