/**
 * Standard MIDI File export (format 1) of a groove document, written by @tonejs/midi.
 *
 * Layout (Standard MIDI File 1.0, International MIDI Association; General MIDI System Level 1, MMA):
 * - division: MIDI_PPQ = 480 ticks per quarter note;
 * - track 0 (conductor): the title as track name, section markers (FF 06) where each section is first
 *   played, one tempo (FF 51, microseconds per QUARTER note) and one time signature (FF 58);
 * - "Drum kit" on channel 10 (status nibble 9) with General MIDI Level 1 percussion keys and velocities
 *   from the dynamics (DYNAMIC_VELOCITY); a flam adds its soft grace stroke before the main stroke, as
 *   playback does (FLAM_GRACE_SECONDS, FLAM_GRACE_VELOCITY_RATIO), but never before the previous stroke of that
 *   drum nor before the start of the file;
 * - "Keys" on channel 1 with the notes' own pitches and velocities; a note still held when its key is struck
 *   again (a long note in a repeated section) ends there, since MIDI cannot hold one key twice.
 * Every onset comes from `compileSchedule`, so sections, repeats, swing and notes held across a loop seam
 * sound exactly as in playback; seconds become ticks at the written tempo (rounded to the nearest tick).
 */
import { Midi } from "@tonejs/midi";
import type { GrooveDocument, Meter, Tempo } from "../rhythm/document";
import { KIT_PIECES } from "../rhythm/kit";
import { naturalBeatNote } from "../rhythm/meter";
import { FLAM_GRACE_SECONDS, FLAM_GRACE_VELOCITY_RATIO } from "../rhythm/playback-plan";
import { q } from "../rhythm/rational";
import { compileSchedule, type ScheduledEvent } from "../rhythm/schedule";

/** Ticks per quarter note in exported files. */
export const MIDI_PPQ = 480;
/** 0-based channel numbers: channel 10 is the General MIDI percussion channel. */
export const KIT_CHANNEL = 9;
export const KEYS_CHANNEL = 0;
/** General MIDI program for the keys track (0 = Acoustic Grand Piano, GM1 sound set). */
export const KEYS_PROGRAM = 0;
export const KIT_TRACK_NAME = "Drum kit";
export const KEYS_TRACK_NAME = "Keys";

/**
 * Quarter notes per minute of a tempo (the tempo's beat may be a dotted quarter, a half…).
 * @example quarterBpm({ bpm: "58", beatNote: "3/8" }) // 87
 */
export function quarterBpm(tempo: Tempo): number {
  return q(tempo.bpm).mul(q(tempo.beatNote)).mul(4).valueOf();
}

/**
 * The FF 51 value: microseconds per quarter note, rounded (SMF 1.0: 60,000,000 / bpm; 120 bpm = 500000).
 * @example tempoMicroseconds({ bpm: "120", beatNote: "1/4" }) // 500000
 */
export function tempoMicroseconds(tempo: Tempo): number {
  return Math.round(q(60_000_000).div(q(tempo.bpm).mul(q(tempo.beatNote)).mul(4)).valueOf());
}

/**
 * The FF 58 "cc" byte: MIDI clocks (24 per quarter note) per metronome click, the click being the counted
 * beat (a dotted quarter in compound meters). SMF 1.0's own example: 6/8 clicks every dotted quarter = 36.
 * @example metronomeClocks({ beatsPerBar: 6, beatUnit: 8 }) // 36
 */
export function metronomeClocks(meter: Meter): number {
  return Math.max(1, Math.min(255, Math.round(q(naturalBeatNote(meter)).mul(96).valueOf())));
}

export interface MidiExportOptions {
  /** Written as the conductor track's name. */
  title?: string;
}

interface Pending {
  tick: number;
  length: number;
  midi: number;
  velocity: number;
  /** The grace stroke of a flam (gives way to a main stroke on the same tick). */
  grace?: boolean;
}

/**
 * Export a groove as a Standard MIDI File (format 1, 480 ticks per quarter note).
 * @example const bytes = exportMidi(doc, { title: "Harbour Lights at Four" }); // Uint8Array starting "MThd"
 */
export function exportMidi(doc: GrooveDocument, options: MidiExportOptions = {}): Uint8Array {
  const events = compileSchedule(doc);
  const ticksPerSecond = (quarterBpm(doc.tempo) / 60) * MIDI_PPQ;
  const toTick = (seconds: number) => Math.max(0, Math.round(seconds * ticksPerSecond));

  const midi = new Midi();
  midi.header.name = utf8Bytes(options.title ?? "");
  // @tonejs/midi writes floor(60,000,000 / bpm): a quarter of a microsecond of headroom makes that floor land
  // on the rounded value whatever the float error.
  const us = tempoMicroseconds(doc.tempo);
  midi.header.tempos = [{ ticks: 0, bpm: 60_000_000 / (us + 0.25) }];
  midi.header.timeSignatures = [{ ticks: 0, timeSignature: [doc.meter.beatsPerBar, doc.meter.beatUnit] }];
  midi.header.meta = sectionMarkers(doc, toTick);
  midi.header.update();

  const kit: Pending[] = [];
  const keys: Pending[] = [];
  const lastTick = new Map<number, number>(); // GM key → tick of its latest main stroke
  for (const e of events) {
    const tick = toTick(e.time);
    if (e.kind === "keys") {
      keys.push({ tick, length: Math.max(1, toTick(e.time + e.duration) - tick), midi: e.pitch!, velocity: e.velocity });
      continue;
    }
    const note = KIT_PIECES[e.piece!].gmNote;
    const length = Math.max(1, Math.round(e.duration * ticksPerSecond));
    if (e.articulation === "flam") addGrace(kit, e, note, length, toTick, tick, lastTick.get(note));
    kit.push({ tick, length, midi: note, velocity: e.velocity });
    lastTick.set(note, tick);
  }

  const hasKeys = keys.length > 0;
  if (doc.kit.lanes.length > 0 || !hasKeys) {
    const track = midi.addTrack();
    track.name = KIT_TRACK_NAME;
    track.channel = KIT_CHANNEL;
    addNotes(track, separateRepeats(kit));
  }
  if (hasKeys) {
    const track = midi.addTrack();
    track.name = KEYS_TRACK_NAME;
    track.channel = KEYS_CHANNEL;
    track.instrument.number = KEYS_PROGRAM;
    addNotes(track, separateRepeats(keys));
  }
  const bytes = midi.toArray();
  setMetronomeClocks(bytes, metronomeClocks(doc.meter));
  return bytes;
}

/**
 * The grace stroke of a flam, FLAM_GRACE_SECONDS before the main stroke; when the previous stroke of the same drum
 * (or the start of the file) is closer than that, just after it: a grace always sits between the two strokes.
 * None when no tick is free before the main stroke.
 */
function addGrace(kit: Pending[], e: ScheduledEvent, note: number, length: number, toTick: (s: number) => number, mainTick: number, previous?: number): void {
  const tick = Math.max(toTick(e.time - FLAM_GRACE_SECONDS), previous !== undefined ? previous + 1 : 0);
  if (tick >= mainTick) return;
  kit.push({ tick, length, midi: note, velocity: graceVelocity(e.velocity), grace: true });
}

/**
 * Velocity of a flam's grace stroke (FLAM_GRACE_VELOCITY_RATIO of the main stroke's, at least 1).
 * @example graceVelocity(90) // 45
 */
export function graceVelocity(velocity: number): number {
  return Math.max(1, Math.round(velocity * FLAM_GRACE_VELOCITY_RATIO));
}

/**
 * Notes of one key must not overlap: the note-off of the first would cut the second, and readers pair note-offs
 * with note-ons by key. Each note is ended where the same key is struck again (a held keys note in a repeated
 * section, a drum stroke); strokes on the same tick are merged (a main stroke before a flam's grace, then the
 * loudest).
 */
function separateRepeats(notes: Pending[]): Pending[] {
  const byKey = new Map<number, Pending[]>();
  for (const n of notes) {
    const list = byKey.get(n.midi);
    if (list) list.push(n);
    else byKey.set(n.midi, [n]);
  }
  const out: Pending[] = [];
  for (const list of byKey.values()) {
    list.sort((a, b) => a.tick - b.tick || Number(a.grace ?? false) - Number(b.grace ?? false) || b.velocity - a.velocity);
    for (let i = 0; i < list.length; i++) {
      const n = list[i]!;
      if (i > 0 && list[i - 1]!.tick === n.tick) continue;
      let j = i + 1;
      while (j < list.length && list[j]!.tick === n.tick) j++;
      const next = list[j];
      out.push(next && next.tick < n.tick + n.length ? { ...n, length: next.tick - n.tick } : n);
    }
  }
  return out.sort((a, b) => a.tick - b.tick || a.midi - b.midi);
}

function addNotes(track: ReturnType<Midi["addTrack"]>, notes: readonly Pending[]): void {
  // Notes arrive in tick order, so @tonejs/midi's sorted insert always takes its append path.
  const sorted = [...notes].sort((a, b) => a.tick - b.tick || a.midi - b.midi);
  for (const n of sorted) track.addNote({ midi: n.midi, ticks: n.tick, durationTicks: n.length, velocity: n.velocity / 127 });
}

/** A marker (FF 06) with the section's name where each section is first played. */
function sectionMarkers(doc: GrooveDocument, toTick: (s: number) => number): { type: string; text: string; ticks: number }[] {
  if (doc.sections.length === 0) return [];
  const barSeconds = (4 * q(doc.meter.beatsPerBar).div(doc.meter.beatUnit).valueOf() * 60) / quarterBpm(doc.tempo);
  const markers: { type: string; text: string; ticks: number }[] = [];
  let pass = 0;
  for (const s of doc.sections) {
    markers.push({ type: "marker", text: utf8Bytes(s.name), ticks: toTick(pass * barSeconds) });
    pass += s.bars * s.repeats;
  }
  return markers;
}

/**
 * Text for a meta event as UTF-8: the MIDI writer stores one byte per character, so the string handed to it
 * holds the UTF-8 bytes as characters (plain ASCII is unchanged).
 */
function utf8Bytes(text: string): string {
  return String.fromCharCode(...new TextEncoder().encode(text));
}

/**
 * @tonejs/midi always writes 24 MIDI clocks per metronome click (right for quarter-note beats only). This sets
 * the "cc" byte of the time signature in track 0, walking that track's events (all meta events there).
 */
export function setMetronomeClocks(bytes: Uint8Array, clocks: number): void {
  let p = 8 + ((bytes[4]! << 24) | (bytes[5]! << 16) | (bytes[6]! << 8) | bytes[7]!); // after MThd
  if (String.fromCharCode(...bytes.subarray(p, p + 4)) !== "MTrk") throw new Error("no first track to patch");
  const length = ((bytes[p + 4]! << 24) | (bytes[p + 5]! << 16) | (bytes[p + 6]! << 8) | bytes[p + 7]!) >>> 0;
  const end = p + 8 + length;
  p += 8;
  const vlq = () => {
    let v = 0;
    for (let i = 0; i < 4; i++) {
      const b = bytes[p++]!;
      v = (v << 7) | (b & 0x7f);
      if ((b & 0x80) === 0) break;
    }
    return v;
  };
  while (p < end) {
    vlq(); // delta time
    if (bytes[p] !== 0xff) throw new Error("unexpected non-meta event in the conductor track");
    const type = bytes[p + 1]!;
    p += 2;
    const len = vlq();
    if (type === 0x58 && len === 4) bytes[p + 2] = clocks;
    p += len;
  }
}
