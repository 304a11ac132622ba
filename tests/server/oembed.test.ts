// The oEmbed endpoint against the BUILT server, checked with the oEmbed 1.0 specification (oembed.com, sections 2.2
// to 2.4): a response has `type` and `version` "1.0"; a "rich" response has `html`, `width` and `height`, which must
// respect the consumer's maxwidth and maxheight, as must a thumbnail; thumbnail_url, thumbnail_width and
// thumbnail_height come together or not at all; JSON is served as application/json; a provider that cannot answer
// in the requested format answers 501, an unknown address 404. Discovery (section 4): a
// <link rel="alternate" type="application/json+oembed" href="…"> in the page's head.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { BASE, api, closeDb, createGroove, createUser, errorOf, sessionFor, type GrooveFixture, type TestUser } from "./helpers";

interface OEmbed {
  type: string;
  version: string;
  html: string;
  width: number;
  height: number;
  title?: string;
  author_name?: string;
  provider_name?: string;
  provider_url?: string;
  cache_age?: number;
  thumbnail_url?: string;
  thumbnail_width?: number;
  thumbnail_height?: number;
  [k: string]: unknown;
}

const oembed = (url: string, extra = "") => api<OEmbed>("GET", `/api/oembed?url=${encodeURIComponent(url)}${extra}`);

/** Every rule of the specification a rich response must meet, for the limits of the request. */
function expectValidRich(r: { status: number; headers: Headers; body: OEmbed }, limits: { maxwidth?: number; maxheight?: number } = {}) {
  expect(r.status).toBe(200);
  expect(r.headers.get("content-type")).toMatch(/^application\/json\b/);
  const b = r.body;
  expect(b.type).toBe("rich");
  expect(b.version).toBe("1.0");
  expect(typeof b.html).toBe("string");
  expect(Number.isInteger(b.width) && b.width > 0).toBe(true);
  expect(Number.isInteger(b.height) && b.height > 0).toBe(true);
  if (limits.maxwidth !== undefined) expect(b.width).toBeLessThanOrEqual(limits.maxwidth);
  if (limits.maxheight !== undefined) expect(b.height).toBeLessThanOrEqual(limits.maxheight);
  // The html is one iframe whose size is the response's size, with no autoplay permission.
  const frame = /^<iframe src="([^"]+)" width="(\d+)" height="(\d+)" [^>]*><\/iframe>$/.exec(b.html);
  expect(frame, b.html).not.toBeNull();
  expect(Number(frame![2])).toBe(b.width);
  expect(Number(frame![3])).toBe(b.height);
  expect(b.html).not.toMatch(/autoplay/i);
  const thumbs = [b.thumbnail_url, b.thumbnail_width, b.thumbnail_height].filter((x) => x !== undefined);
  expect([0, 3]).toContain(thumbs.length);
  if (b.thumbnail_width !== undefined) {
    if (limits.maxwidth !== undefined) expect(b.thumbnail_width).toBeLessThanOrEqual(limits.maxwidth);
    if (limits.maxheight !== undefined) expect(b.thumbnail_height!).toBeLessThanOrEqual(limits.maxheight);
  }
  for (const k of ["title", "author_name", "provider_name", "provider_url"]) if (b[k] !== undefined) expect(typeof b[k]).toBe("string");
  if (b.cache_age !== undefined) expect(Number.isInteger(b.cache_age)).toBe(true);
  return { src: frame![1]!.replace(/&amp;/g, "&") }; // attribute escaping undone
}

describe("oEmbed", () => {
  let owner: TestUser;
  let cookie: string;
  let pub: GrooveFixture;

  beforeAll(async () => {
    owner = await createUser({ label: "oembed" });
    cookie = await sessionFor(owner.id);
    pub = await createGroove(owner.id, { visibility: "public", title: "Lantern swing" });
  });
  afterAll(async () => {
    await closeDb();
  });

  it("answers a groove page with a rich embed of its latest version", async () => {
    const r = await oembed(`${BASE()}/grooves/${pub.grooveId}`);
    const { src } = expectValidRich(r);
    expect(src).toBe(`${BASE()}/embed/g/${pub.grooveId}`);
    expect(r.body.title).toBe("Lantern swing");
    expect(r.body.author_name).toBe(owner.displayName);
    expect(r.body.provider_name).toBe("Tactus");
    expect(r.body.width).toBe(720);
    // The thumbnail is the preview image, and it is what it says it is.
    expect(r.body.thumbnail_width).toBe(1200);
    expect(r.body.thumbnail_height).toBe(630);
    const thumb = await fetch(r.body.thumbnail_url!);
    expect(thumb.status).toBe(200);
    expect(thumb.headers.get("content-type")).toBe("image/png");
  });

  it("answers version pages and embed addresses, keeping the embed's options", async () => {
    const v = await oembed(`${BASE()}/grooves/${pub.grooveId}?version=${pub.firstVersionId}`);
    expect(expectValidRich(v).src).toBe(`${BASE()}/embed/v/${pub.firstVersionId}`);
    const e = await oembed(`${BASE()}/embed/v/${pub.firstVersionId}?keys=0&bar=1&theme=dark`);
    expect(expectValidRich(e).src).toBe(`${BASE()}/embed/v/${pub.firstVersionId}?keys=0&theme=dark`);
    const g = await oembed(`${BASE()}/embed/g/${pub.grooveId}`);
    expect(expectValidRich(g).src).toBe(`${BASE()}/embed/g/${pub.grooveId}`);
    expect(v.body.cache_age).toBeGreaterThan(g.body.cache_age!); // a version never changes; the latest does
  });

  it("honours maxwidth and maxheight for the frame and the thumbnail", async () => {
    const url = `${BASE()}/grooves/LmpHarbour1`; // demo data, with a keys part: a tall embed
    for (const limits of [{ maxwidth: 400 }, { maxwidth: 320, maxheight: 900 }, { maxheight: 200 }, { maxwidth: 1000, maxheight: 5000 }, { maxwidth: 100, maxheight: 80 }]) {
      const extra = Object.entries(limits)
        .map(([k, v]) => `&${k}=${v}`)
        .join("");
      const r = await oembed(url, extra);
      expectValidRich(r, limits);
    }
    // Narrower frames re-wrap the bars into more lines: a taller frame.
    const wide = (await oembed(url, "&maxwidth=1000")).body;
    const narrow = (await oembed(url, "&maxwidth=360")).body;
    expect(narrow.width).toBe(360);
    expect(narrow.height).toBeGreaterThan(wide.height); // half the width, yet taller: more lines, same size of print
    // No preview image fits 100 × 80: no thumbnail at all (the three fields go together).
    const tiny = (await oembed(url, "&maxwidth=100&maxheight=80")).body;
    expect(tiny.thumbnail_url).toBeUndefined();
    expect(tiny.thumbnail_width).toBeUndefined();
  });

  it("answers JSON only: format=xml is 501, format=json is fine", async () => {
    const url = `${BASE()}/grooves/${pub.grooveId}`;
    expectValidRich(await oembed(url, "&format=json"));
    const xml = await oembed(url, "&format=xml");
    expect(xml.status).toBe(501);
    expect(errorOf(xml).code).toBe("format_not_supported");
  });

  it("answers 404 for addresses that are not shared grooves, and 400 without a url", async () => {
    const secret = await createGroove(owner.id, { visibility: "private", title: "Under wraps" });
    const gone = await createGroove(owner.id, { visibility: "public", title: "Gone", deletedAt: new Date() });
    const cases = [
      `${BASE()}/grooves/${secret.grooveId}`,
      `${BASE()}/embed/v/${secret.firstVersionId}`,
      `${BASE()}/grooves/${gone.grooveId}`,
      `${BASE()}/grooves/doesnotexist`,
      `${BASE()}/library`,
      `https://elsewhere.example/grooves/${pub.grooveId}`,
      `${BASE()}/grooves/${pub.grooveId}?version=${secret.firstVersionId}`, // a version of another groove
      "not a url",
    ];
    for (const url of cases) {
      const r = await oembed(url);
      expect(r.status, url).toBe(404);
      expect(errorOf(r).code).toBe("not_found");
    }
    // Even the owner, signed in, gets no oEmbed of a private groove.
    const own = await api("GET", `/api/oembed?url=${encodeURIComponent(`${BASE()}/grooves/${secret.grooveId}`)}`, { cookie });
    expect(own.status).toBe(404);
    const bare = await api("GET", "/api/oembed");
    expect(bare.status).toBe(400);
    expect(errorOf(bare).fields?.url).toBeDefined();
    expect((await api("GET", `/api/oembed?url=${encodeURIComponent(`${BASE()}/grooves/${pub.grooveId}`)}&maxwidth=wide`)).status).toBe(400);
  });

  it("is discoverable from the groove page and the embed pages", async () => {
    for (const path of [`/grooves/${pub.grooveId}`, `/embed/v/${pub.firstVersionId}`, `/embed/g/${pub.grooveId}`]) {
      const html = await (await fetch(new URL(path, BASE()))).text();
      const head = html.slice(0, html.indexOf("</head>"));
      const link = /<link rel="alternate" type="application\/json\+oembed" href="([^"]+)"/.exec(head);
      expect(link, path).not.toBeNull();
      const href = link![1]!.replace(/&amp;/g, "&");
      const r = await fetch(href);
      expect(r.status, href).toBe(200);
      const body = (await r.json()) as OEmbed;
      expect(body.type).toBe("rich");
      expect(body.title).toBe("Lantern swing");
    }
    // A private groove's page (seen by its owner) offers no discovery link and no preview tags.
    const secret = await createGroove(owner.id, { visibility: "private", title: "Quiet one" });
    const html = await (await fetch(new URL(`/grooves/${secret.grooveId}`, BASE()), { headers: { cookie: `tactus_session=${cookie}` } })).text();
    expect(html).toContain("Quiet one");
    expect(html).not.toContain("application/json+oembed");
    expect(html).not.toContain("og:image");
  });
});
