/**
 * A small Standard MIDI File reader for the tests, written from the Standard MIDI File 1.0 specification
 * (International MIDI Association) and kept apart from the product's code: chunks, variable-length delta
 * times, running status, meta and system exclusive events. Every event keeps its raw bytes, so tests can
 * compare bytes with the specification's own examples.
 */
export interface SmfEvent {
  tick: number;
  /** Status byte (0xFF for meta events). */
  status: number;
  /** Meta type for meta events. */
  meta?: number;
  /** Data bytes (for meta events: after the length). */
  data: number[];
  /** The event as written, status byte (even when running) to the end. */
  raw: number[];
}

export interface Smf {
  header: { length: number; format: number; tracks: number; division: number; raw: number[] };
  tracks: { raw: number[]; events: SmfEvent[] }[];
}

export function readSmf(bytes: Uint8Array): Smf {
  const u32 = (p: number) => ((bytes[p]! << 24) | (bytes[p + 1]! << 16) | (bytes[p + 2]! << 8) | bytes[p + 3]!) >>> 0;
  const u16 = (p: number) => (bytes[p]! << 8) | bytes[p + 1]!;
  const id = (p: number) => String.fromCharCode(...bytes.subarray(p, p + 4));
  if (id(0) !== "MThd") throw new Error("no MThd");
  const hl = u32(4);
  const smf: Smf = { header: { length: hl, format: u16(8), tracks: u16(10), division: u16(12), raw: [...bytes.subarray(0, 8 + hl)] }, tracks: [] };
  let p = 8 + hl;
  while (p < bytes.length) {
    const type = id(p);
    const len = u32(p + 4);
    const body = bytes.subarray(p + 8, p + 8 + len);
    if (type === "MTrk") smf.tracks.push({ raw: [...bytes.subarray(p, p + 8 + len)], events: readEvents(body) });
    p += 8 + len;
  }
  return smf;
}

function readEvents(b: Uint8Array): SmfEvent[] {
  const events: SmfEvent[] = [];
  let p = 0;
  let tick = 0;
  let running = 0;
  const vlq = () => {
    let v = 0;
    for (;;) {
      const x = b[p++]!;
      v = v * 128 + (x & 0x7f);
      if (!(x & 0x80)) return v;
    }
  };
  while (p < b.length) {
    tick += vlq();
    let status = b[p]!;
    if (status & 0x80) p++;
    else status = running;
    if (status === 0xff) {
      const meta = b[p++]!;
      const start = p;
      const len = vlq();
      const data = [...b.subarray(p, p + len)];
      events.push({ tick, status, meta, data, raw: [0xff, meta, ...b.subarray(start, p + len)] });
      p += len;
    } else if (status === 0xf0 || status === 0xf7) {
      const len = vlq();
      events.push({ tick, status, data: [...b.subarray(p, p + len)], raw: [status, ...b.subarray(p, p + len)] });
      p += len;
    } else {
      const n = (status & 0xf0) === 0xc0 || (status & 0xf0) === 0xd0 ? 1 : 2;
      const data = [...b.subarray(p, p + n)];
      events.push({ tick, status, data, raw: [status, ...data] });
      p += n;
      running = status;
    }
  }
  return events;
}

/** Hex of bytes, "FF 51 03 07 A1 20". */
export const hex = (bytes: Iterable<number>) => [...bytes].map((x) => x.toString(16).toUpperCase().padStart(2, "0")).join(" ");

/** Encodes a variable-length quantity (for building test files by hand). */
export function vlq(n: number): number[] {
  const out = [n & 0x7f];
  while ((n = Math.floor(n / 128)) > 0) out.unshift((n & 0x7f) | 0x80);
  return out;
}

/** A file built by hand: header fields and track bodies (event bytes without the chunk header). */
export function buildSmf(format: number, division: number, tracks: number[][], declaredTracks = tracks.length): Uint8Array {
  const be32 = (n: number) => [(n >>> 24) & 255, (n >>> 16) & 255, (n >>> 8) & 255, n & 255];
  const out = [0x4d, 0x54, 0x68, 0x64, 0, 0, 0, 6, 0, format, declaredTracks >> 8, declaredTracks & 255, division >> 8, division & 255];
  for (const t of tracks) out.push(0x4d, 0x54, 0x72, 0x6b, ...be32(t.length), ...t);
  return Uint8Array.from(out);
}
