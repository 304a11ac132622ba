// Embed pages, preview images and their caching, against the BUILT server and the real PostgreSQL database.
// HTTP caching rules checked here come from RFC 9111 (Cache-Control: max-age, immutable from RFC 8246,
// must-revalidate) and RFC 9110 (strong and weak ETags, If-None-Match answered with 304 using the weak comparison,
// §13.1.2). Frame rules: X-Frame-Options (RFC 7034) and CSP Level 2 frame-ancestors.
import { inflateSync } from "node:zlib";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { STATE_TTL_MS } from "../../src/lib/server/sharing";
import { BASE, api, closeDb, createGroove, createUser, db, sampleDocument, sessionFor, type GrooveFixture, type TestUser } from "./helpers";

/** A request without compression unless asked for (Node's fetch offers gzip by default). */
const get = (path: string, headers: Record<string, string> = {}, method = "GET") =>
  fetch(new URL(path, BASE()), { method, headers: { "accept-encoding": "identity", ...headers }, redirect: "manual" });

const STRONG_ETAG = /^"[A-Za-z0-9_-]{16,}"$/;

/** Width and height from a PNG's IHDR chunk (PNG specification, ISO/IEC 15948: bytes 16–23, big-endian). */
function pngSize(bytes: Uint8Array): { width: number; height: number } {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  return { width: view.getUint32(16), height: view.getUint32(20) };
}

/**
 * Grey levels (0–255) of an 8-bit RGB or RGBA PNG, decoded by the PNG specification (ISO/IEC 15948): IDAT
 * chunks inflated together, then each row's filter (0 None, 1 Sub, 2 Up, 3 Average, 4 Paeth) undone.
 */
function pngGreys(bytes: Uint8Array): Uint8Array {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const { width, height } = pngSize(bytes);
  const bitDepth = bytes[24];
  const colourType = bytes[25];
  expect(bitDepth).toBe(8);
  const channels = colourType === 6 ? 4 : colourType === 2 ? 3 : 0;
  expect(channels).toBeGreaterThan(0);
  const parts: Uint8Array[] = [];
  for (let p = 8; p < bytes.length; ) {
    const len = view.getUint32(p);
    const type = String.fromCharCode(...bytes.subarray(p + 4, p + 8));
    if (type === "IDAT") parts.push(bytes.subarray(p + 8, p + 8 + len));
    p += 12 + len;
  }
  const data = inflateSync(Buffer.concat(parts));
  const stride = width * channels;
  const out = new Uint8Array(stride * height);
  for (let y = 0; y < height; y++) {
    const filter = data[y * (stride + 1)]!;
    const row = data.subarray(y * (stride + 1) + 1, (y + 1) * (stride + 1));
    for (let x = 0; x < stride; x++) {
      const a = x >= channels ? out[y * stride + x - channels]! : 0;
      const b = y > 0 ? out[(y - 1) * stride + x]! : 0;
      const c = x >= channels && y > 0 ? out[(y - 1) * stride + x - channels]! : 0;
      const p = a + b - c;
      const pa = Math.abs(p - a);
      const pb = Math.abs(p - b);
      const pc = Math.abs(p - c);
      const predictor = [0, a, b, (a + b) >> 1, pa <= pb && pa <= pc ? a : pb <= pc ? b : c][filter]!;
      out[y * stride + x] = (row[x]! + predictor) & 0xff;
    }
  }
  const greys = new Uint8Array(width * height);
  for (let i = 0; i < greys.length; i++) greys[i] = Math.round((out[i * channels]! + out[i * channels + 1]! + out[i * channels + 2]!) / 3);
  return greys;
}

describe("embed pages", () => {
  let owner: TestUser;
  let g: GrooveFixture;
  let cookie: string;

  beforeAll(async () => {
    owner = await createUser({ label: "embedder" });
    cookie = await sessionFor(owner.id);
    g = await createGroove(owner.id, { visibility: "public", title: "Tidewater shuffle" });
  });
  afterAll(async () => {
    await closeDb();
  });

  it("draws the notation on the server as inline SVG, with title, tempo, meter and an open-in-Tactus link", async () => {
    const r = await get(`/embed/v/${g.firstVersionId}`);
    expect(r.status).toBe(200);
    expect(r.headers.get("content-type")).toMatch(/^text\/html/);
    const html = await r.text();
    expect(html).toContain("Tidewater shuffle");
    // One drawing per width bucket, each an <svg> with VexFlow's staves (visible without JavaScript).
    expect(html.match(/class="tx-bucket"/g)).toHaveLength(5);
    expect(html.match(/<svg[^>]*class="tx-score"/g)).toHaveLength(5);
    expect(html).toMatch(/aria-label="Notation: 4\/4, 96 bpm, 1 bar, drum kit"/);
    expect(html).toContain("= 96"); // tempo (sampleDocument: quarter = 96)
    expect(html).toContain("4/4");
    const open = /<a class="tx-open" href="([^"]+)"/.exec(html);
    expect(open?.[1]).toBe(`${BASE()}/grooves/${g.grooveId}?version=${g.firstVersionId}`);
    // The play island is server-rendered in its final shape; no element ids are repeated across the five drawings.
    expect(html).toContain('data-tx-play aria-pressed="false"');
    const ids = [...html.matchAll(/ id="([^"]+)"/g)].map((m) => m[1]);
    expect(new Set(ids).size).toBe(ids.length);
  });

  it("answers a version embed as immutable with a strong ETag, and conditional requests with 304", async () => {
    const path = `/embed/v/${g.firstVersionId}`;
    const first = await get(path);
    const body = await first.text();
    const etag = first.headers.get("etag")!;
    expect(first.headers.get("cache-control")).toBe("public, max-age=31536000, immutable");
    expect(etag).toMatch(STRONG_ETAG);

    const again = await get(path);
    expect(again.headers.get("etag")).toBe(etag);
    expect(await again.text()).toBe(body);

    const notModified = await get(path, { "if-none-match": etag });
    expect(notModified.status).toBe(304);
    expect(await notModified.text()).toBe("");
    expect(notModified.headers.get("etag")).toBe(etag);
    expect(notModified.headers.get("cache-control")).toBe("public, max-age=31536000, immutable");
    // RFC 9110 §13.1.2: If-None-Match uses the weak comparison, and a list may name several tags.
    expect((await get(path, { "if-none-match": `W/${etag}` })).status).toBe(304);
    expect((await get(path, { "if-none-match": `"nope", ${etag}` })).status).toBe(304);
    expect((await get(path, { "if-none-match": "*" })).status).toBe(304);
    expect((await get(path, { "if-none-match": '"something-else"' })).status).toBe(200);

    // gzip for clients that accept it: the same page (fetch decompresses), its own strong tag.
    const zipped = await get(path, { "accept-encoding": "gzip" });
    expect(zipped.headers.get("content-encoding")).toBe("gzip");
    expect(zipped.headers.get("vary")).toMatch(/accept-encoding/i);
    expect(zipped.headers.get("etag")).not.toBe(etag);
    expect(zipped.headers.get("etag")).toMatch(STRONG_ETAG);
    expect(await zipped.text()).toBe(body);
    expect((await get(path, { "accept-encoding": "gzip", "if-none-match": zipped.headers.get("etag")! })).status).toBe(304);

    const head = await get(path, {}, "HEAD");
    expect(head.status).toBe(200);
    expect(head.headers.get("etag")).toBe(etag);
    expect(await head.text()).toBe("");
  });

  it("answers the groove's latest-version embed with a short max-age and revalidation, and follows new saves", async () => {
    const fixture = await createGroove(owner.id, { visibility: "link", title: "Ebb and flow" });
    const path = `/embed/g/${fixture.grooveId}`;
    const first = await get(path);
    expect(first.status).toBe(200);
    expect(first.headers.get("cache-control")).toBe("public, max-age=60, must-revalidate");
    const etag = first.headers.get("etag")!;
    expect(etag).toMatch(STRONG_ETAG);
    expect(await first.text()).toContain("version 2");
    expect((await get(path, { "if-none-match": etag })).status).toBe(304);

    const saved = await api("POST", `/api/grooves/${fixture.grooveId}/versions`, {
      cookie,
      body: { baseVersionId: fixture.latestVersionId, document: sampleDocument(7), message: "Third" },
    });
    expect(saved.status).toBe(201);
    const after = await get(path, { "if-none-match": etag });
    expect(after.status).toBe(200);
    expect(after.headers.get("etag")).not.toBe(etag);
    expect(await after.text()).toContain("version 3");
  });

  it("serves repeated views from the stored response, and renders again once the groove changes", async () => {
    const fixture = await createGroove(owner.id, { visibility: "public", title: "Slack water" });
    const path = `/embed/v/${fixture.firstVersionId}`;
    expect(await (await get(path)).text()).toContain("Slack water");
    // Change the title behind the server's back, leaving updated_at alone: the stored page is still served.
    await db().query("update grooves set title = 'Renamed quietly' where id = $1", [fixture.grooveId]);
    expect(await (await get(path)).text()).toContain("Slack water");
    // Any real change moves updated_at (the library's update does): the page is drawn again. Made by hand in SQL,
    // outside the app, the change is seen once the server's state of the groove is a second old (STATE_TTL_MS).
    await db().query("update grooves set updated_at = now() where id = $1", [fixture.grooveId]);
    await new Promise((r) => setTimeout(r, STATE_TTL_MS + 100));
    const fresh = await (await get(path)).text();
    expect(fresh).toContain("Renamed quietly");
    expect(fresh).not.toContain("Slack water");
  });

  it("takes its options from the address: keys part hidden, start bar, theme; other parameters change nothing", async () => {
    // Demo data: "Harbour Lights at Four" has a keys part (src/lib/demo/grooves.ts).
    const withKeys = await (await get("/embed/v/LmpHarbour1v1")).text();
    const noKeys = await (await get("/embed/v/LmpHarbour1v1?keys=0")).text();
    const height = (html: string) => Number(/<div class="tx-bucket" data-w="720">[\s\S]*?<svg[^>]* height="([\d.]+)"/.exec(html)?.[1]);
    expect(height(noKeys)).toBeGreaterThan(0);
    expect(height(noKeys)).toBeLessThan(height(withKeys)); // no grand staff under the kit staff
    const data = (html: string) => JSON.parse(/<script type="application\/json" data-tx-data>([\s\S]*?)<\/script>/.exec(html)![1]!);
    expect(data(withKeys).startBar).toBe(0);
    expect(data(await (await get("/embed/v/LmpHarbour1v1?bar=2")).text()).startBar).toBe(1);
    expect(await (await get("/embed/v/LmpHarbour1v1?theme=dark")).text()).toContain('<html lang="en" data-theme="dark">');
    const plain = await get("/embed/v/LmpHarbour1v1");
    const tracked = await get("/embed/v/LmpHarbour1v1?utm_source=newsletter");
    expect(tracked.headers.get("etag")).toBe(plain.headers.get("etag"));
    // Autoplay does not exist: nothing in the page starts sound by itself.
    expect(withKeys).not.toMatch(/autoplay/i);
  });

  it("may be framed from anywhere, while other pages may only be framed by Tactus", async () => {
    for (const path of [`/embed/v/${g.firstVersionId}`, `/embed/g/${g.grooveId}`, "/embed/v/unknown-version"]) {
      const r = await get(path);
      expect(r.headers.get("x-frame-options"), path).toBeNull();
      expect(r.headers.get("content-security-policy"), path).toBe("frame-ancestors *");
    }
    for (const path of ["/", `/grooves/${g.grooveId}`, "/compare"]) {
      const r = await get(path);
      expect(r.headers.get("x-frame-options"), path).toBe("SAMEORIGIN");
      expect(r.headers.get("content-security-policy"), path).toBe("frame-ancestors 'self'");
    }
  });

  it("answers embeds of a private groove with 404 even to its owner: embeds are public surfaces", async () => {
    const secret = await createGroove(owner.id, { visibility: "private", title: "Unreleased" });
    for (const path of [`/embed/v/${secret.firstVersionId}`, `/embed/g/${secret.grooveId}`]) {
      const r = await fetch(new URL(path, BASE()), { headers: { cookie: `tactus_session=${cookie}` } });
      expect(r.status, path).toBe(404);
      expect(await r.text()).not.toContain("Unreleased");
    }
  });

  it("draws a preview image: a 1200 × 630 PNG of the first bars, smaller widths on request, with an ETag", async () => {
    const r = await get(`/og/${g.firstVersionId}.png`);
    expect(r.status).toBe(200);
    expect(r.headers.get("content-type")).toBe("image/png");
    const png = new Uint8Array(await r.arrayBuffer());
    // PNG signature (ISO/IEC 15948): 89 50 4E 47 0D 0A 1A 0A.
    expect([...png.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    expect(pngSize(png)).toEqual({ width: 1200, height: 630 });
    // Not a blank card: dark ink (notation, title) on light paper.
    const pixels = pngGreys(png);
    let dark = 0;
    let light = 0;
    for (const v of pixels) {
      if (v < 60) dark++;
      else if (v > 220) light++;
    }
    expect(dark).toBeGreaterThan(5000);
    expect(light).toBeGreaterThan(pixels.length / 2);
    const etag = r.headers.get("etag")!;
    expect(etag).toMatch(STRONG_ETAG);
    expect((await get(`/og/${g.firstVersionId}.png`, { "if-none-match": etag })).status).toBe(304);

    const small = new Uint8Array(await (await get(`/og/${g.firstVersionId}.png?w=300`)).arrayBuffer());
    expect(pngSize(small)).toEqual({ width: 300, height: 158 });
  });
});
