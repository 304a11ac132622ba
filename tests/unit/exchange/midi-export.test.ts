/**
 * MIDI export, checked against published sources:
 * - Standard MIDI File 1.0 (International MIDI Association, in the Complete MIDI 1.0 Detailed Specification):
 *   the header chunk, the division, FF 51 tempo in microseconds per quarter note, FF 58 time signature (with
 *   the specification's own 6/8 example), FF 06 markers, FF 2F 00 at the end of every track;
 * - General MIDI System Level 1 (MMA, RP003): the percussion key map on channel 10;
 * - @tonejs/midi, a general-purpose MIDI package, reading the files back (round trip against compileSchedule).
 */
import { test as fcTest } from "@fast-check/vitest";
import { Midi } from "../../../src/lib/exchange/tonejs-midi";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { exportMidi, KEYS_TRACK_NAME, KIT_TRACK_NAME, metronomeClocks, MIDI_PPQ, quarterBpm, tempoMicroseconds } from "../../../src/lib/exchange/midi-export";
import { DEMO_GROOVES } from "../../../src/lib/demo/grooves";
import { FLAM_GRACE_SECONDS, FLAM_GRACE_VELOCITY_RATIO } from "../../../src/lib/rhythm/playback-plan";
import {
  assertGroove,
  compileSchedule,
  DYNAMIC_VELOCITY,
  emptyGroove,
  KIT_PIECE_IDS,
  KIT_PIECES,
  type GrooveDocument,
  type GrooveDocumentInput,
  type KitPieceId,
} from "../../../src/lib/rhythm";
import { grooveArb } from "../rhythm/arbitraries";
import { noteEvents, vlq as writerVlq, writeSmf } from "../../../src/lib/exchange/smf-write";
import { hex, readSmf } from "./smf-reader";

const groove = (patch: Partial<GrooveDocumentInput>): GrooveDocument => assertGroove({ ...emptyGroove(), ...patch });
const metaOf = (bytes: Uint8Array, type: number) => readSmf(bytes).tracks[0]!.events.filter((e) => e.meta === type);

describe("Standard MIDI File 1.0 bytes", () => {
  const doc = groove({
    tempo: { bpm: "120", beatNote: "1/4" },
    kit: { lanes: [{ piece: "kick", hits: [{ at: "0" }] }] },
    keys: { notes: [{ at: "0", duration: "1/4", pitch: 60, velocity: 77 }], splitPitch: 60 },
  });
  const bytes = exportMidi(doc, { title: "Header check" });

  it("header chunk: MThd, length 6, format 1, tracks, division 480 = 01 E0 (SMF 1.0 header chunk)", () => {
    // "MThd" 00 00 00 06, format 0001, ntrks 0003 (conductor, kit, keys), division 01E0: SMF 1.0, header chunk.
    expect(hex(bytes.subarray(0, 14))).toBe("4D 54 68 64 00 00 00 06 00 01 00 03 01 E0");
    expect(MIDI_PPQ).toBe(0x01e0);
  });

  it("every track chunk is MTrk and ends with FF 2F 00 (SMF 1.0, end of track)", () => {
    const smf = readSmf(bytes);
    expect(smf.tracks).toHaveLength(3);
    for (const t of smf.tracks) {
      expect(hex(t.raw.slice(0, 4))).toBe("4D 54 72 6B");
      expect(hex(t.raw.slice(-3))).toBe("FF 2F 00");
    }
  });

  it("tempo at 120 bpm is FF 51 03 07 A1 20: 500000 µs per quarter note (SMF 1.0, set tempo)", () => {
    expect(hex(metaOf(bytes, 0x51)[0]!.raw)).toBe("FF 51 03 07 A1 20");
  });

  it("tempo is per QUARTER note: 58 dotted quarters per minute = 87 quarters = 689655 µs (60,000,000 / 87, rounded)", () => {
    const six = groove({ meter: { beatsPerBar: 6, beatUnit: 8 }, tempo: { bpm: "58", beatNote: "3/8" } });
    expect(quarterBpm(six.tempo)).toBe(87);
    expect(tempoMicroseconds(six.tempo)).toBe(689655);
    const d = metaOf(exportMidi(six), 0x51)[0]!.data;
    expect((d[0]! << 16) | (d[1]! << 8) | d[2]!).toBe(689655);
  });

  it("a fractional tempo is written as the nearest microsecond: 75.5 bpm → 794702 µs", () => {
    const d = metaOf(exportMidi(groove({ tempo: { bpm: "151/2", beatNote: "1/4" } })), 0x51)[0]!.data;
    expect((d[0]! << 16) | (d[1]! << 8) | d[2]!).toBe(794702); // 60e6 / 75.5 = 794701.99
  });

  it("time signature 4/4 is FF 58 04 04 02 18 08 (SMF 1.0, time signature)", () => {
    expect(hex(metaOf(bytes, 0x58)[0]!.raw)).toBe("FF 58 04 04 02 18 08");
  });

  it("time signature 6/8 is FF 58 04 06 03 24 08, the specification's own example (a click every dotted quarter)", () => {
    const six = exportMidi(groove({ meter: { beatsPerBar: 6, beatUnit: 8 }, tempo: { bpm: "58", beatNote: "3/8" } }));
    expect(hex(metaOf(six, 0x58)[0]!.raw)).toBe("FF 58 04 06 03 24 08");
    expect(metronomeClocks({ beatsPerBar: 6, beatUnit: 8 })).toBe(0x24);
  });

  it("other meters: dd is the power of two of the denominator; clicks on the counted beat (24 MIDI clocks per quarter)", () => {
    const cases: [GrooveDocumentInput["meter"], string][] = [
      [{ beatsPerBar: 3, beatUnit: 4 }, "FF 58 04 03 02 18 08"],
      [{ beatsPerBar: 2, beatUnit: 2 }, "FF 58 04 02 01 30 08"], // half-note click = 48 clocks
      [{ beatsPerBar: 12, beatUnit: 8 }, "FF 58 04 0C 03 24 08"],
      [{ beatsPerBar: 7, beatUnit: 8, grouping: [2, 2, 3] }, "FF 58 04 07 03 0C 08"], // eighth click = 12 clocks
    ];
    for (const [meter, expected] of cases) {
      const b = exportMidi(groove({ meter, grid: { step: "1/8" } }));
      expect(hex(metaOf(b, 0x58)[0]!.raw), `${meter.beatsPerBar}/${meter.beatUnit}`).toBe(expected);
    }
  });

  it("the title is the conductor track's name (FF 03), in UTF-8", () => {
    const named = exportMidi(doc, { title: "Harbour Lights — verse" });
    const name = metaOf(named, 0x03)[0]!;
    expect(new TextDecoder().decode(Uint8Array.from(name.data))).toBe("Harbour Lights — verse");
  });

  it("kit notes are note-ons on channel 10 (status 99) and keys on channel 1 (status 90), each on its own track", () => {
    const smf = readSmf(bytes);
    const ons = smf.tracks.map((t) => t.events.filter((e) => (e.status & 0xf0) === 0x90 && e.data[1]! > 0));
    expect(ons[0]).toEqual([]);
    expect(ons[1]!.map((e) => hex(e.raw))).toEqual(["99 24 5A"]); // kick 36 at velocity 90
    expect(ons[2]!.map((e) => hex(e.raw))).toEqual(["90 3C 4D"]); // C4 = 60 at velocity 77
  });
});

describe("General MIDI Level 1 percussion keys", () => {
  // GM1 percussion key map (MMA RP003), copied from the standard's table: the kit piece → key and GM name.
  const GM1: Record<KitPieceId, [number, string]> = {
    kick: [36, "Bass Drum 1"],
    "cross-stick": [37, "Side Stick"],
    snare: [38, "Acoustic Snare"],
    clap: [39, "Hand Clap"],
    "hihat-closed": [42, "Closed Hi-Hat"],
    "tom-floor": [43, "High Floor Tom"],
    "hihat-foot": [44, "Pedal Hi-Hat"],
    "hihat-open": [46, "Open Hi-Hat"],
    "tom-mid": [47, "Low-Mid Tom"],
    crash: [49, "Crash Cymbal 1"],
    "tom-high": [50, "High Tom"],
    ride: [51, "Ride Cymbal 1"],
    "ride-bell": [53, "Ride Bell"],
    tambourine: [54, "Tambourine"],
    cowbell: [56, "Cowbell"],
  };

  it("every kit piece is written with its GM1 key on channel 10", () => {
    expect(Object.keys(GM1).sort()).toEqual([...KIT_PIECE_IDS].sort());
    for (const piece of KIT_PIECE_IDS) {
      const b = exportMidi(groove({ kit: { lanes: [{ piece, hits: [{ at: "1/4" }] }] } }));
      const on = readSmf(b).tracks[1]!.events.find((e) => e.status === 0x99 && e.data[1]! > 0)!;
      expect(on.data[0], `${piece} should be GM ${GM1[piece][0]} ${GM1[piece][1]}`).toBe(GM1[piece][0]);
      expect(on.tick).toBe(480); // a quarter note in
    }
  });

  it("velocities come from the dynamics: ghost < normal < accent, as DYNAMIC_VELOCITY gives them", () => {
    const b = exportMidi(groove({ kit: { lanes: [{ piece: "snare", hits: [{ at: "0", dynamic: "ghost" }, { at: "1/4" }, { at: "1/2", dynamic: "accent" }] }] } }));
    const v = readSmf(b).tracks[1]!.events.filter((e) => e.status === 0x99 && e.data[1]! > 0).map((e) => e.data[1]);
    expect(v).toEqual([DYNAMIC_VELOCITY.ghost, DYNAMIC_VELOCITY.normal, DYNAMIC_VELOCITY.accent]);
    expect(v[0]! < v[1]! && v[1]! < v[2]!).toBe(true);
  });

  it("a flam adds a softer grace stroke of the same key just before the main stroke, as playback does", () => {
    const b = exportMidi(groove({ tempo: { bpm: "120", beatNote: "1/4" }, kit: { lanes: [{ piece: "snare", hits: [{ at: "1/4", articulation: "flam" }] }] } }));
    const ons = readSmf(b).tracks[1]!.events.filter((e) => e.status === 0x99 && e.data[1]! > 0);
    expect(ons.map((e) => e.data[0])).toEqual([38, 38]);
    expect(ons[1]!.tick).toBe(480);
    expect(ons[0]!.tick).toBe(480 - Math.round(FLAM_GRACE_SECONDS * 2 * 480)); // 120 bpm: 960 ticks a second
    expect(ons[0]!.data[1]).toBe(Math.round(90 * FLAM_GRACE_VELOCITY_RATIO));
  });

  it("a flam's grace never comes before the previous stroke of that drum, nor before the start", () => {
    // 240 bpm: a sixteenth lasts 62.5 ms, the grace would be 25 ms early; two sixteenths 1/32 apart leave 31 ms.
    const b = exportMidi(groove({ tempo: { bpm: "240", beatNote: "1/4" }, grid: { step: "1/32" }, kit: { lanes: [{ piece: "snare", hits: [{ at: "0", articulation: "flam" }, { at: "1/32", articulation: "flam" }, { at: "1/16", articulation: "flam" }] }] } }));
    const ons = readSmf(b).tracks[1]!.events.filter((e) => e.status === 0x99 && e.data[1]! > 0).map((e) => [e.tick, e.data[1]]);
    // No grace before the first stroke (tick 0); the next graces sit 25 ms (48 ticks at 1920 ticks/s) early,
    // after the previous stroke (ticks 0 and 60).
    expect(ons).toEqual([[0, 90], [60 - 48, 45], [60, 90], [120 - 48, 45], [120, 90]]);
  });
});

describe("song form", () => {
  it("section markers (FF 06) sit where each section is first played, repeats counted", () => {
    const doc = groove({
      bars: 3,
      sections: [
        { name: "Verse", startBar: 0, bars: 2, repeats: 2 },
        { name: "Chorus", startBar: 2, bars: 1, repeats: 1 },
      ],
      kit: { lanes: [{ piece: "kick", hits: [{ at: "0" }, { at: "2" }] }] },
    });
    const markers = metaOf(exportMidi(doc), 0x06);
    expect(markers.map((m) => [String.fromCharCode(...m.data), m.tick])).toEqual([
      ["Verse", 0],
      ["Chorus", 4 * 4 * 480], // after two passes of two 4/4 bars
    ]);
    // The kick of bar 1 sounds in every pass of the verse: passes 0 and 2 of the play order.
    const kicks = readSmf(exportMidi(doc)).tracks[1]!.events.filter((e) => e.status === 0x99 && e.data[1]! > 0).map((e) => e.tick);
    expect(kicks).toEqual([0, 2 * 1920, 4 * 1920]);
  });
});

/**
 * Expected notes of the exported file, from the schedule: main strokes; for each flam, the window where its grace
 * may sit (FLAM_GRACE_SECONDS before the main stroke, but after the previous stroke of that drum and the start).
 */
function expectedOnsets(doc: GrooveDocument) {
  const main: { time: number; note: number; velocity: number }[] = [];
  const grace: { from: number; to: number; note: number; velocity: number }[] = [];
  const keys: { time: number; end: number; pitch: number; velocity: number }[] = [];
  const last = new Map<number, number>();
  for (const e of compileSchedule(doc)) {
    if (e.kind === "keys") keys.push({ time: e.time, end: e.time + e.duration, pitch: e.pitch!, velocity: e.velocity });
    else {
      const note = KIT_PIECES[e.piece!].gmNote;
      main.push({ time: e.time, note, velocity: e.velocity });
      if (e.articulation === "flam") {
        grace.push({ from: Math.max(e.time - FLAM_GRACE_SECONDS, last.get(note) ?? 0), to: e.time, note, velocity: Math.max(1, Math.round(e.velocity * FLAM_GRACE_VELOCITY_RATIO)) });
      }
      last.set(note, e.time);
    }
  }
  // MIDI cannot hold one key twice: a keys note still sounding when its pitch is struck again ends there.
  for (const k of keys) {
    const next = keys.filter((o) => o.pitch === k.pitch && o.time > k.time + 1e-9).sort((a, b) => a.time - b.time)[0];
    if (next && next.time < k.end) k.end = next.time;
  }
  return { main, grace, keys };
}

describe("round trip through @tonejs/midi", () => {
  const check = (doc: GrooveDocument, durations: boolean) => {
    const midi = new Midi(exportMidi(doc));
    const tick = 60 / (quarterBpm(doc.tempo) * MIDI_PPQ); // seconds in one tick at the groove's tempo
    const tol = tick + 1e-9;
    const { main, grace, keys } = expectedOnsets(doc);
    // Tracks by name: @tonejs/midi reads a track's channel from its notes, so an empty track reads as channel 1.
    const kit = midi.tracks.find((t) => t.name === KIT_TRACK_NAME);
    const keysTrack = midi.tracks.find((t) => t.name === KEYS_TRACK_NAME);
    if (kit && kit.notes.length > 0) expect(kit.channel).toBe(9);
    if (keysTrack) expect(keysTrack.channel).toBe(0);
    const got = (kit?.notes ?? []).map((n) => ({ time: n.time, note: n.midi, velocity: Math.round(n.velocity * 127) }));
    // Every scheduled kit stroke is in the file within one tick, with its velocity.
    for (const e of main) {
      const hit = got.find((g) => g.note === e.note && Math.abs(g.time - e.time) <= tol && g.velocity === e.velocity);
      expect(hit, `kit ${e.note} at ${e.time}s`).toBeDefined();
    }
    // Every note in the file is a scheduled stroke, or the softer grace of a flam in its window.
    for (const g of got) {
      const ok =
        main.some((e) => e.note === g.note && Math.abs(g.time - e.time) <= tol) ||
        grace.some((e) => e.note === g.note && g.velocity === e.velocity && g.time >= e.from - tol && g.time < e.to - 1e-9);
      expect(ok, `unexpected kit ${g.note} at ${g.time}s`).toBe(true);
    }
    expect(got.length).toBeLessThanOrEqual(main.length + grace.length);
    const gotKeys = (keysTrack?.notes ?? []).map((n) => ({ time: n.time, end: n.time + n.duration, pitch: n.midi, velocity: Math.round(n.velocity * 127) }));
    expect(gotKeys).toHaveLength(keys.length);
    const sortK = <T extends { time: number; pitch: number }>(a: T[]) => [...a].sort((x, y) => x.time - y.time || x.pitch - y.pitch);
    const [a, b] = [sortK(gotKeys), sortK(keys)];
    for (let i = 0; i < a.length; i++) {
      expect(Math.abs(a[i]!.time - b[i]!.time), `keys onset ${i}`).toBeLessThanOrEqual(tol);
      expect(a[i]!.pitch).toBe(b[i]!.pitch);
      expect(a[i]!.velocity).toBe(b[i]!.velocity);
      if (durations) expect(Math.abs(a[i]!.end - b[i]!.end), `keys end ${i}`).toBeLessThanOrEqual(tol);
    }
  };

  it("every demo groove: every onset within one tick of compileSchedule", () => {
    for (const g of DEMO_GROOVES) check(assertGroove(g.document), true);
  });

  fcTest.prop([grooveArb()], { numRuns: 150 })("any groove: every onset within one tick of compileSchedule (swing, sections, triplets)", (doc) => {
    check(doc, false);
  });

  fcTest.prop([grooveArb()], { numRuns: 100 })("keys notes also end within one tick of their scheduled end (or where their key is struck again)", (doc) => {
    check(doc, true);
  });

  it("the file lasts as long as the schedule's last sound", () => {
    const doc = assertGroove(DEMO_GROOVES[0]!.document);
    const midi = new Midi(exportMidi(doc));
    const last = Math.max(...compileSchedule(doc).map((e) => e.time + (e.kind === "keys" ? e.duration : 0)));
    expect(Math.abs(midi.duration - last)).toBeLessThan(0.2);
  });
});

describe("sizes", () => {
  fcTest.prop([fc.constantFrom(...DEMO_GROOVES)])("format 1 with 2 or 3 tracks (conductor, kit, keys when there are keys)", (g) => {
    const doc = assertGroove(g.document);
    const smf = readSmf(exportMidi(doc));
    expect(smf.header.format).toBe(1);
    expect(smf.header.tracks).toBe(doc.keys.notes.length > 0 ? 3 : 2);
    expect(smf.tracks).toHaveLength(smf.header.tracks);
  });
});

describe("the SMF writer", () => {
  it("encodes variable-length quantities as SMF 1.0's own examples", () => {
    // Standard MIDI File 1.0, "variable-length quantities" table.
    const examples: [number, string][] = [
      [0x00, "00"],
      [0x40, "40"],
      [0x7f, "7F"],
      [0x80, "81 00"],
      [0x2000, "C0 00"],
      [0x3fff, "FF 7F"],
      [0x4000, "81 80 00"],
      [0x100000, "C0 80 00"],
      [0x1fffff, "FF FF 7F"],
      [0x200000, "81 80 80 00"],
      [0x8000000, "C0 80 80 00"],
      [0x0fffffff, "FF FF FF 7F"],
    ];
    for (const [n, bytes] of examples) expect(hex(writerVlq(n)), n.toString(16)).toBe(bytes);
    expect(() => writerVlq(0x10000000)).toThrow(RangeError);
  });

  it("releases a key before striking it again on the same tick (note-off first)", () => {
    const [on1, off1] = noteEvents(9, 38, 90, 0, 120);
    const [on2, off2] = noteEvents(9, 38, 90, 120, 240);
    const smf = readSmf(writeSmf(480, [[on2!, off2!, on1!, off1!]]));
    expect(smf.tracks[0]!.events.map((e) => [e.tick, hex(e.raw)])).toEqual([
      [0, "99 26 5A"],
      [120, "89 26 00"],
      [120, "99 26 5A"],
      [240, "89 26 00"],
      [240, "FF 2F 00"],
    ]);
  });
});
