// POST /api/import/midi?grid=&triplets=&bpm=&meter=&map=&name=   body: the .mid file's bytes
//   (content-type audio/midi, audio/x-midi, audio/mid or application/octet-stream; smaller than 20 MB).
//   → 200 { document, title, missing, source, report }: a preview of the groove the file becomes, with the report
//   of what was quantised, what was left out and what is missing (tempo, meter); nothing is saved. Signed-in only.
//   grid: 1/4 1/8 1/16 1/32 1/12 1/24 (default 1/16); triplets: 1/0 (default 1); bpm: 10–1000; meter: "6/8";
//   map: percussion keys the kit has no piece for, "75:cowbell,80:none"; name: the file's name (for the title).
//   Refusals: 413 too_large; 400 not_midi, truncated, corrupt; 422 no_tracks, no_notes, absurd_tempo, unsupported,
//   too_long, too_many_notes; 415 for other content types. Error shape: { error: { code, message } }.
import type { APIRoute } from "astro";
import { z } from "zod";
import { IMPORT_GRIDS, MIDI_MAX_BYTES, MidiImportError, importMidi } from "../../../lib/exchange/midi-import";
import { KIT_PIECE_IDS, type KitPieceId } from "../../../lib/rhythm/kit";
import { error, json } from "../../../lib/server/http";
import { parseQuery, requireUser, route } from "../../../lib/server/route";

const MEDIA_TYPES = ["audio/midi", "audio/x-midi", "audio/mid", "application/x-midi", "application/octet-stream"];

const Query = z.object({
  grid: z.enum(IMPORT_GRIDS, { message: `grid is one of ${IMPORT_GRIDS.join(", ")}` }).default("1/16"),
  triplets: z.enum(["0", "1", "false", "true"]).default("1"),
  bpm: z.coerce.number().min(10, "bpm is 10–1000").max(1000, "bpm is 10–1000").optional(),
  meter: z
    .string()
    .regex(/^\d{1,2}\/(1|2|4|8|16|32)$/, "meter is like 4/4 or 6/8")
    .optional(),
  map: z
    .string()
    .regex(/^(\d{1,3}:[a-z-]+)(,\d{1,3}:[a-z-]+)*$/, "map is like 75:cowbell,80:none")
    .refine((s) => s.split(",").every((p) => { const [n, piece] = p.split(":"); return Number(n) <= 127 && (piece === "none" || (KIT_PIECE_IDS as readonly string[]).includes(piece!)); }), `map pairs a key 0–127 with a kit piece (${KIT_PIECE_IDS.join(", ")}) or none`)
    .optional(),
  name: z.string().max(255).optional(),
});

const STATUS: Record<MidiImportError["code"], number> = {
  too_large: 413,
  not_midi: 400,
  truncated: 400,
  corrupt: 400,
  no_tracks: 422,
  no_notes: 422,
  absurd_tempo: 422,
  unsupported: 422,
  too_long: 422,
  too_many_notes: 422,
};

const tooLarge = (size?: number) =>
  error(413, "too_large", size ? `The file is ${(size / 1024 / 1024).toFixed(1)} MB; MIDI files must be smaller than 20 MB.` : "MIDI files must be smaller than 20 MB.");

/** The body's bytes, counted as they arrive (content-length can be absent or wrong); null when over the limit. */
async function readBody(request: Request): Promise<Uint8Array | null> {
  if (!request.body) return new Uint8Array(0);
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size >= MIDI_MAX_BYTES) {
      await reader.cancel().catch(() => {});
      return null;
    }
    chunks.push(value);
  }
  const bytes = new Uint8Array(size);
  let p = 0;
  for (const c of chunks) {
    bytes.set(c, p);
    p += c.byteLength;
  }
  return bytes;
}

export const POST = route(async (ctx) => {
  requireUser(ctx);
  const q = parseQuery(ctx.url, Query);
  const type = (ctx.request.headers.get("content-type") ?? "").split(";")[0]!.trim().toLowerCase();
  if (type && !MEDIA_TYPES.includes(type)) {
    return error(415, "unsupported_media_type", "Send the .mid file's bytes as the request body (content-type: audio/midi).");
  }
  const declared = Number(ctx.request.headers.get("content-length"));
  if (Number.isFinite(declared) && declared >= MIDI_MAX_BYTES) return tooLarge(declared);
  const bytes = await readBody(ctx.request);
  if (!bytes) return tooLarge();
  if (bytes.length === 0) return error(400, "not_midi", "The upload is empty: choose a .mid file.");

  const percussionMap: Record<number, KitPieceId | null> = {};
  for (const pair of q.map?.split(",") ?? []) {
    const [n, piece] = pair.split(":");
    percussionMap[Number(n)] = piece === "none" ? null : (piece as KitPieceId);
  }
  const meter = q.meter ? { beatsPerBar: Number(q.meter.split("/")[0]), beatUnit: Number(q.meter.split("/")[1]) } : undefined;
  try {
    const result = importMidi(bytes, { grid: q.grid, triplets: q.triplets === "1" || q.triplets === "true", bpm: q.bpm, meter, percussionMap });
    const fromName = q.name?.replace(/\.(mid|midi|smf|kar)$/i, "").trim().slice(0, 120) || null;
    return json({ ...result, title: result.title ?? fromName });
  } catch (e) {
    if (e instanceof MidiImportError) return error(STATUS[e.code], e.code, e.message);
    throw e;
  }
}) satisfies APIRoute;
