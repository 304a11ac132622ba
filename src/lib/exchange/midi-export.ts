/**
 * Standard MIDI File export (format 1) of a groove document.
 *
 * Layout (Standard MIDI File 1.0, International MIDI Association; General MIDI System Level 1, MMA):
 * - division: MIDI_PPQ = 480 ticks per quarter note;
 * - track 0 (conductor): the title as track name (FF 03), section markers (FF 06) where each section is first
 *   played, one tempo (FF 51, microseconds per QUARTER note) and one time signature (FF 58, clicking on the
 *   counted beat);
 * - "Drum kit" on channel 10 (status nibble 9) with General MIDI Level 1 percussion keys and velocities
 *   from the dynamics (DYNAMIC_VELOCITY); a flam adds its soft grace stroke before the main stroke, as
 *   playback does (FLAM_GRACE_SECONDS, FLAM_GRACE_VELOCITY_RATIO), but never before the previous stroke of that
 *   drum nor before the start of the file;
 * - "Keys" on channel 1 (program 1, Acoustic Grand Piano) with the notes' own pitches and velocities; a note
 *   still held when its key is struck again (a long note in a repeated section) ends there, since MIDI cannot
 *   hold one key twice.
 * Every onset comes from `compileSchedule`, so sections, repeats, swing and notes held across a loop seam
 * sound exactly as in playback; seconds become ticks at the written tempo (rounded to the nearest tick).
 * The bytes are written by smf-write.ts (see there why not by @tonejs/midi, which reads them back in the tests).
 */
import type { GrooveDocument, Meter, Tempo } from "../rhythm/document";
import { KIT_PIECES } from "../rhythm/kit";
import { naturalBeatNote } from "../rhythm/meter";
import { FLAM_GRACE_SECONDS, FLAM_GRACE_VELOCITY_RATIO } from "../rhythm/playback-plan";
import { q } from "../rhythm/rational";
import { compileSchedule, type ScheduledEvent } from "../rhythm/schedule";
import { meta, metaText, noteEvents, RANK, writeSmf, type SmfEvent } from "./smf-write";

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

  const us = tempoMicroseconds(doc.tempo);
  const conductor: SmfEvent[] = [
    metaText(0, 0x03, options.title ?? ""),
    ...sectionMarkers(doc, toTick),
    meta(0, 0x51, [(us >> 16) & 0xff, (us >> 8) & 0xff, us & 0xff]),
    meta(0, 0x58, [doc.meter.beatsPerBar, Math.log2(doc.meter.beatUnit), metronomeClocks(doc.meter), 8]),
  ];

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

  const tracks: SmfEvent[][] = [conductor];
  const hasKeys = keys.length > 0;
  if (doc.kit.lanes.length > 0 || !hasKeys) tracks.push([metaText(0, 0x03, KIT_TRACK_NAME), ...notesOf(KIT_CHANNEL, separateRepeats(kit))]);
  if (hasKeys) {
    const program: SmfEvent = { tick: 0, rank: RANK.control, bytes: [0xc0 | KEYS_CHANNEL, KEYS_PROGRAM] };
    tracks.push([metaText(0, 0x03, KEYS_TRACK_NAME), program, ...notesOf(KEYS_CHANNEL, separateRepeats(keys))]);
  }
  return writeSmf(MIDI_PPQ, tracks);
}

function notesOf(channel: number, notes: readonly Pending[]): SmfEvent[] {
  const out: SmfEvent[] = [];
  for (const n of notes) out.push(...noteEvents(channel, n.midi, n.velocity, n.tick, n.tick + n.length));
  return out;
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

/** A marker (FF 06) with the section's name where each section is first played. */
function sectionMarkers(doc: GrooveDocument, toTick: (s: number) => number): SmfEvent[] {
  const barSeconds = (4 * q(doc.meter.beatsPerBar).div(doc.meter.beatUnit).valueOf() * 60) / quarterBpm(doc.tempo);
  const markers: SmfEvent[] = [];
  let pass = 0;
  for (const s of doc.sections) {
    markers.push(metaText(toTick(pass * barSeconds), 0x06, s.name));
    pass += s.bars * s.repeats;
  }
  return markers;
}
