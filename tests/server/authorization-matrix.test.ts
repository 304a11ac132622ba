// The authorisation matrix: every API route × { anonymous, viewer, editor, owner, other member, admin }, every cell
// asserted against the built server. The groove under test is PRIVATE (one row checks a public groove too).
// Rules under test (src/lib/server/roles.ts): a groove someone may not read answers 404; readable but not allowed
// answers 403; write routes answer 401 to anonymous visitors. Each cell gets a fresh groove and a fresh session, so
// no cell depends on another. A final check proves the table covers every route file under src/pages/api.
import { readdirSync, statSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  BASE,
  PASSWORD,
  api,
  closeDb,
  createGroove,
  createInvitation,
  createUser,
  errorOf,
  sampleDocument,
  sessionFor,
  uid,
  type GrooveFixture,
  type TestUser,
} from "./helpers";
import { exportMidi } from "../../src/lib/exchange/midi-export";

const ACTORS = ["anonymous", "viewer", "editor", "owner", "member", "admin"] as const;
type ActorName = (typeof ACTORS)[number];

interface World {
  users: Record<Exclude<ActorName, "anonymous">, TestUser>;
}

interface Cell {
  fixture: GrooveFixture;
  world: World;
  /** A user the admin routes may act on. */
  target: TestUser;
  invitationId: string;
}

interface Row {
  route: string; // "METHOD /api/path/[param]" as in the route files
  label?: string;
  path: (c: Cell) => string;
  body?: (c: Cell) => unknown;
  /** A raw (non-JSON) body and its content type, e.g. an uploaded file. */
  raw?: () => { bytes: Uint8Array; type: string };
  /** Arrange more before the request (e.g. delete the groove for the restore row). */
  arrange?: (c: Cell) => Promise<void>;
  groove?: { visibility?: "private" | "link" | "public"; deleted?: boolean };
  expect: Record<ActorName, number>;
}

const all = (status: number): Record<ActorName, number> => Object.fromEntries(ACTORS.map((a) => [a, status])) as Record<ActorName, number>;
const signedIn = (status: number, anonymous = 401) => ({ ...all(status), anonymous });

const g = (c: Cell) => `/api/grooves/${c.fixture.grooveId}`;

const ROWS: Row[] = [
  { route: "GET /api/health", path: () => "/api/health", expect: all(200) },
  { route: "GET /api/dev/mailbox", path: () => "/api/dev/mailbox?limit=1", expect: all(200) },
  { route: "GET /api/auth/me", path: () => "/api/auth/me", expect: signedIn(200) },
  { route: "POST /api/auth/sign-out", path: () => "/api/auth/sign-out", expect: all(204) },
  {
    route: "POST /api/auth/sign-up",
    path: () => "/api/auth/sign-up",
    body: () => ({ email: `matrix-${uid(8).toLowerCase()}@lamplight-ferry.test`, password: "a ferry at the pier", displayName: "New person" }),
    expect: all(201),
  },
  {
    route: "POST /api/auth/sign-in",
    path: () => "/api/auth/sign-in",
    body: (c) => ({ email: c.target.email, password: PASSWORD }),
    expect: all(200),
  },
  { route: "POST /api/auth/resend-verification", path: () => "/api/auth/resend-verification", expect: signedIn(409) },
  { route: "POST /api/auth/verify-email", path: () => "/api/auth/verify-email", body: () => ({ token: uid(27) }), expect: all(400) },
  { route: "POST /api/auth/reset-request", path: () => "/api/auth/reset-request", body: () => ({ email: `nobody-${uid(6).toLowerCase()}@lamplight-ferry.test` }), expect: all(202) },
  {
    route: "POST /api/auth/reset-password",
    path: () => "/api/auth/reset-password",
    body: () => ({ token: uid(27), password: "a new ferry timetable" }),
    expect: all(400),
  },
  { route: "GET /api/grooves", path: () => "/api/grooves?scope=all", expect: all(200) },
  { route: "POST /api/grooves", path: () => "/api/grooves", body: () => ({ title: "Matrix groove" }), expect: signedIn(201) },
  {
    route: "GET /api/grooves/[id]",
    path: g,
    expect: { anonymous: 404, viewer: 200, editor: 200, owner: 200, member: 404, admin: 200 },
  },
  {
    route: "GET /api/grooves/[id]",
    label: "public groove",
    groove: { visibility: "public" },
    path: g,
    expect: all(200),
  },
  {
    route: "PATCH /api/grooves/[id]",
    label: "title",
    path: g,
    body: () => ({ title: "Renamed" }),
    expect: { anonymous: 401, viewer: 403, editor: 200, owner: 200, member: 404, admin: 403 },
  },
  {
    route: "PATCH /api/grooves/[id]",
    label: "visibility",
    path: g,
    body: () => ({ visibility: "public" }),
    expect: { anonymous: 401, viewer: 403, editor: 403, owner: 200, member: 404, admin: 403 },
  },
  {
    route: "DELETE /api/grooves/[id]",
    path: g,
    expect: { anonymous: 401, viewer: 403, editor: 403, owner: 204, member: 404, admin: 204 },
  },
  {
    route: "POST /api/grooves/[id]/restore",
    groove: { deleted: true },
    path: (c) => `${g(c)}/restore`,
    expect: { anonymous: 401, viewer: 404, editor: 404, owner: 200, member: 404, admin: 200 },
  },
  {
    route: "POST /api/grooves/[id]/fork",
    path: (c) => `${g(c)}/fork`,
    body: () => ({}),
    expect: { anonymous: 401, viewer: 201, editor: 201, owner: 201, member: 404, admin: 201 },
  },
  {
    route: "GET /api/grooves/[id]/versions",
    path: (c) => `${g(c)}/versions`,
    expect: { anonymous: 404, viewer: 200, editor: 200, owner: 200, member: 404, admin: 200 },
  },
  {
    route: "POST /api/grooves/[id]/versions",
    path: (c) => `${g(c)}/versions`,
    body: (c) => ({ baseVersionId: c.fixture.latestVersionId, document: sampleDocument(5), message: "matrix" }),
    expect: { anonymous: 401, viewer: 403, editor: 201, owner: 201, member: 404, admin: 403 },
  },
  {
    route: "GET /api/grooves/[id]/versions/[versionId]",
    path: (c) => `${g(c)}/versions/${c.fixture.firstVersionId}`,
    expect: { anonymous: 404, viewer: 200, editor: 200, owner: 200, member: 404, admin: 200 },
  },
  {
    route: "POST /api/grooves/[id]/versions/[versionId]/restore",
    path: (c) => `${g(c)}/versions/${c.fixture.firstVersionId}/restore`,
    body: (c) => ({ baseVersionId: c.fixture.latestVersionId }),
    expect: { anonymous: 401, viewer: 403, editor: 201, owner: 201, member: 404, admin: 403 },
  },
  {
    route: "GET /api/grooves/[id]/collaborators",
    path: (c) => `${g(c)}/collaborators`,
    expect: { anonymous: 401, viewer: 200, editor: 200, owner: 200, member: 404, admin: 200 },
  },
  {
    route: "PATCH /api/grooves/[id]/collaborators/[userId]",
    path: (c) => `${g(c)}/collaborators/${c.world.users.viewer.id}`,
    body: () => ({ role: "editor" }),
    expect: { anonymous: 401, viewer: 403, editor: 403, owner: 204, member: 404, admin: 403 },
  },
  {
    route: "DELETE /api/grooves/[id]/collaborators/[userId]",
    label: "remove the viewer (the viewer themself may leave)",
    path: (c) => `${g(c)}/collaborators/${c.world.users.viewer.id}`,
    expect: { anonymous: 401, viewer: 204, editor: 403, owner: 204, member: 404, admin: 403 },
  },
  {
    route: "POST /api/grooves/[id]/invitations",
    path: (c) => `${g(c)}/invitations`,
    body: () => ({ email: `invitee-${uid(6).toLowerCase()}@lamplight-ferry.test`, role: "viewer" }),
    expect: { anonymous: 401, viewer: 403, editor: 403, owner: 201, member: 404, admin: 403 },
  },
  {
    route: "DELETE /api/grooves/[id]/invitations/[invitationId]",
    path: (c) => `${g(c)}/invitations/${c.invitationId}`,
    expect: { anonymous: 401, viewer: 403, editor: 403, owner: 204, member: 404, admin: 403 },
  },
  {
    route: "POST /api/grooves/invitations/accept",
    label: "an unknown token",
    path: () => "/api/grooves/invitations/accept",
    body: () => ({ token: uid(27) }),
    expect: signedIn(400),
  },
  {
    route: "GET /api/grooves/[id]/export/[format]",
    label: "MIDI of version 1: read rights, as reading the version",
    path: (c) => `${g(c)}/export/mid?version=${c.fixture.firstVersionId}`,
    expect: { anonymous: 404, viewer: 200, editor: 200, owner: 200, member: 404, admin: 200 },
  },
  {
    route: "GET /api/grooves/[id]/export/[format]",
    label: "MusicXML of a public groove",
    groove: { visibility: "public" },
    path: (c) => `${g(c)}/export/musicxml`,
    expect: all(200),
  },
  {
    route: "POST /api/import/midi",
    label: "a preview; nothing is written",
    path: () => "/api/import/midi",
    raw: () => ({ bytes: exportMidi(sampleDocument(2)), type: "audio/midi" }),
    expect: signedIn(200),
  },
  {
    route: "GET /api/admin/users",
    path: () => "/api/admin/users",
    expect: { anonymous: 401, viewer: 403, editor: 403, owner: 403, member: 403, admin: 200 },
  },
  {
    route: "PATCH /api/admin/users/[id]",
    path: (c) => `/api/admin/users/${c.target.id}`,
    body: () => ({ disabled: true }),
    expect: { anonymous: 401, viewer: 403, editor: 403, owner: 403, member: 403, admin: 200 },
  },
];

let world: World;

/** Like `api`, for a body of bytes (an uploaded file). */
async function sendBytes(method: string, path: string, cookie: string | null, raw: { bytes: Uint8Array; type: string }) {
  const headers: Record<string, string> = { accept: "application/json", "content-type": raw.type, ...(cookie ? { cookie: `tactus_session=${cookie}` } : {}) };
  const res = await fetch(new URL(path, BASE()), { method, headers, body: new Uint8Array(raw.bytes), redirect: "manual" });
  const text = await res.text();
  let body: any = null;
  try {
    body = text ? JSON.parse(text) : null;
  } catch {
    body = null;
  }
  return { status: res.status, headers: res.headers, body, text };
}

beforeAll(async () => {
  world = {
    users: {
      viewer: await createUser({ label: "viewer" }),
      editor: await createUser({ label: "editor" }),
      owner: await createUser({ label: "owner" }),
      member: await createUser({ label: "member" }),
      admin: await createUser({ label: "admin", siteRole: "admin" }),
    },
  };
});
afterAll(closeDb);

describe("authorisation matrix", () => {
  for (const row of ROWS) {
    describe(`${row.route}${row.label ? ` (${row.label})` : ""}`, () => {
      for (const actor of ACTORS) {
        const expected = row.expect[actor];
        it(`${actor} → ${expected}`, async () => {
          const { users } = world;
          const fixture = await createGroove(users.owner.id, {
            visibility: row.groove?.visibility ?? "private",
            editors: [users.editor.id],
            viewers: [users.viewer.id],
            deletedAt: row.groove?.deleted ? new Date() : undefined,
          });
          const target = await createUser({ label: "target" });
          const { id: invitationId } = await createInvitation(fixture.grooveId, users.owner.id, `pending-${uid(6).toLowerCase()}@lamplight-ferry.test`);
          const cell: Cell = { fixture, world, target, invitationId };
          await row.arrange?.(cell);
          const cookie = actor === "anonymous" ? null : await sessionFor(users[actor].id);
          const [method, pattern] = row.route.split(" ");
          const raw = row.raw?.();
          const reply = raw ? await sendBytes(method!, row.path(cell), cookie, raw) : await api(method!, row.path(cell), { cookie, body: row.body?.(cell) });
          expect(reply.status, `${row.route} as ${actor}: ${reply.text.slice(0, 200)}`).toBe(expected);
          if (expected >= 400) errorOf(reply);
          void pattern;
        });
      }
    });
  }
});

describe("the matrix covers every API route", () => {
  it("has a row for every method exported by every file under src/pages/api", async () => {
    const root = fileURLToPath(new URL("../../src/pages/api", import.meta.url));
    const files: string[] = [];
    const walk = (dir: string) => {
      for (const name of readdirSync(dir)) {
        const p = path.join(dir, name);
        if (statSync(p).isDirectory()) walk(p);
        else if (/\.(ts|js)$/.test(name)) files.push(p);
      }
    };
    walk(root);
    const { readFileSync } = await import("node:fs");
    const routes: string[] = [];
    for (const file of files) {
      const source = readFileSync(file, "utf8");
      let url = "/api/" + path.relative(root, file).replace(/\\/g, "/").replace(/\.(ts|js)$/, "");
      url = url.replace(/\/index$/, "");
      for (const m of source.matchAll(/export const (GET|POST|PUT|PATCH|DELETE)\b/g)) routes.push(`${m[1]} ${url}`);
    }
    // Routes owned by other parts of the product are listed in their own test files; this matrix covers these folders.
    const mine = routes.filter((r) => /\/api\/(auth|grooves|admin|dev|health|import)\b/.test(r));
    const covered = new Set(ROWS.map((r) => r.route));
    const missing = mine.filter((r) => !covered.has(r));
    expect(missing, `routes without matrix rows: ${missing.join(", ")}`).toEqual([]);
    expect(mine.length).toBeGreaterThanOrEqual(25);
  });
});
