// Exchange over HTTP, against the built server: downloads of a version in every format (MIDI, MusicXML, SVG, PNG)
// with names from the title, who may download (the same rule as reading the version), and MIDI import with its
// refusals, each in the one error shape { error: { code, message } }.
// Sources: Standard MIDI File 1.0 (header "MThd", FF 51, FF 58); PNG (ISO/IEC 15948, W3C PNG specification: the
// 8-byte signature 89 50 4E 47 0D 0A 1A 0A, then IHDR with width and height); MusicXML 4.0 XSD (validated offline).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { exportMidi } from "../../src/lib/exchange/midi-export";
import { Midi } from "../../src/lib/exchange/tonejs-midi";
import { assertGroove, compareGrooves, emptyGroove } from "../../src/lib/rhythm";
import { validateMusicXml } from "../unit/exchange/musicxml-schema";
import { buildSmf } from "../unit/exchange/smf-reader";
import { BASE, api, closeDb, createGroove, createUser, db, errorOf, sampleDocument, sessionFor, type GrooveFixture, type Reply, type TestUser } from "./helpers";

let owner: TestUser;
let viewer: TestUser;
let member: TestUser;
let ownerCookie: string;
let groove: GrooveFixture;
const TITLE = "Ferry Lights — verse";

/** GET that keeps the body as bytes. */
async function download(path: string, cookie: string | null) {
  const res = await fetch(new URL(path, BASE()), { headers: cookie ? { cookie: `tactus_session=${cookie}` } : {} });
  return { status: res.status, headers: res.headers, bytes: new Uint8Array(await res.arrayBuffer()) };
}

const text = (b: Uint8Array) => new TextDecoder().decode(b);

beforeAll(async () => {
  owner = await createUser({ label: "owner" });
  viewer = await createUser({ label: "viewer" });
  member = await createUser({ label: "member" });
  ownerCookie = await sessionFor(owner.id);
  groove = await createGroove(owner.id, { title: TITLE, viewers: [viewer.id] });
});
afterAll(closeDb);

describe("downloads of a version", () => {
  it("MIDI: a Standard MIDI File named after the title and version, from the latest version by default", async () => {
    const r = await download(`/api/grooves/${groove.grooveId}/export/mid`, ownerCookie);
    expect(r.status).toBe(200);
    expect(r.headers.get("content-type")).toBe("audio/midi");
    expect(r.headers.get("content-disposition")).toBe(`attachment; filename="ferry-lights-verse-v2.mid"; filename*=UTF-8''Ferry%20Lights%20%E2%80%94%20verse%20v2.mid`);
    expect(r.headers.get("cache-control")).toBe("private, no-cache");
    expect(text(r.bytes.subarray(0, 4))).toBe("MThd"); // SMF 1.0 header chunk
    const midi = new Midi(r.bytes);
    expect(midi.header.name).toBe(new TextDecoder("latin1").decode(new TextEncoder().encode(TITLE))); // UTF-8 bytes, read one by one
    const kicks = midi.tracks.find((t) => t.channel === 9)!.notes.filter((n) => n.midi === 36);
    expect(kicks.map((n) => n.ticks)).toEqual([0, 3 * 120]); // sampleDocument(3): kick on 1 and on the fourth sixteenth
  });

  it("a named version: its own document, cached as immutable", async () => {
    const r = await download(`/api/grooves/${groove.grooveId}/export/mid?version=${groove.firstVersionId}`, ownerCookie);
    expect(r.status).toBe(200);
    expect(r.headers.get("cache-control")).toBe("private, max-age=31536000, immutable");
    expect(r.headers.get("content-disposition")).toContain('filename="ferry-lights-verse-v1.mid"');
    const kicks = new Midi(r.bytes).tracks.find((t) => t.channel === 9)!.notes.filter((n) => n.midi === 36);
    expect(kicks.map((n) => n.ticks)).toEqual([0]); // sampleDocument(0)
  });

  it("MusicXML: valid against the MusicXML 4.0 XSD, titled", { timeout: 60_000 }, async () => {
    const r = await download(`/api/grooves/${groove.grooveId}/export/musicxml`, ownerCookie);
    expect(r.status).toBe(200);
    expect(r.headers.get("content-type")).toBe("application/vnd.recordare.musicxml+xml; charset=utf-8");
    expect(r.headers.get("content-disposition")).toContain('filename="ferry-lights-verse-v2.musicxml"');
    const xml = text(r.bytes);
    expect(xml).toContain(`<work-title>${TITLE}</work-title>`);
    const v = await validateMusicXml([{ fileName: "download.musicxml", contents: xml }]);
    expect(v.errors.map((e) => e.rawMessage)).toEqual([]);
    expect(v.valid).toBe(true);
  });

  it("SVG: a standalone drawing with its fonts inside, that cannot run anything", async () => {
    const r = await download(`/api/grooves/${groove.grooveId}/export/svg?width=800`, ownerCookie);
    expect(r.status).toBe(200);
    expect(r.headers.get("content-type")).toBe("image/svg+xml; charset=utf-8");
    expect(r.headers.get("content-security-policy")).toContain("default-src 'none'");
    const svg = text(r.bytes);
    expect(svg).toMatch(/^<\?xml[^>]*>\s*<svg[^>]*width="800"/);
    expect(svg).toContain("@font-face{font-family:Bravura");
    expect(svg).toContain(`<title>${TITLE}</title>`);
    expect(svg).not.toMatch(/<script/i);
  });

  it("PNG: the PNG signature, then IHDR with width × scale pixels", async () => {
    const r = await download(`/api/grooves/${groove.grooveId}/export/png?width=600&scale=2&inline=1`, ownerCookie);
    expect(r.status).toBe(200);
    expect(r.headers.get("content-type")).toBe("image/png");
    expect(r.headers.get("content-disposition")).toMatch(/^inline; filename="ferry-lights-verse-v2\.png"/);
    expect([...r.bytes.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    expect(text(r.bytes.subarray(12, 16))).toBe("IHDR");
    const view = new DataView(r.bytes.buffer, r.bytes.byteOffset);
    expect(view.getUint32(16)).toBe(1200);
    expect(view.getUint32(20)).toBeGreaterThan(100);
  });

  it("refusals in the error shape: unknown format, unknown version, bad query, too many bars for one image", async () => {
    const unknown = await api("GET", `/api/grooves/${groove.grooveId}/export/pdf`, { cookie: ownerCookie });
    expect(unknown.status).toBe(404);
    expect(errorOf(unknown).message).toMatch(/Unknown export format "pdf"/);
    const version = await api("GET", `/api/grooves/${groove.grooveId}/export/mid?version=nope`, { cookie: ownerCookie });
    expect(version.status).toBe(404);
    expect(errorOf(version).code).toBe("not_found");
    const bad = await api("GET", `/api/grooves/${groove.grooveId}/export/png?width=20`, { cookie: ownerCookie });
    expect(bad.status).toBe(400);
    expect(errorOf(bad).code).toBe("invalid_query");
    const long = await api("POST", "/api/grooves", { cookie: ownerCookie, body: { title: "Long", document: { ...emptyGroove(), bars: 300 } } });
    expect(long.status).toBe(201);
    const tooBig = await api("GET", `/api/grooves/${long.body.id}/export/svg`, { cookie: ownerCookie });
    expect(tooBig.status).toBe(422);
    expect(errorOf(tooBig)).toMatchObject({ code: "image_too_large" });
    expect((await download(`/api/grooves/${long.body.id}/export/svg?from=1&to=8`, ownerCookie)).status).toBe(200);
  });
});

describe("who may download: the same rule as reading the version", () => {
  const cases: [string, number, () => string | null][] = [
    ["anonymous", 404, () => null],
    ["another member", 404, () => memberCookie],
    ["a viewer", 200, () => viewerCookie],
    ["the owner", 200, () => ownerCookie],
  ];
  let memberCookie: string;
  let viewerCookie: string;
  beforeAll(async () => {
    memberCookie = await sessionFor(member.id);
    viewerCookie = await sessionFor(viewer.id);
  });
  it.each(cases)("a private groove, %s → %i", async (_, status, cookie) => {
    for (const format of ["mid", "musicxml"]) {
      const r = await api("GET", `/api/grooves/${groove.grooveId}/export/${format}`, { cookie: cookie() });
      expect(r.status, format).toBe(status);
      if (status === 404) expect(errorOf(r).code).toBe("not_found");
    }
  });
  it("a public groove: anyone, signed in or not", async () => {
    const pub = await createGroove(owner.id, { visibility: "public", title: "Open" });
    expect((await download(`/api/grooves/${pub.grooveId}/export/mid`, null)).status).toBe(200);
  });
});

describe("MIDI import", () => {
  /** POST a body of bytes (`api` sends text only). */
  const post = async (bytes: Uint8Array | string, query = "", headers: Record<string, string> = { "content-type": "audio/midi" }, cookie: string | null = ownerCookie): Promise<Reply> => {
    const res = await fetch(new URL(`/api/import/midi${query}`, BASE()), {
      method: "POST",
      headers: { accept: "application/json", ...headers, ...(cookie ? { cookie: `tactus_session=${cookie}` } : {}) },
      body: typeof bytes === "string" ? bytes : new Uint8Array(bytes),
    });
    const text = await res.text();
    return { status: res.status, headers: res.headers, body: text ? JSON.parse(text) : null, text };
  };
  const doc = assertGroove({ ...sampleDocument(5), bars: 2, tempo: { bpm: "88", beatNote: "1/4" } });

  it("previews the groove a file becomes, with the report; nothing is saved", async () => {
    const before = Number((await db().query("select count(*)::int as n from grooves")).rows[0].n);
    const r = await post(exportMidi(doc, { title: "From the studio" }), "?grid=1/16");
    expect(r.status, r.text.slice(0, 300)).toBe(200);
    expect(r.body.title).toBe("From the studio");
    expect(r.body.missing).toEqual({ tempo: false, meter: false });
    expect(r.body.document.tempo.bpm).toBe("88");
    expect(compareGrooves(doc, assertGroove(r.body.document)).verdict).toBe("identical");
    expect(r.body.report.moved.count).toBe(0);
    expect(Number((await db().query("select count(*)::int as n from grooves")).rows[0].n)).toBe(before);
  });

  it("the preview becomes a groove; its MIDI imports back to the same document (import → export → import)", async () => {
    const first = (await post(exportMidi(doc))).body;
    const created = await api("POST", "/api/grooves", { cookie: ownerCookie, body: { title: "Imported", document: first.document } });
    expect(created.status).toBe(201);
    const r = await download(`/api/grooves/${created.body.id}/export/mid`, ownerCookie);
    const second = (await post(r.bytes)).body;
    expect(second.document).toEqual(first.document);
  });

  it("asks for tempo and meter when the file has none, and takes the answers", async () => {
    const bare = buildSmf(0, 480, [[0x00, 0x99, 38, 90, 0x60, 0x89, 38, 0, 0x00, 0xff, 0x2f, 0x00]]);
    const r = await post(bare);
    expect(r.status).toBe(200);
    expect(r.body.missing).toEqual({ tempo: true, meter: true });
    const answered = await post(bare, "?bpm=72&meter=6/8");
    expect(answered.body.document.tempo).toEqual({ bpm: "72", beatNote: "3/8" });
    expect(answered.body.document.meter).toEqual({ beatsPerBar: 6, beatUnit: 8 });
  });

  it("lists unknown percussion keys, and maps them when asked", async () => {
    const claves = buildSmf(0, 480, [[0x00, 0x99, 75, 90, 0x60, 0x89, 75, 0, 0x00, 0x99, 36, 90, 0x60, 0x89, 36, 0, 0x00, 0xff, 0x2f, 0x00]]);
    const r = await post(claves);
    expect(r.body.report.unknownPercussion).toMatchObject([{ note: 75, name: "Claves", count: 1, mappedTo: null }]);
    const mapped = await post(claves, "?map=75:cowbell");
    expect(mapped.body.document.kit.lanes.map((l: { piece: string }) => l.piece)).toContain("cowbell");
  });

  it("anonymous visitors are asked to sign in", async () => {
    const r = await post(exportMidi(doc), "", { "content-type": "audio/midi" }, null);
    expect(r.status).toBe(401);
    expect(errorOf(r).code).toBe("unauthenticated");
  });

  const refusals: [string, number, string, () => Uint8Array, RegExp][] = [
    ["a file that is not MIDI", 400, "not_midi", () => new TextEncoder().encode("%PDF-1.7 not a song"), /not a MIDI file/],
    ["an empty upload", 400, "not_midi", () => new Uint8Array(0), /empty/],
    ["a truncated file", 400, "truncated", () => exportMidi(doc).subarray(0, 40), /truncated/],
    ["a file with 0 tracks", 422, "no_tracks", () => buildSmf(1, 480, []), /0 tracks/],
    ["a 20 MB file", 413, "too_large", () => { const b = new Uint8Array(20 * 1024 * 1024); b.set(exportMidi(doc)); return b; }, /smaller than 20 MB/],
    ["an absurd tempo (1 µs per quarter note)", 422, "absurd_tempo", () => buildSmf(0, 480, [[0x00, 0xff, 0x51, 0x03, 0, 0, 1, 0x00, 0x99, 36, 90, 0x60, 0x89, 36, 0, 0x00, 0xff, 0x2f, 0x00]]), /60,000,000 bpm/],
  ];
  it.each(refusals)("refuses %s (%i %s)", async (_, status, code, bytes, message) => {
    const r = await post(bytes());
    expect(r.status, r.text.slice(0, 200)).toBe(status);
    const e = errorOf(r);
    expect(e.code).toBe(code);
    expect(e.message).toMatch(message);
    expect(Object.keys(r.body)).toEqual(["error"]);
  });

  it("refuses other content types and bad options", async () => {
    const form = await post("file=abc", "", { "content-type": "application/json" });
    expect(form.status).toBe(415);
    expect(errorOf(form).code).toBe("unsupported_media_type");
    const grid = await post(exportMidi(doc), "?grid=1/7");
    expect(grid.status).toBe(400);
    expect(errorOf(grid).fields?.grid).toBeDefined();
    const map = await post(exportMidi(doc), "?map=75:banjo");
    expect(map.status).toBe(400);
  });
});
