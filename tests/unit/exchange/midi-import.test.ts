/**
 * MIDI import: tempo and meter from the meta events (Standard MIDI File 1.0: FF 51 microseconds per quarter
 * note, FF 58 time signature, no tempo event = 120 bpm), General MIDI Level 1 percussion keys (MMA RP003),
 * quantising with triplet detection and its report, and refusals of bad files with clear messages.
 * Test files are written with @tonejs/midi (a general-purpose MIDI package) or byte by byte from the
 * specification (smf-reader.ts).
 */
import { test as fcTest } from "@fast-check/vitest";
import { Midi } from "../../../src/lib/exchange/tonejs-midi";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { exportMidi } from "../../../src/lib/exchange/midi-export";
import { IMPORT_GRIDS, importMidi, MIDI_MAX_BYTES, MidiImportError, tempoFromMicroseconds, type ImportGrid, type MidiImportOptions } from "../../../src/lib/exchange/midi-import";
import { inspectSmf } from "../../../src/lib/exchange/smf-check";
import { DEMO_GROOVES } from "../../../src/lib/demo/grooves";
import { assertGroove, compareGrooves, q, type GrooveDocument } from "../../../src/lib/rhythm";
import { grooveArb } from "../rhythm/arbitraries";
import { buildSmf, vlq } from "./smf-reader";

interface NoteSpec {
  midi: number;
  /** Position in quarter notes. */
  beat: number;
  /** Length in quarter notes. */
  len?: number;
  velocity?: number;
}

/** A file written by @tonejs/midi: drums on channel 10, keys on channel 1. */
function file(opts: { bpm?: number | null; meter?: [number, number] | null; drums?: NoteSpec[]; keys?: NoteSpec[]; ppq?: number; markers?: [string, number][]; name?: string }): Uint8Array {
  const midi = new Midi();
  const ppq = midi.header.ppq;
  if (opts.bpm !== null) midi.header.tempos = [{ ticks: 0, bpm: opts.bpm ?? 120 }];
  if (opts.meter !== null) midi.header.timeSignatures = [{ ticks: 0, timeSignature: opts.meter ?? [4, 4] }];
  for (const [text, beat] of opts.markers ?? []) midi.header.meta.push({ type: "marker", text, ticks: Math.round(beat * ppq) });
  if (opts.name) midi.header.name = opts.name;
  midi.header.update();
  const add = (channel: number, notes: NoteSpec[] | undefined) => {
    if (!notes?.length) return;
    const t = midi.addTrack();
    t.channel = channel;
    for (const n of notes) t.addNote({ midi: n.midi, ticks: Math.round(n.beat * ppq), durationTicks: Math.max(1, Math.round((n.len ?? 0.25) * ppq)), velocity: (n.velocity ?? 90) / 127 });
  };
  add(9, opts.drums);
  add(0, opts.keys);
  return midi.toArray();
}

const refusal = (fn: () => unknown): MidiImportError => {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(MidiImportError);
    return e as MidiImportError;
  }
  throw new Error("expected a refusal");
};

const hitsOf = (doc: { kit: { lanes: { piece: string; hits: { at: string; dynamic: string; articulation?: string }[] }[] } }, piece: string) =>
  doc.kit.lanes.find((l) => l.piece === piece)?.hits ?? [];

describe("tempo and meter from the meta events", () => {
  it("reads FF 51 and FF 58: 96 bpm, 3/4", () => {
    const r = importMidi(file({ bpm: 96, meter: [3, 4], drums: [{ midi: 36, beat: 0 }] }));
    expect(r.document.tempo).toEqual({ bpm: "96", beatNote: "1/4" });
    expect(r.document.meter).toEqual({ beatsPerBar: 3, beatUnit: 4 });
    expect(r.missing).toEqual({ tempo: false, meter: false });
  });

  it("6/8 is counted in dotted quarters: 87 quarters per minute is 58 dotted quarters (common practice)", () => {
    const r = importMidi(file({ bpm: 87, meter: [6, 8], drums: [{ midi: 36, beat: 0 }] }));
    expect(r.document.tempo).toEqual({ bpm: "58", beatNote: "3/8" });
  });

  it("a tempo rounded to whole microseconds comes back as the simple number it stood for", () => {
    expect(tempoFromMicroseconds(500000, q("1/4")).toFraction()).toBe("120"); // SMF 1.0: 500000 µs = 120 bpm
    expect(tempoFromMicroseconds(794702, q("1/4")).toFraction()).toBe("151/2"); // 75.5 bpm
    expect(tempoFromMicroseconds(789474, q("1/4")).toFraction()).toBe("76"); // 60e6 / 76 = 789473.7
  });

  it("no tempo or time signature: SMF 1.0's defaults (120 bpm, and 4/4), flagged as missing so the dialog asks", () => {
    const r = importMidi(file({ bpm: null, meter: null, drums: [{ midi: 38, beat: 1 }] }));
    expect(r.missing).toEqual({ tempo: true, meter: true });
    expect(r.document.tempo.bpm).toBe("120");
    expect(r.document.meter).toEqual({ beatsPerBar: 4, beatUnit: 4 });
  });

  it("the answers to those questions are used: tempo and meter given by the caller", () => {
    const r = importMidi(file({ bpm: null, meter: null, drums: [{ midi: 38, beat: 1 }] }), { bpm: 84, meter: { beatsPerBar: 2, beatUnit: 4 } });
    expect(r.document.tempo.bpm).toBe("84");
    expect(r.document.meter).toEqual({ beatsPerBar: 2, beatUnit: 4 });
    expect(r.missing).toEqual({ tempo: true, meter: true }); // still true: the file itself has none
  });

  it("tempo and meter changes are reported, the first is kept", () => {
    const midi = new Midi();
    midi.header.tempos = [{ ticks: 0, bpm: 100 }, { ticks: 1920, bpm: 140 }];
    midi.header.timeSignatures = [{ ticks: 0, timeSignature: [4, 4] }, { ticks: 1920, timeSignature: [3, 4] }];
    midi.header.update();
    const t = midi.addTrack();
    t.channel = 9;
    t.addNote({ midi: 36, ticks: 0, durationTicks: 60, velocity: 0.7 });
    const r = importMidi(midi.toArray());
    expect(r.document.tempo.bpm).toBe("100");
    expect(r.report.warnings.join(" ")).toMatch(/changes tempo 1 time/);
    expect(r.report.warnings.join(" ")).toMatch(/changes meter 1 time/);
  });

  it("the title comes from the first track's name", () => {
    expect(importMidi(file({ name: "Ferry song", drums: [{ midi: 36, beat: 0 }] })).title).toBe("Ferry song");
  });
});

describe("percussion keys (General MIDI Level 1)", () => {
  it("GM1 keys become kit pieces; velocities become dynamics", () => {
    const r = importMidi(
      file({
        drums: [
          { midi: 36, beat: 0, velocity: 100 }, // Bass Drum 1
          { midi: 42, beat: 0, velocity: 30 }, // Closed Hi-Hat, soft: ghost
          { midi: 38, beat: 1, velocity: 127 }, // Acoustic Snare, hard: accent
          { midi: 46, beat: 1.5 }, // Open Hi-Hat
          { midi: 44, beat: 2 }, // Pedal Hi-Hat
          { midi: 37, beat: 3 }, // Side Stick
        ],
      }),
    );
    const d = r.document;
    expect(hitsOf(d, "kick")).toEqual([{ at: "0", dynamic: "normal" }]);
    expect(hitsOf(d, "hihat-closed")).toEqual([{ at: "0", dynamic: "ghost" }]);
    expect(hitsOf(d, "snare")).toEqual([{ at: "1/4", dynamic: "accent" }]);
    expect(hitsOf(d, "hihat-open")).toEqual([{ at: "3/8", dynamic: "normal" }]);
    expect(hitsOf(d, "hihat-foot")).toEqual([{ at: "1/2", dynamic: "normal" }]);
    expect(hitsOf(d, "cross-stick")).toEqual([{ at: "3/4", dynamic: "normal" }]);
  });

  it("GM1 keys that share a sound with a kit piece are read as it, and listed", () => {
    const r = importMidi(file({ drums: [{ midi: 40, beat: 1 }, { midi: 40, beat: 3 }, { midi: 35, beat: 0 }] })); // Electric Snare, Acoustic Bass Drum
    expect(hitsOf(r.document, "snare").map((h) => h.at)).toEqual(["1/4", "3/4"]);
    expect(hitsOf(r.document, "kick").map((h) => h.at)).toEqual(["0"]);
    expect(r.report.substituted).toEqual([
      { note: 35, label: "Acoustic Bass Drum (35)", piece: "kick", count: 1 },
      { note: 40, label: "Electric Snare (40)", piece: "snare", count: 2 },
    ]);
  });

  it("unknown percussion keys are listed with counts and places, not silently dropped", () => {
    const r = importMidi(file({ drums: [{ midi: 36, beat: 0 }, { midi: 75, beat: 1 }, { midi: 75, beat: 5 }, { midi: 90, beat: 2 }] }));
    expect(r.report.unknownPercussion.map((u) => ({ note: u.note, name: u.name, count: u.count, bars: u.where.map((w) => w.bar), mappedTo: u.mappedTo }))).toEqual([
      { note: 75, name: "Claves", count: 2, bars: [1, 2], mappedTo: null },
      { note: 90, name: null, count: 1, bars: [1], mappedTo: null },
    ]);
    expect(r.report.warnings.join(" ")).toMatch(/Claves \(75\) has no piece in the kit/);
    expect(r.document.kit.lanes.map((l) => l.piece)).toEqual(["kick"]);
  });

  it("an unknown key the caller maps to a piece is written as that piece", () => {
    const r = importMidi(file({ drums: [{ midi: 75, beat: 1 }, { midi: 75, beat: 3 }] }), { percussionMap: { 75: "cowbell" } });
    expect(hitsOf(r.document, "cowbell").map((h) => h.at)).toEqual(["1/4", "3/4"]);
    expect(r.report.unknownPercussion[0]!.mappedTo).toBe("cowbell");
  });

  it("a softer stroke just before a stroke of the same drum is read as a flam", () => {
    const ppqBeat = 1 / 480;
    const r = importMidi(file({ bpm: 100, drums: [{ midi: 38, beat: 1 - 12 * ppqBeat, velocity: 40 }, { midi: 38, beat: 1, velocity: 100 }] })); // 15 ms early at 100 bpm
    expect(hitsOf(r.document, "snare")).toEqual([{ at: "1/4", dynamic: "normal", articulation: "flam" }]);
    expect(r.report.flams).toBe(1);
  });

  it("keys: other channels keep their pitches, velocities and lengths", () => {
    const r = importMidi(file({ keys: [{ midi: 60, beat: 0, len: 2, velocity: 70 }, { midi: 64, beat: 0, len: 2, velocity: 71 }, { midi: 43, beat: 2, len: 1.5 }] }));
    expect(r.document.keys.notes).toEqual([
      { at: "0", duration: "1/2", pitch: 60, velocity: 70 },
      { at: "0", duration: "1/2", pitch: 64, velocity: 71 },
      { at: "1/2", duration: "3/8", pitch: 43, velocity: 90 },
    ]);
    expect(r.document.kit.lanes).toEqual([]);
  });
});

describe("quantising", () => {
  it("notes off the grid are moved to the nearest step, and the report says by how much", () => {
    // 120 bpm: a quarter is 500 ms, one tick (480 per quarter) 1.04 ms. Snare 24 ticks late, kick 12 early.
    const r = importMidi(file({ bpm: 120, drums: [{ midi: 38, beat: 1 + 24 / 480 }, { midi: 36, beat: 2 - 12 / 480 }, { midi: 42, beat: 0 }] }), { grid: "1/16" });
    expect(hitsOf(r.document, "snare").map((h) => h.at)).toEqual(["1/4"]);
    expect(hitsOf(r.document, "kick").map((h) => h.at)).toEqual(["1/2"]);
    expect(r.report.moved.count).toBe(2);
    expect(r.report.moved.maxMs).toBe(25); // 24 ticks × 500/480 ms
    expect(r.report.moved.meanMs).toBe(18.8); // (25 + 12.5) / 2
    expect(r.report.moves.map((m) => [m.piece, m.shiftMs, m.to])).toEqual([
      ["snare", -25, "1/4"],
      ["kick", 12.5, "1/2"],
    ]);
    expect(r.report.notes).toEqual({ total: 3, kit: 3, keys: 0, written: 3 });
  });

  it("a coarser grid moves more: eighths pull a sixteenth onto a neighbouring eighth", () => {
    const r = importMidi(file({ drums: [{ midi: 36, beat: 0.25 }, { midi: 36, beat: 1 }] }), { grid: "1/8", triplets: false });
    expect(r.document.grid.step).toBe("1/8");
    expect(hitsOf(r.document, "kick").map((h) => h.at)).toEqual(["1/8", "1/4"]); // 1/16 is halfway: rounds up
  });

  it("triplet detection: a beat of triplet eighths is written in triplets, the straight beats stay straight", () => {
    const drums = [0, 1 / 3, 2 / 3].map((b) => ({ midi: 42, beat: b })).concat([1, 1.5, 2, 2.25, 2.5, 2.75].map((b) => ({ midi: 42, beat: b })));
    const r = importMidi(file({ drums }), { grid: "1/16" });
    expect(r.report.tripletBeats).toEqual([{ bar: 1, beat: 1 }]);
    expect(hitsOf(r.document, "hihat-closed").map((h) => h.at)).toEqual(["0", "1/12", "1/6", "1/4", "3/8", "1/2", "9/16", "5/8", "11/16"]);
    expect(r.document.grid.step).toBe("1/48"); // sixteenths and triplet eighths together
    expect(r.report.moved.count).toBe(0); // the triplets were already in place
  });

  it("without triplet detection, the same triplets are forced onto sixteenths and reported as moved", () => {
    const drums = [0, 1 / 3, 2 / 3].map((b) => ({ midi: 42, beat: b }));
    const r = importMidi(file({ drums }), { grid: "1/16", triplets: false });
    expect(hitsOf(r.document, "hihat-closed").map((h) => h.at)).toEqual(["0", "1/16", "3/16"]);
    expect(r.report.moved.count).toBe(2);
    expect(r.report.tripletBeats).toEqual([]);
  });

  it("all-triplet material gets the triplet grid itself", () => {
    const drums = [0, 1, 2, 3, 4, 5].map((i) => ({ midi: 51, beat: i / 3 }));
    expect(importMidi(file({ drums }), { grid: "1/8" }).document.grid.step).toBe("1/12");
  });

  it("two strokes landing on one grid point are merged (the louder kept) and counted", () => {
    const r = importMidi(file({ drums: [{ midi: 38, beat: 1 - 0.02, velocity: 127 }, { midi: 38, beat: 1 + 0.02, velocity: 110 }] }), { grid: "1/8" });
    expect(hitsOf(r.document, "snare")).toEqual([{ at: "1/4", dynamic: "accent" }]);
    expect(r.report.merged).toBe(1);
  });

  it("markers become sections at the nearest bar line", () => {
    const drums = [0, 4, 8, 12].map((b) => ({ midi: 36, beat: b }));
    const r = importMidi(file({ drums, markers: [["Verse", 0], ["Chorus", 8.02]] }));
    expect(r.document.sections).toEqual([
      { name: "Verse", startBar: 0, bars: 2, repeats: 1 },
      { name: "Chorus", startBar: 2, bars: 2, repeats: 1 },
    ]);
  });
});

describe("round trips", () => {
  it("a demo groove's MIDI imports back to a groove that sounds the same (compareGrooves)", () => {
    for (const g of DEMO_GROOVES) {
      const doc = assertGroove(g.document);
      const back = importMidi(exportMidi(doc, { title: g.title }), { grid: doc.grid.step as ImportGrid }).document;
      expect(compareGrooves(doc, back).verdict, g.title).toBe("identical");
    }
  });

  const gridOf = (step: string): ImportGrid => ((IMPORT_GRIDS as readonly string[]).includes(step) ? (step as ImportGrid) : "1/16");

  const sounding = (doc: GrooveDocument) => doc.keys.notes.length > 0 || doc.kit.lanes.some((l) => l.hits.length > 0);

  fcTest.prop([grooveArb().filter(sounding)], { numRuns: 120 })("import → export → import is stable (any groove, swing and flams included)", (doc) => {
    const options: MidiImportOptions = { grid: gridOf(doc.grid.step) };
    const first = importMidi(exportMidi(doc), options).document;
    expect(assertGroove(first), "an import is a valid, normalised groove").toEqual(first);
    const second = importMidi(exportMidi(first), options).document;
    expect(second).toEqual(first);
  });

  // Without overlapping notes of one pitch: MIDI pairs note-offs with note-ons by key, so those cannot come back apart.
  fcTest.prop([grooveArb({ swing: false, sections: false, overlaps: false }).filter(sounding)], { numRuns: 80 })("a straight groove on its own grid imports to one that sounds the same", (doc) => {
    const back = importMidi(exportMidi(doc), { grid: gridOf(doc.grid.step), triplets: false }).document;
    const verdict = compareGrooves(doc, back);
    // A file cannot say that a note was tied over the loop's seam, that a flam had no room before the start, or that
    // a stroke was choked or marked open (General MIDI has no such messages for a percussion key).
    const exotic =
      doc.keys.notes.some((n) => n.tiedFromEnd) ||
      doc.kit.lanes.some((l) => l.hits.some((h) => h.articulation === "choke" || h.articulation === "open" || (h.articulation === "flam" && h.at === "0")));
    if (!exotic) expect(verdict.verdict, JSON.stringify(verdict).slice(0, 400)).toBe("identical");
  });
});

describe("every import is a valid groove document, in the core's normal form", () => {
  fcTest.prop([fc.array(fc.record({ kit: fc.boolean(), midi: fc.integer({ min: 0, max: 127 }), tick: fc.integer({ min: 0, max: 40_000 }), len: fc.integer({ min: 1, max: 3000 }), velocity: fc.integer({ min: 1, max: 127 }) }), { minLength: 1, maxLength: 60 }), fc.constantFrom(...IMPORT_GRIDS), fc.boolean(), fc.constantFrom<[number, number]>([4, 4], [3, 4], [6, 8], [7, 8], [5, 4], [2, 2], [12, 8], [3, 8])], { numRuns: 150 })(
    "random notes, any grid and meter",
    (notes, grid, triplets, meter) => {
      const midi = new Midi();
      midi.header.timeSignatures = [{ ticks: 0, timeSignature: meter }];
      midi.header.tempos = [{ ticks: 0, bpm: 97 }];
      midi.header.update();
      const drums = midi.addTrack();
      drums.channel = 9;
      const keys = midi.addTrack();
      for (const n of notes) (n.kit ? drums : keys).addNote({ midi: n.midi, ticks: n.tick, durationTicks: n.len, velocity: n.velocity / 127 });
      let r;
      try {
        r = importMidi(midi.toArray(), { grid, triplets, percussionMap: { 75: "clap" } });
      } catch (e) {
        expect((e as MidiImportError).code).toBe("no_notes"); // only unknown percussion keys, left out
        return;
      }
      expect(assertGroove(r.document)).toEqual(r.document);
    },
  );
});

describe("bad files are refused with a clear message", () => {
  it("not a MIDI file", () => {
    const e = refusal(() => importMidi(new TextEncoder().encode("<html>not a song</html>")));
    expect(e.code).toBe("not_midi");
    expect(e.message).toMatch(/not a MIDI file/);
    expect(refusal(() => importMidi(new Uint8Array(0))).message).toMatch(/empty/);
  });

  it("truncated: inside the header, inside a track, a track missing", () => {
    const good = file({ drums: [{ midi: 36, beat: 0 }, { midi: 38, beat: 1 }] });
    expect(refusal(() => importMidi(good.subarray(0, 10))).code).toBe("truncated");
    const cut = refusal(() => importMidi(good.subarray(0, good.length - 5)));
    expect(cut.code).toBe("truncated");
    expect(cut.message).toMatch(/truncated: track 2 should be \d+ bytes long/);
    const end = [0x00, 0xff, 0x2f, 0x00];
    const missing = refusal(() => importMidi(buildSmf(1, 480, [end], 2)));
    expect(missing.code).toBe("truncated");
    expect(missing.message).toMatch(/declares 2 tracks but holds 1/);
  });

  it("a file with 0 tracks", () => {
    const e = refusal(() => importMidi(buildSmf(1, 480, [])));
    expect(e.code).toBe("no_tracks");
    expect(e.message).toMatch(/0 tracks/);
  });

  it("a file of 20 MB or more is refused before it is read", () => {
    const big = new Uint8Array(MIDI_MAX_BYTES);
    big.set(file({ drums: [{ midi: 36, beat: 0 }] }));
    const e = refusal(() => importMidi(big));
    expect(e.code).toBe("too_large");
    expect(e.message).toBe("The file is 20.0 MB; MIDI files must be smaller than 20 MB.");
  });

  it("absurd tempo: FF 51 with 1 µs per quarter note (60,000,000 bpm), or 0", () => {
    const track = (us: number) => [0x00, 0xff, 0x51, 0x03, (us >> 16) & 255, (us >> 8) & 255, us & 255, 0x00, 0x99, 36, 90, ...vlq(120), 0x89, 36, 0, 0x00, 0xff, 0x2f, 0x00];
    const e = refusal(() => importMidi(buildSmf(0, 480, [track(1)])));
    expect(e.code).toBe("absurd_tempo");
    expect(e.message).toMatch(/tempo is 60,000,000 bpm/);
    expect(e.message).toMatch(/must be 10–1000 bpm/);
    expect(refusal(() => importMidi(buildSmf(0, 480, [track(0)]))).code).toBe("absurd_tempo");
    // A tempo given by the caller replaces the absurd one.
    expect(importMidi(buildSmf(0, 480, [track(1)]), { bpm: 90 }).document.tempo.bpm).toBe("90");
  });

  it("damaged track data, SMPTE time, format 2 and a file without notes", () => {
    expect(refusal(() => importMidi(buildSmf(1, 480, [[0x00, 0x45, 0x10]]))).code).toBe("corrupt"); // data byte without status
    expect(refusal(() => importMidi(buildSmf(1, 0xe728, [[0x00, 0xff, 0x2f, 0x00]]))).message).toMatch(/SMPTE/);
    expect(refusal(() => importMidi(buildSmf(2, 480, [[0x00, 0xff, 0x2f, 0x00]]))).message).toMatch(/format 2/);
    expect(refusal(() => importMidi(buildSmf(1, 480, [[0x00, 0xff, 0x2f, 0x00]]))).code).toBe("no_notes");
  });
});

describe("the file check reads variable-length quantities as SMF 1.0's examples give them", () => {
  // SMF 1.0, "variable-length quantities": 0x7F → 7F; 0x80 → 81 00; 0x2000 → C0 00; 0x3FFF → FF 7F;
  // 0x4000 → 81 80 00; 0x1FFFFF → FF FF 7F; 0x200000 → 81 80 80 00; 0x0FFFFFFF → FF FF FF 7F.
  const examples: [number, number[]][] = [
    [0x7f, [0x7f]],
    [0x80, [0x81, 0x00]],
    [0x2000, [0xc0, 0x00]],
    [0x3fff, [0xff, 0x7f]],
    [0x4000, [0x81, 0x80, 0x00]],
    [0x1fffff, [0xff, 0xff, 0x7f]],
    [0x200000, [0x81, 0x80, 0x80, 0x00]],
    [0x0fffffff, [0xff, 0xff, 0xff, 0x7f]],
  ];
  it.each(examples)("%i", (value, bytes) => {
    expect(vlq(value)).toEqual(bytes);
    expect(inspectSmf(buildSmf(1, 480, [[...bytes, 0xff, 0x2f, 0x00]])).lengthTicks).toBe(value);
  });
});
