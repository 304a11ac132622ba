// Bad input, generated with fast-check, for every write route of the account and library API (and the ids and query
// strings of the read routes): the server never answers 5xx, always a 4xx in the one error shape
// { error: { code, message, fields? } }, and writes nothing (row counts of every table are unchanged).
// Bodies: any JSON value; text that is not JSON; a valid body with one field given a value of the wrong type;
// bodies over the size limit (512 KB, or 2 MB for routes that carry a groove document).
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { api, closeDb, createGroove, createInvitation, createUser, errorOf, sampleDocument, sessionFor, tableCounts, type GrooveFixture, type TestUser } from "./helpers";

type FieldType = "string" | "boolean" | "stringArray" | "document";

interface WriteRoute {
  method: "POST" | "PATCH";
  path: () => string;
  /** Who sends it: the groove's owner, an admin, or nobody. */
  as: "owner" | "admin" | "anonymous";
  /** A body that would succeed; each property run breaks it. */
  valid: () => Record<string, unknown>;
  fields: Record<string, FieldType>;
  limit: number;
}

const KB = 1024;
let owner: TestUser;
let admin: TestUser;
let target: TestUser;
let cookies: Record<"owner" | "admin", string>;
let g: GrooveFixture;
let invitee: TestUser;

const ROUTES: Record<string, WriteRoute> = {};
function route(name: string, r: WriteRoute) {
  ROUTES[name] = r;
}

route("POST /api/auth/sign-up", {
  method: "POST",
  path: () => "/api/auth/sign-up",
  as: "anonymous",
  valid: () => ({ email: "fuzz-signup@lamplight-ferry.test", password: "a ferry at the pier", displayName: "Fuzz" }),
  fields: { email: "string", password: "string", displayName: "string" },
  limit: 512 * KB,
});
route("POST /api/auth/sign-in", {
  method: "POST",
  path: () => "/api/auth/sign-in",
  as: "anonymous",
  valid: () => ({ email: owner.email, password: "harbour lights at low tide" }),
  fields: { email: "string", password: "string" },
  limit: 512 * KB,
});
route("POST /api/auth/verify-email", { method: "POST", path: () => "/api/auth/verify-email", as: "anonymous", valid: () => ({ token: "x".repeat(27) }), fields: { token: "string" }, limit: 512 * KB });
route("POST /api/auth/reset-request", { method: "POST", path: () => "/api/auth/reset-request", as: "anonymous", valid: () => ({ email: owner.email }), fields: { email: "string" }, limit: 512 * KB });
route("POST /api/auth/reset-password", {
  method: "POST",
  path: () => "/api/auth/reset-password",
  as: "anonymous",
  valid: () => ({ token: "x".repeat(27), password: "a new ferry timetable" }),
  fields: { token: "string", password: "string" },
  limit: 512 * KB,
});
route("POST /api/grooves", {
  method: "POST",
  path: () => "/api/grooves",
  as: "owner",
  valid: () => ({ title: "Fuzz", description: "", tags: ["a"], visibility: "private", document: sampleDocument(1), message: "m" }),
  fields: { title: "string", description: "string", tags: "stringArray", visibility: "string", document: "document", message: "string" },
  limit: 2048 * KB,
});
route("PATCH /api/grooves/[id]", {
  method: "PATCH",
  path: () => `/api/grooves/${g.grooveId}`,
  as: "owner",
  valid: () => ({ title: "Fuzz", description: "d", tags: ["a"], visibility: "link" }),
  fields: { title: "string", description: "string", tags: "stringArray", visibility: "string" },
  limit: 512 * KB,
});
route("POST /api/grooves/[id]/fork", {
  method: "POST",
  path: () => `/api/grooves/${g.grooveId}/fork`,
  as: "owner",
  valid: () => ({ title: "Forked", versionId: g.firstVersionId }),
  fields: { title: "string", versionId: "string" },
  limit: 512 * KB,
});
route("POST /api/grooves/[id]/versions", {
  method: "POST",
  path: () => `/api/grooves/${g.grooveId}/versions`,
  as: "owner",
  valid: () => ({ baseVersionId: g.latestVersionId, document: sampleDocument(2), message: "m" }),
  fields: { baseVersionId: "string", document: "document", message: "string" },
  limit: 2048 * KB,
});
route("POST /api/grooves/[id]/versions/[versionId]/restore", {
  method: "POST",
  path: () => `/api/grooves/${g.grooveId}/versions/${g.firstVersionId}/restore`,
  as: "owner",
  valid: () => ({ baseVersionId: g.latestVersionId, message: "m" }),
  fields: { baseVersionId: "string", message: "string" },
  limit: 512 * KB,
});
route("PATCH /api/grooves/[id]/collaborators/[userId]", {
  method: "PATCH",
  path: () => `/api/grooves/${g.grooveId}/collaborators/${invitee.id}`,
  as: "owner",
  valid: () => ({ role: "editor" }),
  fields: { role: "string" },
  limit: 512 * KB,
});
route("POST /api/grooves/[id]/invitations", {
  method: "POST",
  path: () => `/api/grooves/${g.grooveId}/invitations`,
  as: "owner",
  valid: () => ({ email: "fuzz-invite@lamplight-ferry.test", role: "viewer" }),
  fields: { email: "string", role: "string" },
  limit: 512 * KB,
});
route("POST /api/grooves/invitations/accept", { method: "POST", path: () => "/api/grooves/invitations/accept", as: "owner", valid: () => ({ token: "x".repeat(27) }), fields: { token: "string" }, limit: 512 * KB });
route("PATCH /api/admin/users/[id]", {
  method: "PATCH",
  path: () => `/api/admin/users/${target.id}`,
  as: "admin",
  valid: () => ({ siteRole: "member", disabled: true }),
  fields: { siteRole: "string", disabled: "boolean" },
  limit: 512 * KB,
});

/** A JSON value that is NOT of the given type (so a body holding it can never be valid). */
function wrongValue(type: FieldType): fc.Arbitrary<unknown> {
  const scalars = [fc.integer(), fc.double({ noNaN: true, noDefaultInfinity: true }), fc.constant(null)];
  switch (type) {
    case "string":
      return fc.oneof(...scalars, fc.boolean(), fc.array(fc.string(), { minLength: 1, maxLength: 3 }), fc.dictionary(fc.string(), fc.string(), { minKeys: 1, maxKeys: 3 }));
    case "boolean":
      return fc.oneof(...scalars, fc.string(), fc.array(fc.boolean(), { minLength: 1, maxLength: 3 }), fc.dictionary(fc.string(), fc.boolean(), { minKeys: 1, maxKeys: 3 }));
    case "stringArray":
      return fc.oneof(...scalars, fc.string(), fc.boolean(), fc.array(fc.oneof(fc.integer(), fc.constant(null), fc.constant("")), { minLength: 1, maxLength: 3 }));
    case "document":
      // Any JSON that is not a groove document: scalars, arrays, and objects with the wrong shape.
      return fc.oneof(...scalars, fc.string(), fc.boolean(), fc.array(fc.jsonValue(), { maxLength: 3 }), fc.dictionary(fc.string(), fc.jsonValue(), { maxKeys: 4 }), fc.record({ schemaVersion: fc.integer() }));
  }
}

/** Bodies that must be refused: raw text to send with content-type application/json. */
function badBody(r: WriteRoute): fc.Arbitrary<string> {
  const anyJson = fc.jsonValue().filter((v) => !(typeof v === "object" && v !== null && !Array.isArray(v) && Object.keys(v).length === 0));
  const notJson = fc.string({ minLength: 1 }).filter((s) => {
    try {
      JSON.parse(s);
      return false;
    } catch {
      return true;
    }
  });
  const oneWrongField = fc.constantFrom(...Object.keys(r.fields)).chain((field) =>
    wrongValue(r.fields[field]!).map((value) => JSON.stringify({ ...r.valid(), [field]: value })),
  );
  return fc.oneof(anyJson.map((v) => JSON.stringify(v)), notJson, oneWrongField);
}

beforeAll(async () => {
  owner = await createUser({ label: "fuzzowner" });
  admin = await createUser({ label: "fuzzadmin", siteRole: "admin" });
  target = await createUser({ label: "fuzztarget" });
  invitee = await createUser({ label: "fuzzinvitee" });
  g = await createGroove(owner.id, { viewers: [invitee.id] });
  await createInvitation(g.grooveId, owner.id, "pending-fuzz@lamplight-ferry.test");
  cookies = { owner: await sessionFor(owner.id), admin: await sessionFor(admin.id) };
});
afterAll(closeDb);

const cookieFor = (r: WriteRoute) => (r.as === "anonymous" ? null : cookies[r.as]);

function expectRefusal(status: number, reply: Awaited<ReturnType<typeof api>>, what: string) {
  expect(status, `${what}: ${reply.text.slice(0, 200)}`).toBeGreaterThanOrEqual(400);
  expect(status, `${what}: ${reply.text.slice(0, 200)}`).toBeLessThan(500);
  errorOf(reply);
}

describe("malformed and oversized bodies on every write route", () => {
  for (const [name, r] of Object.entries(ROUTES)) {
    it(`${name}: 4xx in the error shape, nothing written`, async () => {
      const before = await tableCounts();
      await fc.assert(
        fc.asyncProperty(badBody(r), async (raw) => {
          const reply = await api(r.method, r.path(), { cookie: cookieFor(r), raw, headers: { "content-type": "application/json" } });
          expectRefusal(reply.status, reply, `${name} with ${raw.slice(0, 120)}`);
        }),
        { numRuns: 40 },
      );
      // Over the size limit: refused with 413 before any parsing.
      const padding = "z".repeat(r.limit + 1);
      const big = await api(r.method, r.path(), { cookie: cookieFor(r), raw: JSON.stringify({ ...r.valid(), padding }), headers: { "content-type": "application/json" } });
      expect(big.status, `${name} oversized`).toBe(413);
      errorOf(big);
      // Not JSON at all.
      const xml = await api(r.method, r.path(), { cookie: cookieFor(r), raw: "<groove/>", headers: { "content-type": "application/xml" } });
      expectRefusal(xml.status, xml, `${name} as XML`);
      expect(await tableCounts()).toEqual(before);
    });
  }
});

describe("fuzzed ids and query strings on read and body-less routes", () => {
  const idChars = fc.string({ minLength: 1, maxLength: 80 });
  it("any groove id, version id or user id gives a 4xx in the error shape (never 5xx)", async () => {
    const before = await tableCounts();
    await fc.assert(
      fc.asyncProperty(idChars, fc.constantFrom("GET g", "GET v", "DELETE g", "POST restore", "DELETE collab", "DELETE inv", "PATCH admin"), async (raw, which) => {
        const id = encodeURIComponent(raw);
        const [method, kind] = which.split(" ") as [string, string];
        const path = {
          g: `/api/grooves/${id}`,
          v: `/api/grooves/${g.grooveId}/versions/${id}`,
          restore: `/api/grooves/${id}/restore`,
          collab: `/api/grooves/${g.grooveId}/collaborators/${id}`,
          inv: `/api/grooves/${g.grooveId}/invitations/${id}`,
          admin: `/api/admin/users/${id}`,
        }[kind]!;
        const reply = await api(method, path, { cookie: kind === "admin" ? cookies.admin : cookies.owner, body: kind === "admin" ? { disabled: false } : undefined });
        expect(reply.status, `${method} ${path}: ${reply.text.slice(0, 200)}`).toBeLessThan(500);
        if (reply.status >= 400 && reply.headers.get("content-type")?.includes("json")) errorOf(reply);
        // Only the ids that exist may succeed (none of the generated ones do, except by astronomically unlikely chance).
        expect([200, 204]).not.toContain(reply.status);
      }),
      { numRuns: 120 },
    );
    expect(await tableCounts()).toEqual(before);
  });

  it("any query string on the list routes gives 200 or a 400 in the error shape", async () => {
    const param = fc.constantFrom("scope", "q", "tag", "owner", "sort", "dir", "page", "pageSize", "role", "status", "limit", "before");
    await fc.assert(
      fc.asyncProperty(fc.array(fc.tuple(param, fc.string({ maxLength: 300 })), { maxLength: 5 }), fc.constantFrom("/api/grooves", "/api/admin/users", `/api/grooves/${g.grooveId}/versions`), async (pairs, path) => {
        const qs = new URLSearchParams(pairs).toString();
        const reply = await api("GET", `${path}?${qs}`, { cookie: path.includes("admin") ? cookies.admin : cookies.owner });
        expect([200, 400], `${path}?${qs}: ${reply.text.slice(0, 200)}`).toContain(reply.status);
        if (reply.status === 400) expect(errorOf(reply).code).toBe("invalid_query");
      }),
      { numRuns: 150 },
    );
  });
});
