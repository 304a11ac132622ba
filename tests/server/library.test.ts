// The groove library over HTTP against the built server: list (filters, sort, pages), create, read, update details,
// soft delete and restore within 30 days, fork, versions (append-only, hashed, chained), restore as new, optimistic
// concurrency (50 concurrent saves), document validation (400 with field paths, 413 over 2 MB) and invitations.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { api, closeDb, contentHash, createGroove, createUser, db, errorOf, sampleDocument, sessionFor, tokenFromMail, uid, type TestUser } from "./helpers";

let owner: TestUser;
let cookie: string;

beforeAll(async () => {
  owner = await createUser({ label: "librarian" });
  cookie = await sessionFor(owner.id);
});
afterAll(closeDb);

describe("create, read, update", () => {
  it("creates a groove with a first version whose hash is the SHA-256 of the canonical document", async () => {
    const doc = sampleDocument(2);
    const r = await api("POST", "/api/grooves", { cookie, body: { title: "  Harbour Lights  ", tags: ["Funk", "funk", "Half time"], document: doc } });
    expect(r.status).toBe(201);
    expect(r.body.title).toBe("Harbour Lights");
    expect(r.body.tags).toEqual(["funk", "half time"]);
    expect(r.body.visibility).toBe("private");
    expect(r.body.role).toBe("owner");
    expect(r.body.latestVersion.number).toBe(1);
    const row = (await db().query("select document, content_hash from groove_versions where id = $1", [r.body.latestVersion.id])).rows[0];
    expect(row.content_hash).toBe(contentHash(row.document));
    expect(row.content_hash).toBe(r.body.latestVersion.contentHash);
    const read = await api("GET", `/api/grooves/${r.body.id}`, { cookie });
    expect(read.status).toBe(200);
    expect(read.body.latestVersion.id).toBe(r.body.latestVersion.id);
  });

  it("creates an empty one-bar groove when no document is sent", async () => {
    const r = await api("POST", "/api/grooves", { cookie, body: { title: "Blank page" } });
    expect(r.status).toBe(201);
    const v = await api("GET", `/api/grooves/${r.body.id}/versions/${r.body.latestVersion.id}`, { cookie });
    expect(v.body.document.bars).toBe(1);
    expect(v.body.document.meter).toEqual({ beatsPerBar: 4, beatUnit: 4 });
  });

  it("updates details and records the change in the audit trail", async () => {
    const g = await createGroove(owner.id);
    const r = await api("PATCH", `/api/grooves/${g.grooveId}`, { cookie, body: { title: "Undertow, take 2", description: "Half-time feel", visibility: "link" } });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ title: "Undertow, take 2", description: "Half-time feel", visibility: "link" });
    const audit = await db().query("select action, details from audit_events where groove_id = $1", [g.grooveId]);
    expect(audit.rows.map((x) => x.action)).toEqual(["groove.updated"]);
    expect(audit.rows[0].details.after.title).toBe("Undertow, take 2");
    const empty = await api("PATCH", `/api/grooves/${g.grooveId}`, { cookie, body: {} });
    expect(empty.status).toBe(400);
    errorOf(empty);
  });

  it("shows a link-shared groove to anyone with the link, but lists it only for its people", async () => {
    const g = await createGroove(owner.id, { visibility: "link", title: `Linked ${uid(6)}` });
    expect((await api("GET", `/api/grooves/${g.grooveId}`)).status).toBe(200);
    const other = await sessionFor((await createUser()).id);
    const list = await api("GET", `/api/grooves?q=${encodeURIComponent("Linked")}&pageSize=100`, { cookie: other });
    expect(list.body.items.map((i: { id: string }) => i.id)).not.toContain(g.grooveId);
  });
});

describe("the library list", () => {
  let me: TestUser;
  let mine: string;
  const tag = `tag${uid(6).toLowerCase()}`;
  beforeAll(async () => {
    me = await createUser({ label: "lister" });
    mine = await sessionFor(me.id);
    const friend = await createUser({ label: "friend" });
    // 7 of mine (3 tagged), 2 shared with me, 2 public of someone else, 2 private of someone else.
    for (let i = 0; i < 7; i++) {
      await createGroove(me.id, { title: `${["Alder", "Birch", "Cedar", "Dogwood", "Elm", "Fir", "Gum"][i]} groove`, tags: i < 3 ? [tag] : [] });
      await new Promise((r) => setTimeout(r, 5));
    }
    await createGroove(friend.id, { title: "Shared as editor", editors: [me.id], tags: [tag] });
    await createGroove(friend.id, { title: "Shared as viewer", viewers: [me.id] });
    await createGroove(friend.id, { title: "Friend public one", visibility: "public" });
    await createGroove(friend.id, { title: "Friend public two", visibility: "public", tags: [tag] });
    await createGroove(friend.id, { title: "Friend secret one" });
    await createGroove(friend.id, { title: "Friend secret two", tags: [tag] });
  });

  it("filters by scope, tag, owner and text, and never shows other people's private grooves", async () => {
    const q = async (query: string) => (await api("GET", `/api/grooves?${query}&pageSize=100`, { cookie: mine })).body;
    const minel = await q("scope=mine");
    expect(minel.total).toBe(7);
    const shared = await q("scope=shared");
    expect(shared.items.map((i: { title: string; role: string }) => [i.title, i.role]).sort()).toEqual([
      ["Shared as editor", "editor"],
      ["Shared as viewer", "viewer"],
    ]);
    const tagged = await q(`tag=${tag}`);
    expect(tagged.items.map((i: { title: string }) => i.title).sort()).toEqual(["Alder groove", "Birch groove", "Cedar groove", "Friend public two", "Shared as editor"]);
    const text = await q("scope=mine&q=dogw");
    expect(text.items.map((i: { title: string }) => i.title)).toEqual(["Dogwood groove"]);
    const byOwner = await q(`owner=me&tag=${tag}`);
    expect(byOwner.total).toBe(3);
    const everything = await q(`tag=${tag}`);
    expect(everything.items.some((i: { title: string }) => i.title.startsWith("Friend secret"))).toBe(false);
    const anon = await api("GET", `/api/grooves?tag=${tag}`);
    expect(anon.body.items.map((i: { title: string }) => i.title)).toEqual(["Friend public two"]);
  });

  it("sorts by title and by update time, and pages with a total", async () => {
    const page1 = (await api("GET", "/api/grooves?scope=mine&sort=title&dir=asc&pageSize=3&page=1", { cookie: mine })).body;
    const page3 = (await api("GET", "/api/grooves?scope=mine&sort=title&dir=asc&pageSize=3&page=3", { cookie: mine })).body;
    expect(page1.total).toBe(7);
    expect(page1.items.map((i: { title: string }) => i.title)).toEqual(["Alder groove", "Birch groove", "Cedar groove"]);
    expect(page3.items.map((i: { title: string }) => i.title)).toEqual(["Gum groove"]);
    const beyond = (await api("GET", "/api/grooves?scope=mine&pageSize=3&page=9", { cookie: mine })).body;
    expect(beyond.items).toEqual([]);
    expect(beyond.total).toBe(7);
    const recent = (await api("GET", "/api/grooves?scope=mine&sort=updated&dir=desc&pageSize=100", { cookie: mine })).body.items;
    const times = recent.map((i: { updatedAt: string }) => Date.parse(i.updatedAt));
    expect([...times].sort((a, b) => b - a)).toEqual(times);
    const bad = await api("GET", "/api/grooves?sort=colour&pageSize=1000", { cookie: mine });
    expect(bad.status).toBe(400);
    expect(Object.keys(errorOf(bad).fields ?? {}).sort()).toEqual(["pageSize", "sort"]);
  });
});

describe("list totals", () => {
  it("are remembered between pages but follow every write made through Tactus at once", async () => {
    const owner = await createUser({ label: "counter" });
    const cookie = await sessionFor(owner.id);
    const total = async () => (await api("GET", "/api/grooves?scope=mine&pageSize=1", { cookie })).body.total;
    await createGroove(owner.id, { title: "Counted one" });
    expect(await total()).toBe(1);
    const made = await api("POST", "/api/grooves", { cookie, body: { title: "Counted two" } });
    expect(made.status).toBe(201);
    expect(await total()).toBe(2);
    expect((await api("DELETE", `/api/grooves/${made.body.id}`, { cookie })).status).toBeLessThan(300);
    expect(await total()).toBe(1);
  });
});

describe("the list fast lane (lib/server/list-fast-lane.ts)", () => {
  // The lane answers only for anonymous visitors and remembered sessions; the first request of a session goes through
  // Astro (which validates and remembers it), the next through the lane. Astro streams its answer (chunked), the lane
  // sends a content-length: that tells the two apart here.
  it("answers exactly what the Astro route answers, and leaves errors and unknown sessions to the route", async () => {
    const owner = await createUser({ label: "lane" });
    await createGroove(owner.id, { title: "Lane one", tags: ["lane"] });
    await createGroove(owner.id, { title: "Lane two", visibility: "public" });
    const cookie = await sessionFor(owner.id);
    const path = "/api/grooves?scope=mine&sort=title&pageSize=5";
    const viaAstro = await api("GET", path, { cookie });
    const viaLane = await api("GET", path, { cookie });
    expect(viaAstro.headers.get("content-length")).toBeNull();
    expect(viaLane.headers.get("content-length")).toBe(String(Buffer.byteLength(viaLane.text)));
    expect(viaLane.status).toBe(200);
    expect(viaLane.text).toBe(viaAstro.text);
    expect(viaLane.body.items.map((i: { title: string }) => i.title)).toEqual(["Lane one", "Lane two"]);
    for (const h of ["content-type", "cache-control"]) expect(viaLane.headers.get(h)).toBe(viaAstro.headers.get(h));
    // A bad query with a remembered session: the route's 400 with fields.
    const bad = await api("GET", "/api/grooves?pageSize=0", { cookie });
    expect(bad.status).toBe(400);
    expect(Object.keys(errorOf(bad).fields ?? {})).toEqual(["pageSize"]);
    // An unknown session: the middleware clears the cookie and the list is the anonymous one.
    const stranger = await api("GET", path, { cookie: "x".repeat(27) });
    expect(stranger.status).toBe(200);
    expect(stranger.headers.getSetCookie().some((c) => /^tactus_session=;/.test(c) || /Max-Age=0/i.test(c))).toBe(true);
    // Anonymous: answered by the lane, public grooves only.
    const anon = await api("GET", `/api/grooves?owner=${owner.id}`);
    expect(anon.headers.get("content-length")).not.toBeNull();
    expect(anon.body.items.map((i: { title: string }) => i.title)).toEqual(["Lane two"]);
  });
});

describe("the save fast lane (lib/server/save-fast-lane.ts)", () => {
  // As for the list lane: a session's first request goes through Astro, later ones (remembered) through the lane,
  // which sends a content-length where Astro streams.
  it("saves, refuses and explains exactly as the route does", async () => {
    const owner = await createUser({ label: "saver" });
    const g = await createGroove(owner.id, { title: "Lane saves" });
    const cookie = await sessionFor(owner.id);
    const save = (base: string, document: unknown, headers: Record<string, string> = {}) =>
      api("POST", `/api/grooves/${g.grooveId}/versions`, { cookie, body: { baseVersionId: base, document, message: "lane" }, headers });
    const viaAstro = await save(g.latestVersionId, sampleDocument(5));
    expect(viaAstro.status).toBe(201);
    expect(viaAstro.headers.get("content-length")).toBeNull();
    const viaLane = await save(viaAstro.body.id, sampleDocument(6));
    expect(viaLane.status).toBe(201);
    expect(viaLane.headers.get("content-length")).toBe(String(Buffer.byteLength(viaLane.text)));
    expect(Object.keys(viaLane.body).sort()).toEqual(Object.keys(viaAstro.body).sort());
    expect([viaAstro.body.number, viaLane.body.number]).toEqual([3, 4]);
    expect(viaLane.body.parentVersionId).toBe(viaAstro.body.id);
    const stored = (await db().query("select document from groove_versions where id = $1", [viaLane.body.id])).rows[0].document;
    expect(viaLane.body.contentHash).toBe(contentHash(stored));
    expect(viaLane.headers.get("location")).toBe(`/api/grooves/${g.grooveId}/versions/${viaLane.body.id}`);
    for (const h of ["content-type", "cache-control"]) expect(viaLane.headers.get(h)).toBe(viaAstro.headers.get(h));
    // A stale base: 409 with the latest version; an invalid document: 400 with field paths; nothing written by either.
    const stale = await save(viaAstro.body.id, sampleDocument(7));
    expect(stale.status).toBe(409);
    expect(errorOf(stale).code).toBe("version_conflict");
    expect(stale.body.latest.id).toBe(viaLane.body.id);
    const invalid = await save(viaLane.body.id, { ...sampleDocument(7), bars: -1 });
    expect(invalid.status).toBe(400);
    expect(Object.keys(errorOf(invalid).fields ?? {})).toEqual(["document.bars"]);
    // Cross-site: declined by the lane, refused by the middleware.
    const crossSite = await save(viaLane.body.id, sampleDocument(7), { origin: "http://evil.example" });
    expect(crossSite.status).toBe(403);
    expect(errorOf(crossSite).code).toBe("cross_origin");
    const chain = (await db().query("select number from groove_versions where groove_id = $1 order by number", [g.grooveId])).rows.map((r) => r.number);
    expect(chain).toEqual([1, 2, 3, 4]);
  });
});

describe("soft delete and restore", () => {
  it("moves a groove to the trash, hides it, and restores it within 30 days", async () => {
    const g = await createGroove(owner.id, { title: `Trash me ${uid(5)}` });
    expect((await api("DELETE", `/api/grooves/${g.grooveId}`, { cookie })).status).toBe(204);
    expect((await api("GET", `/api/grooves/${g.grooveId}`, { cookie })).status).toBe(404);
    const trash = await api("GET", "/api/grooves?scope=trash&pageSize=100", { cookie });
    expect(trash.body.items.map((i: { id: string }) => i.id)).toContain(g.grooveId);
    const detail = await api("GET", `/api/grooves/${g.grooveId}?deleted=1`, { cookie });
    expect(detail.status).toBe(200);
    expect(Date.parse(detail.body.restorableUntil) - Date.parse(detail.body.deletedAt)).toBe(30 * 24 * 3600_000);
    const restored = await api("POST", `/api/grooves/${g.grooveId}/restore`, { cookie });
    expect(restored.status).toBe(200);
    expect(restored.body.deletedAt).toBeNull();
    expect((await api("GET", `/api/grooves/${g.grooveId}`, { cookie })).status).toBe(200);
    // Versions survived the round trip.
    expect((await api("GET", `/api/grooves/${g.grooveId}/versions`, { cookie })).body.items).toHaveLength(2);
  });

  it("cannot restore after 30 days, and purges such grooves", async () => {
    const g = await createGroove(owner.id, { deletedAt: new Date(Date.now() - 31 * 24 * 3600_000) });
    const r = await api("POST", `/api/grooves/${g.grooveId}/restore`, { cookie });
    expect(r.status).toBe(404);
    errorOf(r);
    // Showing the trash purges it for good (with its versions); a groove in its 30 days stays.
    const recent = await createGroove(owner.id, { deletedAt: new Date(Date.now() - 29 * 24 * 3600_000) });
    const trash = await api("GET", "/api/grooves?scope=trash&pageSize=100", { cookie });
    expect(trash.body.items.map((i: { id: string }) => i.id)).toContain(recent.grooveId);
    expect(trash.body.items.map((i: { id: string }) => i.id)).not.toContain(g.grooveId);
    expect((await db().query("select count(*)::int as n from grooves where id = $1", [g.grooveId])).rows[0].n).toBe(0);
    expect((await db().query("select count(*)::int as n from groove_versions where groove_id = $1", [g.grooveId])).rows[0].n).toBe(0);
    expect((await db().query("select count(*)::int as n from grooves where id = $1", [recent.grooveId])).rows[0].n).toBe(1);
  });
});

describe("fork", () => {
  it("copies the latest version into a new private groove owned by the forker", async () => {
    const g = await createGroove(owner.id, { visibility: "public", title: "Ferry crossing" });
    const forker = await createUser({ label: "forker" });
    const r = await api("POST", `/api/grooves/${g.grooveId}/fork`, { cookie: await sessionFor(forker.id), body: {} });
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({ title: "Ferry crossing (fork)", visibility: "private", role: "owner", forkedFromId: g.grooveId });
    expect(r.body.owner.id).toBe(forker.id);
    const [src, copy] = await Promise.all([
      db().query("select content_hash from groove_versions where id = $1", [g.latestVersionId]),
      db().query("select content_hash, number from groove_versions where id = $1", [r.body.latestVersion.id]),
    ]);
    expect(copy.rows[0].content_hash).toBe(src.rows[0].content_hash);
    expect(copy.rows[0].number).toBe(1);
  });
});

describe("versions", () => {
  it("appends versions with author, message, parent and hash, and refuses to change a saved row", async () => {
    const g = await createGroove(owner.id);
    const doc = sampleDocument(7);
    const r = await api("POST", `/api/grooves/${g.grooveId}/versions`, { cookie, body: { baseVersionId: g.latestVersionId, document: doc, message: "Kick on the 'a' of 2" } });
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({ number: 3, parentVersionId: g.latestVersionId, message: "Kick on the 'a' of 2", author: { id: owner.id } });
    expect(r.body.contentHash).toBe(contentHash(r.body.document));
    const list = await api("GET", `/api/grooves/${g.grooveId}/versions`, { cookie });
    expect(list.body.items.map((v: { number: number }) => v.number)).toEqual([3, 2, 1]);
    await expect(db().query("update groove_versions set message = 'rewritten' where id = $1", [r.body.id])).rejects.toThrow(/append-only/);
    const audit = await db().query("select action, details from audit_events where version_id = $1", [r.body.id]);
    expect(audit.rows).toEqual([{ action: "version.saved", details: { number: 3, contentHash: r.body.contentHash } }]);
  });

  it("restores an old version as a new one (history is kept)", async () => {
    const g = await createGroove(owner.id);
    const r = await api("POST", `/api/grooves/${g.grooveId}/versions/${g.firstVersionId}/restore`, { cookie, body: { baseVersionId: g.latestVersionId } });
    expect(r.status).toBe(201);
    expect(r.body.number).toBe(3);
    expect(r.body.message).toBe("Restored version 1");
    const first = (await db().query("select content_hash from groove_versions where id = $1", [g.firstVersionId])).rows[0];
    expect(r.body.contentHash).toBe(first.content_hash);
    const stale = await api("POST", `/api/grooves/${g.grooveId}/versions/${g.firstVersionId}/restore`, { cookie, body: { baseVersionId: g.latestVersionId } });
    expect(stale.status).toBe(409);
    expect(stale.body.latest.id).toBe(r.body.id);
  });

  it("answers 409 with the latest version (and its document) when the base is stale", async () => {
    const g = await createGroove(owner.id);
    const r = await api("POST", `/api/grooves/${g.grooveId}/versions`, { cookie, body: { baseVersionId: g.firstVersionId, document: sampleDocument(9), message: "late" } });
    expect(r.status).toBe(409);
    expect(errorOf(r).code).toBe("version_conflict");
    expect(r.body.latest.id).toBe(g.latestVersionId);
    expect(r.body.latest.number).toBe(2);
    expect(contentHash(r.body.latest.document)).toBe(r.body.latest.contentHash);
  });

  it("refuses invalid documents with 400 and field paths, writing nothing", async () => {
    const g = await createGroove(owner.id);
    const doc = sampleDocument(1);
    const bad = { ...doc, kit: { lanes: [{ piece: "snare", hits: [{ at: "5/4" }, { at: "1/5" }] }] }, keys: { notes: [{ at: "0", duration: "1/4", pitch: 200 }] } };
    const r = await api("POST", `/api/grooves/${g.grooveId}/versions`, { cookie, body: { baseVersionId: g.latestVersionId, document: bad } });
    expect(r.status).toBe(400);
    const fields = errorOf(r).fields!;
    expect(Object.keys(fields)).toEqual(expect.arrayContaining(["document.keys.notes.0.pitch"]));
    const after = await db().query("select count(*)::int as n from groove_versions where groove_id = $1", [g.grooveId]);
    expect(after.rows[0].n).toBe(2);
    const outside = { ...doc, kit: { lanes: [{ piece: "snare", hits: [{ at: "5/4" }] }] } };
    const r2 = await api("POST", `/api/grooves/${g.grooveId}/versions`, { cookie, body: { baseVersionId: g.latestVersionId, document: outside } });
    expect(r2.status).toBe(400);
    expect(Object.keys(errorOf(r2).fields!)).toEqual(["document.kit.lanes.0.hits.0.at"]);
  });

  it("refuses documents over 2 MB with 413, and accepts one just under", async () => {
    const g = await createGroove(owner.id);
    const big = { baseVersionId: g.latestVersionId, document: sampleDocument(0), message: "x".repeat(10), padding: "y".repeat(2 * 1024 * 1024) };
    const r = await api("POST", `/api/grooves/${g.grooveId}/versions`, { cookie, body: big });
    expect(r.status).toBe(413);
    expect(errorOf(r).code).toBe("payload_too_large");
    // A large but valid document (many bars of sixteenths on the hi-hat) under the limit is saved.
    const doc = sampleDocument(0);
    const bars = 400;
    const hats = Array.from({ length: bars * 16 }, (_, i) => ({ at: `${i}/16`, dynamic: "normal" as const }));
    const large = { ...doc, bars, kit: { lanes: doc.kit.lanes.map((l) => (l.piece === "hihat-closed" ? { ...l, hits: hats } : l)) } };
    const size = JSON.stringify({ baseVersionId: g.latestVersionId, document: large }).length;
    expect(size).toBeGreaterThan(100_000);
    expect(size).toBeLessThan(2 * 1024 * 1024);
    const ok = await api("POST", `/api/grooves/${g.grooveId}/versions`, { cookie, body: { baseVersionId: g.latestVersionId, document: large } });
    expect(ok.status).toBe(201);
  });
});

describe("optimistic concurrency", () => {
  it("50 concurrent saves on one base: exactly 1 succeeds, 49 get 409 with the winner, the chain has no gap or duplicate", async () => {
    const g = await createGroove(owner.id);
    const replies = await Promise.all(
      Array.from({ length: 50 }, (_, i) =>
        api("POST", `/api/grooves/${g.grooveId}/versions`, { cookie, body: { baseVersionId: g.latestVersionId, document: sampleDocument(i), message: `racer ${i}` } }),
      ),
    );
    const statuses = replies.map((r) => r.status);
    expect(statuses.filter((s) => s === 201)).toHaveLength(1);
    expect(statuses.filter((s) => s === 409)).toHaveLength(49);
    const winner = replies.find((r) => r.status === 201)!.body;
    for (const r of replies.filter((x) => x.status === 409)) {
      expect(errorOf(r).code).toBe("version_conflict");
      expect(r.body.latest.id).toBe(winner.id);
    }
    const chain = (await db().query("select id, number, parent_version_id from groove_versions where groove_id = $1 order by number", [g.grooveId])).rows;
    expect(chain.map((v) => v.number)).toEqual([1, 2, 3]);
    expect(chain[2].id).toBe(winner.id);
    expect(chain[2].parent_version_id).toBe(chain[1].id);
    expect(chain[1].parent_version_id).toBe(chain[0].id);
    const latest = (await db().query("select latest_version_id from grooves where id = $1", [g.grooveId])).rows[0];
    expect(latest.latest_version_id).toBe(winner.id);
  });

  it("50 saves that each build on the previous one, sent as fast as answers come, form an unbroken chain", async () => {
    const g = await createGroove(owner.id);
    let base = g.latestVersionId;
    for (let i = 0; i < 50; i++) {
      const r = await api("POST", `/api/grooves/${g.grooveId}/versions`, { cookie, body: { baseVersionId: base, document: sampleDocument(i), message: `step ${i}` } });
      expect(r.status).toBe(201);
      base = r.body.id;
    }
    const chain = (await db().query("select id, number, parent_version_id from groove_versions where groove_id = $1 order by number", [g.grooveId])).rows;
    expect(chain.map((v) => v.number)).toEqual(Array.from({ length: 52 }, (_, i) => i + 1));
    for (let i = 1; i < chain.length; i++) expect(chain[i].parent_version_id).toBe(chain[i - 1].id);
  });
});

describe("invitations and collaborator roles", () => {
  it("invites by e-mail; the invitee accepts with the link and gets the role; the owner changes and revokes it", async () => {
    const g = await createGroove(owner.id, { title: "Lantern waltz" });
    const invitee = await createUser({ label: "invitee" });
    const inviteeCookie = await sessionFor(invitee.id);
    const inv = await api("POST", `/api/grooves/${g.grooveId}/invitations`, { cookie, body: { email: invitee.email.toUpperCase(), role: "editor" } });
    expect(inv.status).toBe(201);
    expect(inv.body).toMatchObject({ email: invitee.email, role: "editor" });
    const token = await tokenFromMail(invitee.email, /invited you to the groove "Lantern waltz"/);
    // Someone else cannot use the link.
    const stranger = await sessionFor((await createUser()).id);
    const wrong = await api("POST", "/api/grooves/invitations/accept", { cookie: stranger, body: { token } });
    expect(wrong.status).toBe(403);
    expect(errorOf(wrong).code).toBe("wrong_account");
    expect((await api("GET", `/api/grooves/${g.grooveId}`, { cookie: inviteeCookie })).status).toBe(404);
    const ok = await api("POST", "/api/grooves/invitations/accept", { cookie: inviteeCookie, body: { token } });
    expect(ok.status).toBe(200);
    expect(ok.body).toEqual({ grooveId: g.grooveId, role: "editor" });
    const save = await api("POST", `/api/grooves/${g.grooveId}/versions`, { cookie: inviteeCookie, body: { baseVersionId: g.latestVersionId, document: sampleDocument(4), message: "from the invitee" } });
    expect(save.status).toBe(201);
    expect((await api("POST", "/api/grooves/invitations/accept", { cookie: inviteeCookie, body: { token } })).status).toBe(400);

    expect((await api("PATCH", `/api/grooves/${g.grooveId}/collaborators/${invitee.id}`, { cookie, body: { role: "viewer" } })).status).toBe(204);
    const denied = await api("POST", `/api/grooves/${g.grooveId}/versions`, { cookie: inviteeCookie, body: { baseVersionId: save.body.id, document: sampleDocument(5) } });
    expect(denied.status).toBe(403);
    const people = await api("GET", `/api/grooves/${g.grooveId}/collaborators`, { cookie });
    expect(people.body.people.map((p: { userId: string; role: string }) => [p.userId, p.role])).toEqual([
      [owner.id, "owner"],
      [invitee.id, "viewer"],
    ]);
    expect((await api("DELETE", `/api/grooves/${g.grooveId}/collaborators/${invitee.id}`, { cookie })).status).toBe(204);
    expect((await api("GET", `/api/grooves/${g.grooveId}`, { cookie: inviteeCookie })).status).toBe(404);
    const audit = await db().query("select action from audit_events where groove_id = $1 order by id", [g.grooveId]);
    expect(audit.rows.map((r) => r.action)).toEqual(["collaborator.invited", "collaborator.joined", "version.saved", "collaborator.role_changed", "collaborator.removed"]);
  });

  it("a revoked invitation no longer works, and pending ones are listed for the owner only", async () => {
    const g = await createGroove(owner.id);
    const email = `late-${uid(6).toLowerCase()}@lamplight-ferry.test`;
    const inv = await api("POST", `/api/grooves/${g.grooveId}/invitations`, { cookie, body: { email, role: "viewer" } });
    const listed = await api("GET", `/api/grooves/${g.grooveId}/collaborators`, { cookie });
    expect(listed.body.invitations.map((i: { id: string }) => i.id)).toEqual([inv.body.id]);
    const token = await tokenFromMail(email, /invited you/);
    expect((await api("DELETE", `/api/grooves/${g.grooveId}/invitations/${inv.body.id}`, { cookie })).status).toBe(204);
    const late = await createUser();
    await db().query("update users set email = $1 where id = $2", [email, late.id]);
    const r = await api("POST", "/api/grooves/invitations/accept", { cookie: await sessionFor(late.id), body: { token } });
    expect(r.status).toBe(400);
    expect(errorOf(r).code).toBe("invalid_token");
  });
});
