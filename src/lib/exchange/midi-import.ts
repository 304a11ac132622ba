/**
 * MIDI import: a Standard MIDI File (format 0 or 1) becomes a groove document, with a report.
 *
 * - The file is checked first (smf-check.ts), then parsed by @tonejs/midi.
 * - Tempo and meter come from the first FF 51 and FF 58 meta events. When the file has none, `missing` says
 *   so and the groove uses what the caller passed, else SMF 1.0's default (120 bpm) and 4/4, so the dialog
 *   can ask. Later changes of tempo or meter are reported, not followed (a groove has one of each).
 * - Channel 10 holds the kit: General MIDI Level 1 keys become kit pieces (gm-percussion.ts); other
 *   percussion keys are listed in the report with how often and where they occur, and are only written
 *   into the groove when the caller maps them to a piece (`percussionMap`). Other channels hold the keys.
 * - Positions are quantised to the chosen grid, beat by beat; with `triplets`, a beat whose onsets sit
 *   clearly closer to a triplet grid (two thirds of the step) than to the straight grid is written in
 *   triplets. The report lists what moved and by how much (milliseconds at the groove's tempo).
 * - Kit velocities become dynamics (ghost below 65, accent from 105, the midpoints of DYNAMIC_VELOCITY); a
 *   softer stroke of the same piece up to FLAM_WINDOW_SECONDS before another becomes that stroke's flam, when
 *   it has the velocity of a Tactus grace stroke (see midi-export.ts) or is closer than half the finest grid
 *   step, so two strokes on neighbouring grid points are never folded into one.
 * - Markers (FF 06) in the first track become sections, starting at the nearest bar line.
 */
import { Midi } from "./tonejs-midi";
import { LIMITS, SCHEMA_VERSION, type GrooveDocument, type Meter, type Section } from "../rhythm/document";
import { KIT_PIECES, KIT_ROW_ORDER, type Dynamic, type KitPieceId } from "../rhythm/kit";
import { beatLengths, naturalBeatNote } from "../rhythm/meter";
import { Fraction, fmt, q, type Rational } from "../rhythm/rational";
import { GM1_PERCUSSION, percussionLabel, percussionPiece } from "./gm-percussion";
import { graceVelocity } from "./midi-export";
import { MidiImportError, inspectSmf } from "./smf-check";

export { MidiImportError } from "./smf-check";

/** Largest file accepted: files must be smaller than 20 MB (20 × 1024 × 1024 bytes). */
export const MIDI_MAX_BYTES = 20 * 1024 * 1024;
/** Grids offered for quantising: straight steps (triplet detection applies to them) and triplet steps. */
export const IMPORT_GRIDS = ["1/4", "1/8", "1/16", "1/32", "1/12", "1/24"] as const;
export type ImportGrid = (typeof IMPORT_GRIDS)[number];
/** A softer stroke this close before a stroke of the same piece is read as its flam grace. */
export const FLAM_WINDOW_SECONDS = 0.045;
/** The General MIDI percussion channel (channel 10, 0-based 9). */
export const DRUM_CHANNEL = 9;
/** Most moves listed one by one in the report (the largest first); the summary counts them all. */
export const MAX_LISTED_MOVES = 200;

export interface MidiImportOptions {
  /** Quantisation grid (default sixteenths). */
  grid?: ImportGrid;
  /** Detect triplet beats (default true; only with a straight grid). */
  triplets?: boolean;
  /** Tempo to use instead of the file's (or when the file has none), in beats per minute of the meter's beat. */
  bpm?: number | Rational;
  /** Meter to use instead of the file's (or when the file has none). */
  meter?: { beatsPerBar: number; beatUnit: number };
  /** What to do with percussion keys the kit has no piece for: a piece, or null to leave them out. */
  percussionMap?: Readonly<Record<number, KitPieceId | null>>;
}

export interface MoveReport {
  kind: "kit" | "keys";
  /** Kit piece or keys pitch. */
  piece?: KitPieceId;
  pitch?: number;
  /** Position in the file, and where it was written, in whole notes from the start (rounded to 1e-6). */
  from: number;
  to: Rational;
  /** Signed shift in milliseconds at the groove's tempo (positive = later). */
  shiftMs: number;
  /** 1-based bar of the written position. */
  bar: number;
}

export interface UnknownPercussion {
  note: number;
  /** GM1 name, or null outside the map. */
  name: string | null;
  label: string;
  count: number;
  /** Up to 8 positions where it occurs, 1-based bar and seconds in the file. */
  where: { bar: number; seconds: number }[];
  /** What it was written as, when the caller mapped it. */
  mappedTo: KitPieceId | null;
}

export interface ImportReport {
  grid: Rational;
  /** The grid the user chose (the groove's grid is finer when triplet beats were found). */
  chosenGrid: ImportGrid;
  notes: { total: number; kit: number; keys: number; written: number };
  moved: { count: number; maxMs: number; meanMs: number };
  /** The largest moves, at most MAX_LISTED_MOVES. */
  moves: MoveReport[];
  /** Beats written in triplets, 1-based bar and beat. */
  tripletBeats: { bar: number; beat: number }[];
  /** GM keys read as a kit piece they share a sound with (e.g. Electric Snare → Snare). */
  substituted: { note: number; label: string; piece: KitPieceId; count: number }[];
  unknownPercussion: UnknownPercussion[];
  /** Notes that landed on the same grid point as another of the same sound and were merged into it. */
  merged: number;
  /** Strokes read as flams. */
  flams: number;
  warnings: string[];
}

export interface MidiImportResult {
  document: GrooveDocument;
  /** A title from the file's first track name, when it has one. */
  title: string | null;
  /** The file gave no tempo / no meter (or none Tactus can use): ask, then import again with them. */
  missing: { tempo: boolean; meter: boolean };
  source: {
    format: number;
    tracks: number;
    ppq: number;
    /** The file's own tempo (quarter notes per minute) and meter, or null. */
    quarterBpm: number | null;
    meter: { beatsPerBar: number; beatUnit: number } | null;
    seconds: number;
  };
  report: ImportReport;
}

interface RawNote {
  kit: boolean;
  midi: number;
  velocity: number;
  /** Position and end in whole notes (floats). */
  at: number;
  end: number;
  seconds: number;
}

const BEAT_UNITS = [1, 2, 4, 8, 16, 32];

/**
 * Import a MIDI file. Throws MidiImportError (with a `code` and a plain message) for files it refuses.
 * @example const { document, report, missing } = importMidi(bytes, { grid: "1/16" });
 */
export function importMidi(bytes: Uint8Array, options: MidiImportOptions = {}): MidiImportResult {
  if (bytes.length >= MIDI_MAX_BYTES) {
    throw new MidiImportError("too_large", `The file is ${(bytes.length / 1024 / 1024).toFixed(1)} MB; MIDI files must be smaller than 20 MB.`);
  }
  const summary = inspectSmf(bytes);
  let midi: Midi;
  try {
    midi = new Midi(bytes);
  } catch (e) {
    throw new MidiImportError("corrupt", `The MIDI file could not be read: ${typeof e === "string" ? e : (e as Error).message}.`);
  }
  const ppq = summary.ppq;
  const warnings: string[] = [];

  // Meter.
  const ts = midi.header.timeSignatures[0];
  let fileMeter: Meter | null = null;
  if (ts) {
    const [n, d] = ts.timeSignature as [number, number];
    if (n >= 1 && n <= LIMITS.maxBeatsPerBar && BEAT_UNITS.includes(d)) fileMeter = { beatsPerBar: n, beatUnit: d as Meter["beatUnit"] };
    else warnings.push(`The file's time signature ${n}/${d} cannot be written in Tactus (1–${LIMITS.maxBeatsPerBar} beats of a whole to a 32nd note).`);
  }
  if (midi.header.timeSignatures.length > 1) warnings.push(`The file changes meter ${midi.header.timeSignatures.length - 1} time(s); the groove keeps the first meter throughout.`);
  let meter: Meter = fileMeter ?? { beatsPerBar: 4, beatUnit: 4 };
  if (options.meter) {
    const m = options.meter;
    if (!(Number.isInteger(m.beatsPerBar) && m.beatsPerBar >= 1 && m.beatsPerBar <= LIMITS.maxBeatsPerBar && BEAT_UNITS.includes(m.beatUnit))) {
      throw new MidiImportError("unsupported", `A meter of ${m.beatsPerBar}/${m.beatUnit} cannot be written: use 1–${LIMITS.maxBeatsPerBar} beats and a beat unit of 1, 2, 4, 8, 16 or 32.`);
    }
    meter = { beatsPerBar: m.beatsPerBar, beatUnit: m.beatUnit as Meter["beatUnit"] };
  }
  const beatNote = q(naturalBeatNote(meter));

  // Tempo, in beats (of the meter's natural beat) per minute.
  const fileUs = summary.tempos.length > 0 ? midi.header.tempos.map((t) => 60_000_000 / t.bpm)[0]! : null;
  if (new Set(summary.tempos).size > 1) warnings.push(`The file changes tempo ${summary.tempos.length - 1} time(s); the groove keeps the first tempo throughout.`);
  const absurd = (said: string, value: number) =>
    new MidiImportError("absurd_tempo", `${said} is ${formatBpm(value)} bpm; a groove's tempo must be ${LIMITS.minBpm}–${LIMITS.maxBpm} bpm: choose a tempo and import again.`);
  const inRange = (x: number) => x >= LIMITS.minBpm && x <= LIMITS.maxBpm;
  let bpm: Fraction;
  if (options.bpm !== undefined) {
    bpm = q(options.bpm);
    if (!inRange(bpm.valueOf())) throw absurd("The tempo given", bpm.valueOf());
  } else if (fileUs !== null) {
    if (!(fileUs >= 1)) throw new MidiImportError("absurd_tempo", "The file's tempo is 0 microseconds per quarter note (an infinite tempo): choose a tempo and import again.");
    const exact = 60_000_000 / fileUs / (beatNote.valueOf() * 4);
    if (!inRange(exact)) throw absurd("The file's tempo", exact);
    bpm = tempoFromMicroseconds(Math.round(fileUs), beatNote);
    if (!inRange(bpm.valueOf())) bpm = new Fraction(Math.round(exact * 100), 100);
  } else {
    bpm = new Fraction(120).div(beatNote.mul(4)); // SMF 1.0: no tempo event means 120 quarter notes per minute
  }
  const bpmValue = bpm.valueOf();
  const secondsPerWhole = 60 / (bpmValue * beatNote.valueOf());

  // Notes.
  const wholePerTick = 1 / (4 * ppq);
  const raw: RawNote[] = [];
  for (const track of midi.tracks) {
    const kit = track.channel === DRUM_CHANNEL;
    for (const n of track.notes) {
      raw.push({
        kit,
        midi: n.midi,
        velocity: Math.max(1, Math.min(127, Math.round(n.velocity * 127))),
        at: n.ticks * wholePerTick,
        end: (n.ticks + Math.max(0, n.durationTicks)) * wholePerTick,
        seconds: midi.header.ticksToSeconds(n.ticks),
      });
    }
  }
  if (raw.length === 0) throw new MidiImportError("no_notes", "The MIDI file has no notes to import.");
  raw.sort((a, b) => a.at - b.at || a.midi - b.midi);

  const result = quantise(raw, {
    meter,
    grid: options.grid ?? "1/16",
    triplets: options.triplets ?? true,
    secondsPerWhole,
    percussionMap: options.percussionMap ?? {},
    warnings,
  });

  const sections = markerSections(midi, ppq, meter, result.bars, warnings);
  // Built valid and in canonical order (positions on the grid, inside the bars, sorted, merged where they
  // coincide, limits checked above), so it is not run through the schema again: for long files that check
  // costs more than the whole import. The tests hold every import to `assertGroove(document) = document`.
  const document: GrooveDocument = {
    schemaVersion: SCHEMA_VERSION,
    meter,
    tempo: { bpm: fmt(bpm), beatNote: fmt(beatNote) },
    grid: { step: result.grid },
    swing: { unit: "1/8", ratio: 0.5 },
    bars: result.bars,
    sections,
    kit: { lanes: result.lanes },
    keys: { notes: result.notes, splitPitch: 60 },
  };
  const name = decodeText(midi.header.name).trim();
  return {
    document,
    title: name ? name.slice(0, 120) : null,
    missing: { tempo: fileUs === null, meter: fileMeter === null },
    source: {
      format: summary.format,
      tracks: summary.tracks,
      ppq,
      quarterBpm: fileUs !== null ? Math.round((60_000_000 / fileUs) * 1000) / 1000 : null,
      meter: ts ? { beatsPerBar: ts.timeSignature[0]!, beatUnit: ts.timeSignature[1]! } : null,
      seconds: Math.round(midi.duration * 1000) / 1000,
    },
    report: { ...result.report, grid: result.grid, chosenGrid: options.grid ?? "1/16" },
  };
}

/**
 * The tempo in beats per minute for a microseconds-per-quarter value: the simplest rational (denominator up
 * to 100) that this microsecond value stands for, so a tempo written by Tactus comes back exactly
 * (75.5 bpm is written as 794702 µs and read as 151/2), and reading is stable when files are re-exported.
 * @example tempoFromMicroseconds(500000, q("1/4")).valueOf() // 120
 */
export function tempoFromMicroseconds(us: number, beatNote: Fraction): Fraction {
  // Beats per minute of the given beat note for a quarter-note tempo of 60e6/us.
  const toBeat = (x: number) => 60_000_000 / x / (beatNote.valueOf() * 4);
  const lo = toBeat(us + 0.5);
  const hi = toBeat(Math.max(0.5, us - 0.5));
  for (let den = 1; den <= 100; den++) {
    const num = Math.ceil(lo * den - 1e-9);
    if (num / den <= hi + 1e-9) return new Fraction(num, den);
  }
  return new Fraction(Math.round(toBeat(us) * 100), 100);
}

function formatBpm(x: number): string {
  if (!Number.isFinite(x)) return "infinite";
  return x >= 100 ? Math.round(x).toLocaleString("en-GB") : String(Math.round(x * 100) / 100);
}

/** MIDI text is bytes; Tactus writes UTF-8, older files often Latin-1. */
function decodeText(s: string): string {
  if (!/[\x80-\xff]/.test(s)) return s;
  const bytes = Uint8Array.from(s, (c) => c.charCodeAt(0) & 0xff);
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    return s;
  }
}

interface QuantiseInput {
  meter: Meter;
  grid: ImportGrid;
  triplets: boolean;
  secondsPerWhole: number;
  percussionMap: Readonly<Record<number, KitPieceId | null>>;
  warnings: string[];
}

interface QuantiseOutput {
  grid: Rational;
  bars: number;
  lanes: GrooveDocument["kit"]["lanes"];
  notes: GrooveDocument["keys"]["notes"];
  report: Omit<ImportReport, "grid" | "chosenGrid">;
}

const gcd = (a: number, b: number): number => {
  a = Math.abs(a);
  b = Math.abs(b);
  while (b) [a, b] = [b, a % b];
  return a;
};
const lcm = (a: number, b: number) => (a / gcd(a, b)) * b;

function dynamicOf(velocity: number): Dynamic {
  return velocity < 65 ? "ghost" : velocity >= 105 ? "accent" : "normal";
}

function quantise(raw: RawNote[], opt: QuantiseInput): QuantiseOutput {
  const { meter } = opt;
  const chosen = q(opt.grid);
  const straight = chosen.n === 1n && (chosen.d & (chosen.d - 1n)) === 0n;
  // A straight step must divide every beat (a beat unit finer than the grid refines it); any step must divide the bar.
  const S0 = straight ? chosen.gcd(new Fraction(1, meter.beatUnit)) : chosen.gcd(new Fraction(meter.beatsPerBar, meter.beatUnit));
  const T0 = opt.triplets && straight ? S0.mul(2).div(3) : null;
  // Integer units: D per whole note, so steps, beat starts and bar lengths are whole numbers of units.
  let D = lcm(Number(S0.d), meter.beatUnit);
  if (T0) D = lcm(D, Number(T0.d));
  const S = Number(S0.mul(D).n);
  const T = T0 ? Number(T0.mul(D).n) : 0;
  const beatLens = beatLengths(meter).map((f) => Number(f.mul(D).n));
  const beatStarts: number[] = [];
  beatLens.reduce((acc, len) => (beatStarts.push(acc), acc + len), 0);
  const L = beatLens.reduce((a, b) => a + b, 0);
  const nBeats = beatLens.length;
  const tripletOk = beatLens.map((len) => T > 0 && len % T === 0);
  // Grid points are counted from each beat when the step divides the beats (from the bar line otherwise: 1/12 in 6/8).
  const fromBeat = beatLens.every((len) => len % S === 0);

  // Kit: resolve pieces, fold flams, list unknown keys.
  const unknown = new Map<number, UnknownPercussion>();
  const substituted = new Map<number, { note: number; label: string; piece: KitPieceId; count: number }>();
  interface Stroke { piece: KitPieceId; x: number; velocity: number; seconds: number; flam: boolean; dropped: boolean }
  const strokes: Stroke[] = [];
  const keyNotes: { midi: number; x: number; xEnd: number; velocity: number }[] = [];
  let kitCount = 0;
  let keysCount = 0;
  for (const n of raw) {
    const x = n.at * D;
    if (!n.kit) {
      keysCount++;
      keyNotes.push({ midi: n.midi, x, xEnd: n.end * D, velocity: n.velocity });
      continue;
    }
    kitCount++;
    const reading = percussionPiece(n.midi);
    let piece: KitPieceId | null = reading?.piece ?? null;
    if (!reading) {
      let u = unknown.get(n.midi);
      if (!u) {
        const mapped = opt.percussionMap[n.midi] ?? null;
        u = { note: n.midi, name: GM1_PERCUSSION[n.midi] ?? null, label: percussionLabel(n.midi), count: 0, where: [], mappedTo: mapped };
        unknown.set(n.midi, u);
      }
      u.count++;
      if (u.where.length < 8) u.where.push({ bar: Math.floor(x / L) + 1, seconds: Math.round(n.seconds * 1000) / 1000 });
      piece = u.mappedTo;
      if (!piece) continue;
    } else if (reading.via === "substitute") {
      const s = substituted.get(n.midi) ?? { note: n.midi, label: percussionLabel(n.midi), piece: reading.piece, count: 0 };
      s.count++;
      substituted.set(n.midi, s);
    }
    strokes.push({ piece: piece!, x, velocity: n.velocity, seconds: n.seconds, flam: false, dropped: false });
  }
  // Flams. First the graces Tactus writes (graceVelocity of the next stroke of the drum, within the window), then
  // any softer stroke just before another of the same piece, closer than half the finest step (so two strokes
  // that could be written on separate grid points are never folded into one).
  let flams = 0;
  const finest = T > 0 ? Math.min(S, T) : S;
  const byPiece = new Map<KitPieceId, Stroke[]>();
  for (const s of strokes) {
    const list = byPiece.get(s.piece);
    if (list) list.push(s);
    else byPiece.set(s.piece, [s]);
  }
  const fold = (p: Stroke, s: Stroke) => {
    p.dropped = true;
    s.flam = true;
    flams++;
  };
  const within = (p: Stroke, s: Stroke) => !p.dropped && !p.flam && s.seconds - p.seconds <= FLAM_WINDOW_SECONDS;
  for (const list of byPiece.values()) {
    for (let i = 1; i < list.length; i++) {
      const [p, s] = [list[i - 1]!, list[i]!];
      if (within(p, s) && p.velocity === graceVelocity(s.velocity) && p.velocity < s.velocity) fold(p, s);
    }
    const rest = list.filter((s) => !s.dropped);
    const graceOf = (p: Stroke, s: Stroke) => within(p, s) && !s.flam && s.x - p.x < finest / 2 && p.velocity < s.velocity;
    for (let i = 1; i < rest.length; i++) {
      const [p, s, next] = [rest[i - 1]!, rest[i]!, rest[i + 1]];
      // A stroke that is itself the grace of the next one is not a main stroke.
      if (graceOf(p, s) && !(next && graceOf(s, next))) fold(p, s);
    }
  }
  const kept = strokes.filter((s) => !s.dropped);

  // Beat of a position: the one whose half-step-shifted window holds it.
  const beatOf = (x: number): number => {
    const y = x + S / 2;
    const bar = Math.floor(y / L);
    const inBar = y - bar * L;
    let b = nBeats - 1;
    while (b > 0 && beatStarts[b]! > inBar) b--;
    return bar * nBeats + b;
  };
  const beatStart = (beat: number) => Math.floor(beat / nBeats) * L + beatStarts[beat % nBeats]!;
  // A point stays in the beat it was assigned to (its end is the next beat's start, on every grid), so a
  // re-import assigns it to the same beat and makes the same choice: importing is stable.
  const snap = (x: number, beat: number, step: number) => {
    if (step === S && !fromBeat) {
      const bar0 = Math.floor(beat / nBeats) * L;
      return bar0 + Math.round((x - bar0) / step) * step;
    }
    const b0 = beatStart(beat);
    return Math.min(b0 + beatLens[beat % nBeats]!, Math.max(b0, b0 + Math.round((x - b0) / step) * step));
  };

  // Triplet detection, beat by beat, over every onset.
  const useT = new Set<number>();
  if (T > 0) {
    const err = new Map<number, [number, number]>();
    const add = (x: number) => {
      const beat = beatOf(x);
      if (!tripletOk[beat % nBeats]) return;
      const e = err.get(beat) ?? [0, 0];
      e[0] += Math.abs(x - snap(x, beat, S));
      e[1] += Math.abs(x - snap(x, beat, T));
      err.set(beat, e);
    };
    for (const s of kept) add(s.x);
    for (const n of keyNotes) add(n.x);
    for (const [beat, [eS, eT]] of err) if (eS > 1e-6 && eT < eS / 2) useT.add(beat);
  }
  const stepFor = (beat: number) => (useT.has(beat) ? T : S);
  const quant = (x: number) => {
    const beat = beatOf(x);
    return Math.max(0, snap(x, beat, stepFor(beat)));
  };

  // Moves.
  const toMs = (units: number) => (units / D) * opt.secondsPerWhole * 1000;
  const moves: MoveReport[] = [];
  let movedCount = 0;
  let sumMs = 0;
  let maxMs = 0;
  const noteMove = (kind: "kit" | "keys", x: number, qx: number, who: { piece?: KitPieceId; pitch?: number }) => {
    const ms = toMs(qx - x);
    if (Math.abs(ms) < 0.05) return; // less than 1/20 ms: the note was on the grid
    movedCount++;
    sumMs += Math.abs(ms);
    if (Math.abs(ms) > maxMs) maxMs = Math.abs(ms);
    moves.push({ kind, ...who, from: Math.round((x / D) * 1e6) / 1e6, to: unitsToRational(qx, D), shiftMs: Math.round(ms * 10) / 10, bar: Math.floor(qx / L) + 1 });
  };

  // Kit hits, merged per piece and grid point (the loudest wins; a flam stays a flam).
  const hitMap = new Map<KitPieceId, Map<number, { velocity: number; flam: boolean }>>();
  let merged = 0;
  let lastUnit = 0;
  for (const s of kept) {
    const qx = quant(s.x);
    if (qx === 0 && s.flam) s.flam = false; // a flam needs room for its grace before it
    noteMove("kit", s.x, qx, { piece: s.piece });
    let m = hitMap.get(s.piece);
    if (!m) hitMap.set(s.piece, (m = new Map()));
    const prev = m.get(qx);
    if (prev) {
      merged++;
      prev.velocity = Math.max(prev.velocity, s.velocity);
      prev.flam ||= s.flam;
    } else m.set(qx, { velocity: s.velocity, flam: s.flam });
    lastUnit = Math.max(lastUnit, qx + 1);
  }

  // Keys notes, merged per pitch and grid point (the longer and louder win).
  const noteMap = new Map<string, { s: number; e: number; midi: number; velocity: number }>();
  for (const n of keyNotes) {
    const s = quant(n.x);
    let e = quant(n.xEnd);
    if (e <= s) e = s + stepFor(beatOf(n.x));
    noteMove("keys", n.x, s, { pitch: n.midi });
    const key = `${s}|${n.midi}`;
    const prev = noteMap.get(key);
    if (prev) {
      merged++;
      prev.e = Math.max(prev.e, e);
      prev.velocity = Math.max(prev.velocity, n.velocity);
    } else noteMap.set(key, { s, e, midi: n.midi, velocity: n.velocity });
    lastUnit = Math.max(lastUnit, e);
  }

  const bars = Math.max(1, Math.ceil(lastUnit / L));
  if (bars > LIMITS.maxBars) {
    throw new MidiImportError("too_long", `The music lasts ${bars.toLocaleString("en-GB")} bars at ${meter.beatsPerBar}/${meter.beatUnit}; a groove holds at most ${LIMITS.maxBars.toLocaleString("en-GB")}.`);
  }
  for (const m of hitMap.values()) {
    if (m.size > LIMITS.maxHitsPerLane) throw new MidiImportError("too_many_notes", `One kit piece has ${m.size.toLocaleString("en-GB")} strokes; a groove holds at most ${LIMITS.maxHitsPerLane.toLocaleString("en-GB")} per piece.`);
  }
  if (noteMap.size > LIMITS.maxKeyNotes) throw new MidiImportError("too_many_notes", `The keys have ${noteMap.size.toLocaleString("en-GB")} notes; a groove holds at most ${LIMITS.maxKeyNotes.toLocaleString("en-GB")}.`);

  // The groove's grid: the chosen step when everything is on it, else the triplet step, else both.
  const values: number[] = [];
  for (const m of hitMap.values()) for (const x of m.keys()) values.push(x);
  for (const n of noteMap.values()) values.push(n.s, n.e - n.s);
  let unit = S;
  if (T > 0 && !values.every((v) => v % S === 0)) unit = values.every((v) => v % T === 0) ? T : gcd(S, T);
  unit = gcd(unit, L);
  const grid = unitsToRational(unit, D);

  const lanes: QuantiseOutput["lanes"] = [];
  for (const piece of KIT_ROW_ORDER) {
    const m = hitMap.get(piece);
    if (!m) continue;
    const hits = [...m.entries()]
      .sort((a, b) => a[0] - b[0])
      .map(([x, h]) => (h.flam ? { at: unitsToRational(x, D), dynamic: dynamicOf(h.velocity), articulation: "flam" as const } : { at: unitsToRational(x, D), dynamic: dynamicOf(h.velocity) }));
    lanes.push({ piece, hits });
  }
  const notes = [...noteMap.values()]
    .sort((a, b) => a.s - b.s || a.midi - b.midi)
    .map((n) => ({ at: unitsToRational(n.s, D), duration: unitsToRational(n.e - n.s, D), pitch: n.midi, velocity: n.velocity }));

  moves.sort((a, b) => Math.abs(b.shiftMs) - Math.abs(a.shiftMs) || a.from - b.from);
  const tripletBeats = [...useT].sort((a, b) => a - b).map((beat) => ({ bar: Math.floor(beat / nBeats) + 1, beat: (beat % nBeats) + 1 }));
  const unknownList = [...unknown.values()].sort((a, b) => a.note - b.note);
  for (const u of unknownList) {
    if (!u.mappedTo) opt.warnings.push(`${u.label} has no piece in the kit: its ${u.count} stroke${u.count === 1 ? " was" : "s were"} left out; choose a piece for it to bring ${u.count === 1 ? "it" : "them"} in.`);
  }
  const written = lanes.reduce((a, l) => a + l.hits.length, 0) + notes.length;
  return {
    grid,
    bars,
    lanes,
    notes,
    report: {
      notes: { total: raw.length, kit: kitCount, keys: keysCount, written },
      moved: { count: movedCount, maxMs: Math.round(maxMs * 10) / 10, meanMs: movedCount ? Math.round((sumMs / movedCount) * 10) / 10 : 0 },
      moves: moves.slice(0, MAX_LISTED_MOVES),
      tripletBeats,
      substituted: [...substituted.values()].sort((a, b) => a.note - b.note),
      unknownPercussion: unknownList,
      merged,
      flams,
      warnings: opt.warnings,
    },
  };
}

function unitsToRational(x: number, D: number): Rational {
  const g = gcd(x, D) || 1;
  return D / g === 1 ? String(x / g) : `${x / g}/${D / g}`;
}

/** Sections from the first track's markers, each starting at the nearest bar line. */
function markerSections(midi: Midi, ppq: number, meter: Meter, bars: number, warnings: string[]): Section[] {
  const barTicks = (4 * ppq * meter.beatsPerBar) / meter.beatUnit;
  const starts = new Map<number, string>();
  for (const m of midi.header.meta) {
    if (m.type !== "marker") continue;
    const bar = Math.round(m.ticks / barTicks);
    const name = decodeText(m.text).trim().slice(0, 40).trim();
    if (bar >= bars || starts.has(bar)) continue;
    starts.set(bar, name);
  }
  if (starts.size === 0) return [];
  if (!starts.has(0)) starts.set(0, "Start");
  const sorted = [...starts.entries()].sort((a, b) => a[0] - b[0]);
  if (sorted.length > LIMITS.maxSections) warnings.push(`The file has ${sorted.length} markers; the groove keeps the first ${LIMITS.maxSections} as sections.`);
  const kept = sorted.slice(0, LIMITS.maxSections);
  return kept.map(([startBar, name], i) => ({
    name: name || `Section ${i + 1}`,
    startBar,
    bars: (kept[i + 1]?.[0] ?? bars) - startBar,
    repeats: 1,
  }));
}

/** For the report: the name of a kit piece. */
export function pieceName(piece: KitPieceId): string {
  return KIT_PIECES[piece].name;
}
