/**
 * A structural check of a Standard MIDI File before it is parsed, so that damaged or foreign files are refused
 * with a message that says what is wrong (the parser itself reads past a truncated end without complaint).
 *
 * Structure per the Standard MIDI File 1.0 specification (International MIDI Association): a header chunk
 * "MThd" of length ≥ 6 (format, number of tracks, division), then chunks of 4-byte type and 32-bit big-endian
 * length; track chunks "MTrk" hold events, each a variable-length delta time followed by a MIDI channel
 * message (running status allowed), a system exclusive message (F0/F7 + length) or a meta event (FF type
 * length data). Chunks of other types are skipped, as the specification asks.
 */

/** Why a file was refused; `code` goes into the API's error shape. */
export type MidiFileProblem = "not_midi" | "truncated" | "corrupt" | "no_tracks" | "unsupported" | "too_large" | "absurd_tempo" | "no_notes" | "too_long" | "too_many_notes";

export class MidiImportError extends Error {
  constructor(
    readonly code: MidiFileProblem,
    message: string,
  ) {
    super(message);
    this.name = "MidiImportError";
  }
}

export interface SmfSummary {
  format: 0 | 1 | 2;
  /** Track chunks declared in the header (and present). */
  tracks: number;
  /** Ticks per quarter note. */
  ppq: number;
  /** Note-on events with a velocity above 0, in all tracks. */
  noteOns: number;
  /** Every FF 51 value (microseconds per quarter note), in file order. */
  tempos: number[];
  /** Length of the longest track in ticks. */
  lengthTicks: number;
}

const CHANNEL_DATA_BYTES = [2, 2, 2, 2, 1, 1, 2]; // 8x note off … Ex pitch bend

/**
 * Checks the whole file's structure; throws a MidiImportError naming the problem.
 * @example inspectSmf(bytes).tracks // 2
 */
export function inspectSmf(bytes: Uint8Array): SmfSummary {
  if (bytes.length === 0) throw new MidiImportError("not_midi", "The file is empty.");
  const id = (p: number) => String.fromCharCode(bytes[p]!, bytes[p + 1]!, bytes[p + 2]!, bytes[p + 3]!);
  const u32 = (p: number) => ((bytes[p]! << 24) | (bytes[p + 1]! << 16) | (bytes[p + 2]! << 8) | bytes[p + 3]!) >>> 0;
  const u16 = (p: number) => (bytes[p]! << 8) | bytes[p + 1]!;
  if (bytes.length < 4 || id(0) !== "MThd") {
    throw new MidiImportError("not_midi", "This is not a MIDI file: a Standard MIDI File starts with the header \"MThd\" (files ending in .mid or .midi).");
  }
  if (bytes.length < 14) throw new MidiImportError("truncated", "The MIDI file is truncated: it ends inside its header.");
  const headerLength = u32(4);
  if (headerLength < 6) throw new MidiImportError("corrupt", `The MIDI header is damaged: its length is ${headerLength} bytes, at least 6 are needed.`);
  if (8 + headerLength > bytes.length) throw new MidiImportError("truncated", "The MIDI file is truncated: it ends inside its header.");
  const format = u16(8);
  const declared = u16(10);
  const division = u16(12);
  if (format > 2) throw new MidiImportError("unsupported", `The MIDI file has format ${format}; Standard MIDI Files have format 0, 1 or 2.`);
  if (format === 2) throw new MidiImportError("unsupported", "The MIDI file has format 2 (independent patterns), which Tactus cannot import: save it as format 0 or 1.");
  if (division & 0x8000) throw new MidiImportError("unsupported", "The MIDI file counts time in SMPTE frames; Tactus imports files that count ticks per quarter note.");
  if (division === 0) throw new MidiImportError("corrupt", "The MIDI header is damaged: it gives 0 ticks per quarter note.");
  if (declared === 0) throw new MidiImportError("no_tracks", "The MIDI file has 0 tracks: there is nothing to import.");

  const summary: SmfSummary = { format: format as 0 | 1, tracks: 0, ppq: division, noteOns: 0, tempos: [], lengthTicks: 0 };
  let p = 8 + headerLength;
  while (summary.tracks < declared) {
    if (p + 8 > bytes.length) {
      throw new MidiImportError("truncated", `The MIDI file is truncated: it declares ${declared} track${declared === 1 ? "" : "s"} but holds ${summary.tracks}.`);
    }
    const type = id(p);
    const length = u32(p + 4);
    const start = p + 8;
    const end = start + length;
    if (end > bytes.length) {
      throw new MidiImportError("truncated", `The MIDI file is truncated: track ${summary.tracks + 1} should be ${length} bytes long but the file ends after ${bytes.length - start}.`);
    }
    if (type === "MTrk") {
      summary.tracks++;
      walkTrack(bytes, start, end, summary.tracks, summary);
    } else if (!/^[\x20-\x7e]{4}$/.test(type)) {
      throw new MidiImportError("corrupt", `The MIDI file is damaged: a chunk ${p} bytes in has no readable type.`);
    }
    p = end;
  }
  return summary;
}

function walkTrack(bytes: Uint8Array, start: number, end: number, number: number, summary: SmfSummary): void {
  let p = start;
  let running = 0;
  let tick = 0;
  const damaged = (what: string) => new MidiImportError("corrupt", `Track ${number} of the MIDI file is damaged: ${what} (${p - start} bytes into the track).`);
  const vlq = (): number => {
    let v = 0;
    for (let i = 0; i < 4; i++) {
      if (p >= end) throw damaged("an event runs past the end of the track");
      const b = bytes[p++]!;
      v = v * 128 + (b & 0x7f);
      if ((b & 0x80) === 0) return v;
    }
    throw damaged("a variable-length number is longer than 4 bytes");
  };
  while (p < end) {
    tick += vlq();
    if (p >= end) throw damaged("a delta time is not followed by an event");
    let status = bytes[p]!;
    if (status & 0x80) p++;
    else if (running) status = running;
    else throw damaged("a data byte comes before any status byte");
    if (status === 0xff) {
      if (p >= end) throw damaged("a meta event has no type");
      const type = bytes[p++]!;
      const len = vlq();
      if (p + len > end) throw damaged("a meta event runs past the end of the track");
      if (type === 0x51) {
        if (len !== 3) throw damaged(`a tempo event has ${len} data bytes instead of 3`);
        summary.tempos.push((bytes[p]! << 16) | (bytes[p + 1]! << 8) | bytes[p + 2]!);
      } else if (type === 0x58 && len !== 4 && len !== 2) throw damaged(`a time signature has ${len} data bytes instead of 4`);
      p += len;
      running = 0;
      if (type === 0x2f) break; // end of track: anything after it is ignored
    } else if (status === 0xf0 || status === 0xf7) {
      const len = vlq();
      if (p + len > end) throw damaged("a system exclusive message runs past the end of the track");
      p += len;
      running = 0;
    } else if (status >= 0x80 && status < 0xf0) {
      const n = CHANNEL_DATA_BYTES[(status >> 4) - 8]!;
      if (p + n > end) throw damaged("a channel message runs past the end of the track");
      for (let i = 0; i < n; i++) if (bytes[p + i]! & 0x80) throw damaged("a channel message has a data byte above 127");
      if ((status & 0xf0) === 0x90 && bytes[p + 1]! > 0) summary.noteOns++;
      p += n;
      running = status;
    } else {
      throw damaged(`the status byte 0x${status.toString(16).toUpperCase()} is not allowed in a file`);
    }
  }
  if (tick > summary.lengthTicks) summary.lengthTicks = tick;
}
