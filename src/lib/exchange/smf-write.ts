/**
 * A Standard MIDI File writer (Standard MIDI File 1.0, International MIDI Association): header chunk "MThd"
 * (length 6, format, number of tracks, division), track chunks "MTrk" of delta-timed events, each track ended
 * by FF 2F 00. No running status (every event carries its status byte), which every reader accepts.
 *
 * Written here rather than through @tonejs/midi, whose writer (midi-file 1.2.4) copies its whole output buffer
 * for every event it adds (`Array.prototype.concat` in `Writer.writeBytes`): a 1,000-bar song took about 30 s.
 * Tests read these files back with @tonejs/midi and check the bytes against the specification's examples.
 */

/** One event on a track, at an absolute tick. */
export interface SmfEvent {
  tick: number;
  /** Order among events on the same tick (lower first): meta, then note-offs, then the rest, then note-ons. */
  rank: number;
  bytes: readonly number[];
}

/** Event ranks on one tick: a key released and struck again on the same tick must be released first. */
export const RANK = { meta: 0, noteOff: 1, control: 2, noteOn: 3 } as const;

/**
 * A variable-length quantity: 7 bits per byte, most significant first, bit 7 set on all but the last byte.
 * @example vlq(0x80) // [0x81, 0x00]
 */
export function vlq(n: number): number[] {
  if (!Number.isInteger(n) || n < 0 || n > 0x0fffffff) throw new RangeError(`not a variable-length quantity: ${n}`);
  const out = [n & 0x7f];
  for (n = Math.floor(n / 128); n > 0; n = Math.floor(n / 128)) out.unshift((n & 0x7f) | 0x80);
  return out;
}

function pushVlq(out: number[], n: number): void {
  if (n < 0x80) out.push(n);
  else for (const b of vlq(n)) out.push(b);
}

/** A meta event: FF type length data. */
export function meta(tick: number, type: number, data: readonly number[]): SmfEvent {
  return { tick, rank: RANK.meta, bytes: [0xff, type, ...vlq(data.length), ...data] };
}

/** A text-like meta event (track name FF 03, marker FF 06, …) in UTF-8. */
export function metaText(tick: number, type: number, text: string): SmfEvent {
  return meta(tick, type, [...new TextEncoder().encode(text)]);
}

/** Note on (9n kk vv) and note off (8n kk 00) for one note on a 0-based channel. */
export function noteEvents(channel: number, key: number, velocity: number, on: number, off: number): [SmfEvent, SmfEvent] {
  return [
    { tick: on, rank: RANK.noteOn, bytes: [0x90 | channel, key, velocity] },
    { tick: off, rank: RANK.noteOff, bytes: [0x80 | channel, key, 0] },
  ];
}

/**
 * The file's bytes: format 1 (or 0 with one track), `ppq` ticks per quarter note.
 * @example writeSmf(480, [[meta(0, 0x51, [0x07, 0xa1, 0x20])]]).subarray(0, 4) // "MThd"
 */
export function writeSmf(ppq: number, tracks: SmfEvent[][], format: 0 | 1 = 1): Uint8Array {
  if (format === 0 && tracks.length !== 1) throw new RangeError("a format 0 file has exactly one track");
  const bodies = tracks.map((events) => {
    const order = Array.from(events.keys()).sort((a, b) => events[a]!.tick - events[b]!.tick || events[a]!.rank - events[b]!.rank || a - b);
    const out: number[] = [];
    let last = 0;
    for (const i of order) {
      const e = events[i]!;
      pushVlq(out, e.tick - last);
      for (const b of e.bytes) out.push(b);
      last = e.tick;
    }
    out.push(0x00, 0xff, 0x2f, 0x00); // end of track
    return out;
  });
  const size = 14 + bodies.reduce((n, b) => n + 8 + b.length, 0);
  const bytes = new Uint8Array(size);
  const view = new DataView(bytes.buffer);
  bytes.set([0x4d, 0x54, 0x68, 0x64], 0); // "MThd"
  view.setUint32(4, 6);
  view.setUint16(8, format);
  view.setUint16(10, tracks.length);
  view.setUint16(12, ppq);
  let p = 14;
  for (const body of bodies) {
    bytes.set([0x4d, 0x54, 0x72, 0x6b], p); // "MTrk"
    view.setUint32(p + 4, body.length);
    bytes.set(body, p + 8);
    p += 8 + body.length;
  }
  return bytes;
}
