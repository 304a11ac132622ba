// Visibility on every public surface, table-driven, against the BUILT server: for each state a groove can be in
// (public, link-only, private, deleted, and public then revoked or deleted while its pages sit in the server's
// caches), every address answers as the rules say (issue 6):
//   - private grooves never appear through an embed, the oEmbed endpoint, a preview image, the sitemap or search
//     engines; embeds of private grooves are 404 even for the owner (public surfaces; see lib/server/sharing.ts);
//   - link-only grooves are "noindex" (meta tag and X-Robots-Tag, Robots Exclusion conventions as documented by
//     the major search engines) and stay out of the sitemap (sitemaps.org 0.9);
//   - revoked or deleted grooves answer 404 on every address, at once.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { BASE, api, closeDb, createGroove, createUser, sessionFor, type GrooveFixture, type TestUser } from "./helpers";

type Address = "embed-version" | "embed-groove" | "embed-compare" | "oembed" | "preview-image" | "groove-page";
const ADDRESSES: Address[] = ["embed-version", "embed-groove", "embed-compare", "oembed", "preview-image", "groove-page"];

function pathOf(address: Address, g: GrooveFixture): string {
  switch (address) {
    case "embed-version":
      return `/embed/v/${g.firstVersionId}`;
    case "embed-groove":
      return `/embed/g/${g.grooveId}`;
    case "embed-compare":
      return `/embed/compare?a=${g.latestVersionId}&b=LmpHarbour1`; // the other reading: a public demo groove
    case "oembed":
      return `/api/oembed?url=${encodeURIComponent(`${BASE()}/grooves/${g.grooveId}`)}`;
    case "preview-image":
      return `/og/${g.latestVersionId}.png`;
    case "groove-page":
      return `/grooves/${g.grooveId}`;
  }
}

interface Seen {
  status: number;
  robotsHeader: string | null;
  robotsMeta: string | null;
  body: string;
}

async function visit(path: string, cookie?: string): Promise<Seen> {
  const r = await fetch(new URL(path, BASE()), { headers: cookie ? { cookie: `tactus_session=${cookie}` } : {}, redirect: "manual" });
  const type = r.headers.get("content-type") ?? "";
  const body = type.startsWith("image/") ? "" : await r.text();
  const meta = /<meta name="robots" content="([^"]+)"/.exec(body);
  return { status: r.status, robotsHeader: r.headers.get("x-robots-tag"), robotsMeta: meta?.[1] ?? null, body };
}

async function sitemap(): Promise<string> {
  const r = await fetch(new URL("/sitemap.xml", BASE()));
  expect(r.status).toBe(200);
  expect(r.headers.get("content-type")).toMatch(/^application\/xml/);
  return r.text();
}

const inSitemap = (xml: string, g: GrooveFixture) => xml.includes(`<loc>${BASE()}/grooves/${g.grooveId}</loc>`);

/** What every address must answer for a groove in each state (anonymous visitor). */
const EXPECTED: Record<"public" | "link" | "private" | "deleted", { status: Record<Address, number>; indexable: boolean; sitemap: boolean }> = {
  public: {
    status: { "embed-version": 200, "embed-groove": 200, "embed-compare": 200, oembed: 200, "preview-image": 200, "groove-page": 200 },
    indexable: true,
    sitemap: true,
  },
  link: {
    status: { "embed-version": 200, "embed-groove": 200, "embed-compare": 200, oembed: 200, "preview-image": 200, "groove-page": 200 },
    indexable: false,
    sitemap: false,
  },
  private: {
    status: { "embed-version": 404, "embed-groove": 404, "embed-compare": 404, oembed: 404, "preview-image": 404, "groove-page": 404 },
    indexable: false,
    sitemap: false,
  },
  deleted: {
    status: { "embed-version": 404, "embed-groove": 404, "embed-compare": 404, oembed: 404, "preview-image": 404, "groove-page": 404 },
    indexable: false,
    sitemap: false,
  },
};

/** Assert every address of `g` against the expectations of `state`. */
async function expectState(g: GrooveFixture, state: keyof typeof EXPECTED, title: string) {
  const want = EXPECTED[state];
  for (const address of ADDRESSES) {
    const path = pathOf(address, g);
    const seen = await visit(path);
    expect(seen.status, `${state} ${address} ${path}`).toBe(want.status[address]);
    if (seen.status === 404) {
      expect(seen.body, `${state} ${address}: a 404 reveals nothing`).not.toContain(title);
      continue;
    }
    // Embeds and oEmbed answers are never indexed themselves; the groove page is, when the groove is public.
    const indexable = address === "groove-page" && want.indexable;
    if (address !== "preview-image") expect(seen.robotsHeader, `${state} ${address}`).toBe(indexable ? "index, follow" : address === "oembed" ? "noindex" : "noindex, nofollow");
    if (address === "preview-image" && !want.indexable) expect(seen.robotsHeader).toBe("noindex");
    if (address === "groove-page" || address.startsWith("embed")) expect(seen.robotsMeta, `${state} ${address}`).toBe(indexable ? "index, follow" : "noindex, nofollow");
  }
  expect(inSitemap(await sitemap(), g), `${state}: sitemap`).toBe(want.sitemap);
}

describe("visibility on every address", () => {
  let owner: TestUser;
  let cookie: string;

  beforeAll(async () => {
    owner = await createUser({ label: "visibility" });
    cookie = await sessionFor(owner.id);
  });
  afterAll(async () => {
    await closeDb();
  });

  for (const state of ["public", "link", "private", "deleted"] as const) {
    it(`${state} grooves: every address answers as the rules say`, async () => {
      const title = `Visibility ${state} ${Date.now()}`;
      const g = await createGroove(owner.id, {
        visibility: state === "deleted" ? "public" : state,
        title,
        ...(state === "deleted" ? { deletedAt: new Date() } : {}),
      });
      await expectState(g, state, title);
    });
  }

  it("private grooves: the owner sees the groove page (noindex), but never an embed, oEmbed or preview image", async () => {
    const title = `Owner only ${Date.now()}`;
    const g = await createGroove(owner.id, { visibility: "private", title });
    const page = await visit(pathOf("groove-page", g), cookie);
    expect(page.status).toBe(200);
    expect(page.body).toContain(title);
    expect(page.robotsHeader).toBe("noindex, nofollow");
    expect(page.robotsMeta).toBe("noindex, nofollow");
    for (const address of ADDRESSES.filter((a) => a !== "groove-page")) {
      expect((await visit(pathOf(address, g), cookie)).status, address).toBe(404);
    }
  });

  it("revoking a public groove (made private) answers 404 everywhere at once, cached pages included", async () => {
    const title = `Revoked ${Date.now()}`;
    const g = await createGroove(owner.id, { visibility: "public", title });
    await expectState(g, "public", title); // every page is now in the server's caches
    const r = await api("PATCH", `/api/grooves/${g.grooveId}`, { cookie, body: { visibility: "private" } });
    expect(r.status).toBe(200);
    await expectState(g, "private", title);
    // And back: sharing again brings every address back.
    expect((await api("PATCH", `/api/grooves/${g.grooveId}`, { cookie, body: { visibility: "link" } })).status).toBe(200);
    await expectState(g, "link", title);
  });

  it("deleting a shared groove answers 404 everywhere at once, cached pages included", async () => {
    const title = `Deleted ${Date.now()}`;
    const g = await createGroove(owner.id, { visibility: "link", title });
    await expectState(g, "link", title);
    expect((await api("DELETE", `/api/grooves/${g.grooveId}`, { cookie })).status).toBe(204);
    await expectState(g, "deleted", title);
  });

  it("points crawlers at the sitemap and keeps them out of the API", async () => {
    const r = await fetch(new URL("/robots.txt", BASE()));
    expect(r.status).toBe(200);
    const text = await r.text();
    expect(text).toMatch(/^User-agent: \*$/m);
    expect(text).toMatch(/^Disallow: \/api\/$/m);
    expect(text).toContain(`Sitemap: ${BASE()}/sitemap.xml`);
    // The demo's link-only groove stays out; its public ones are in (src/lib/demo/grooves.ts).
    const xml = await sitemap();
    expect(xml).toContain(`${BASE()}/grooves/LmpHarbour1`);
    expect(xml).not.toContain("LmpLantern7");
  });
});
