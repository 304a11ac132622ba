// Migrations and seed against the real PostgreSQL of `npm test`. Each check works in a scratch database made for
// it (created from the test cluster's maintenance database and dropped afterwards), so it starts from empty.
import { execFile } from "node:child_process";
import { readFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { promisify } from "node:util";
import { eq, sql } from "drizzle-orm";
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_GROOVES, UNDERTOW_PAIR } from "../../src/lib/demo/grooves";
import { DEMO_USERS } from "../../src/lib/demo/people";
import { assertGroove } from "../../src/lib/rhythm/document";
import { createDb, type Database } from "../../src/lib/server/db/index";
import { MIGRATIONS_FOLDER, runMigrations } from "../../src/lib/server/db/migrate";
import { auditEvents, grooveVersions, grooves, users } from "../../src/lib/server/db/schema";
import { requireEnv } from "../setup/env";

const run = promisify(execFile);
const root = fileURLToPath(new URL("../..", import.meta.url));

/** Creates an empty database next to the test database; returns its URL and a function that drops it. */
async function scratchDatabase(label: string): Promise<{ url: string; drop: () => Promise<void> }> {
  const base = new URL(requireEnv("DATABASE_URL"));
  const name = `tactus_scratch_${label}_${process.pid}_${Date.now() % 100000}`;
  const admin = new URL(base);
  admin.pathname = "/postgres";
  const client = new pg.Client({ connectionString: admin.href });
  await client.connect();
  await client.query(`CREATE DATABASE ${name}`);
  await client.end();
  const url = new URL(base);
  url.pathname = `/${name}`;
  return {
    url: url.href,
    drop: async () => {
      const c = new pg.Client({ connectionString: admin.href });
      await c.connect();
      await c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
      await c.end();
    },
  };
}

/** Every column of the public schema, as "table.column type nullability", sorted. */
async function columns(db: Database): Promise<string[]> {
  const result = await db.execute<{ c: string }>(sql`
    select table_name || '.' || column_name || ' ' || data_type || ' ' || is_nullable as c
    from information_schema.columns where table_schema = 'public' order by 1`);
  return result.rows.map((r) => r.c);
}

describe("migrations", () => {
  let scratch: Awaited<ReturnType<typeof scratchDatabase>>;
  let db: Database;

  beforeAll(async () => {
    scratch = await scratchDatabase("migrate");
    db = createDb(scratch.url, { max: 2 });
  });
  afterAll(async () => {
    await db?.$client.end();
    await scratch?.drop();
  });

  it("create every table the app needs, with the jsonb document column", async () => {
    await runMigrations(db);
    const tables = await db.execute<{ table_name: string }>(
      sql`select table_name from information_schema.tables where table_schema = 'public' order by 1`,
    );
    expect(tables.rows.map((r) => r.table_name)).toEqual(
      expect.arrayContaining(["audit_events", "groove_versions", "grooves", "sessions", "users"]),
    );
    const cols = await columns(db);
    expect(cols).toContain("groove_versions.document jsonb NO");
    expect(cols).toContain("sessions.expires_at timestamp with time zone NO");
    expect(cols).toContain("grooves.tags ARRAY NO");
  });

  it("are idempotent: a second run changes nothing and records each migration once", async () => {
    const before = await columns(db);
    await runMigrations(db);
    await runMigrations(db);
    expect(await columns(db)).toEqual(before);
    const journal = JSON.parse(readFileSync(path.join(MIGRATIONS_FOLDER, "meta", "_journal.json"), "utf8")) as { entries: unknown[] };
    const applied = await db.execute<{ n: string }>(sql`select count(*)::text as n from drizzle.__drizzle_migrations`);
    expect(Number(applied.rows[0]?.n)).toBe(journal.entries.length);
  });

  it("round-trip a groove document through groove_versions.document (jsonb) unchanged", async () => {
    const demo = DEMO_GROOVES.find((g) => g.id === UNDERTOW_PAIR[1])!;
    const document = assertGroove(demo.document);
    await db.insert(users).values({ id: "u1", email: "odile@example.test", displayName: "Odile", passwordHash: "x" });
    await db.insert(grooves).values({ id: "g1", ownerId: "u1", title: "Undertow", tags: ["a", "b"] });
    await db.insert(grooveVersions).values({ id: "v1", grooveId: "g1", number: 1, document, contentHash: "h", authorId: "u1" });
    const [row] = await db.select().from(grooveVersions).where(eq(grooveVersions.id, "v1"));
    expect(row?.document).toEqual(document);
    // Exact rationals stay strings, not floats.
    expect((row?.document as typeof document).kit.lanes.find((l) => l.piece === "kick")?.hits.map((h) => h.at)).toEqual(["0", "5/8", "1", "11/8"]);
    const [g] = await db.select().from(grooves).where(eq(grooves.id, "g1"));
    expect(g?.tags).toEqual(["a", "b"]);
    expect(g?.visibility).toBe("private");
  });

  it("enforce the constraints: one number per groove, lower-case e-mail, positive version numbers", async () => {
    await expect(
      db.insert(grooveVersions).values({ id: "v1b", grooveId: "g1", number: 1, document: {}, contentHash: "h" }),
    ).rejects.toThrow();
    await expect(db.insert(users).values({ id: "u2", email: "Mixed@Example.test", displayName: "M", passwordHash: "x" })).rejects.toThrow();
    await expect(db.insert(users).values({ id: "u3", email: "odile@example.test", displayName: "Again", passwordHash: "x" })).rejects.toThrow();
    await expect(
      db.insert(grooveVersions).values({ id: "v0", grooveId: "g1", number: 0, document: {}, contentHash: "h" }),
    ).rejects.toThrow();
  });

  it("keep audit_events append-only: inserts work, updates and deletes are refused", async () => {
    const [event] = await db.insert(auditEvents).values({ action: "groove.saved", grooveId: "g1", details: { n: 1 } }).returning();
    expect(event?.id).toBeGreaterThan(0);
    // Drizzle wraps the PostgreSQL error; the trigger's message is on `cause`.
    const refusal = (promise: Promise<unknown>) =>
      promise.then(
        () => "accepted",
        (e: Error & { cause?: Error }) => e.cause?.message ?? e.message,
      );
    expect(await refusal(db.update(auditEvents).set({ action: "changed" }).where(eq(auditEvents.id, event!.id)))).toMatch(/append-only: UPDATE/);
    expect(await refusal(db.delete(auditEvents).where(eq(auditEvents.id, event!.id)))).toMatch(/append-only: DELETE/);
    expect(await refusal(db.execute(sql`truncate audit_events`))).toMatch(/append-only: TRUNCATE/);
    const rows = await db.select().from(auditEvents);
    expect(rows.map((r) => r.action)).toEqual(["groove.saved"]);
  });

  it("cascade a user's deletion to sessions and grooves", async () => {
    await db.execute(sql`insert into sessions (id, user_id, expires_at) values ('s1', 'u1', now() + interval '1 day')`);
    await db.delete(users).where(eq(users.id, "u1"));
    const left = await db.execute<{ n: string }>(sql`select (select count(*) from sessions) + (select count(*) from grooves) as n`);
    expect(Number(left.rows[0]?.n)).toBe(0);
  });
});

describe("seed", () => {
  let scratch: Awaited<ReturnType<typeof scratchDatabase>>;
  let db: Database;
  const tsx = path.join(root, "node_modules", ".bin", "tsx");

  beforeAll(async () => {
    scratch = await scratchDatabase("seed");
    db = createDb(scratch.url, { max: 2 });
    await runMigrations(db);
  });
  afterAll(async () => {
    await db?.$client.end();
    await scratch?.drop();
  });

  it("adds the demo users and grooves once, each groove with version 1, and a second run adds nothing", async () => {
    const env = { ...process.env, DATABASE_URL: scratch.url };
    const first = await run(tsx, [path.join(root, "scripts", "seed.ts")], { env, cwd: root });
    expect(first.stdout).toContain(`${DEMO_USERS.length} new users, ${DEMO_GROOVES.length} new grooves`);
    const second = await run(tsx, [path.join(root, "scripts", "seed.ts")], { env, cwd: root });
    expect(second.stdout).toContain("0 new users, 0 new grooves");

    const seededUsers = await db.select().from(users);
    expect(seededUsers.map((u) => u.email).sort()).toEqual(DEMO_USERS.map((u) => u.email).sort());
    // argon2id with the parameters of the OWASP Password Storage Cheat Sheet (m=19456, t=2, p=1).
    for (const u of seededUsers) expect(u.passwordHash).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$/);

    const rows = await db.select().from(grooves);
    expect(rows).toHaveLength(DEMO_GROOVES.length);
    const versions = await db.select().from(grooveVersions);
    expect(versions).toHaveLength(DEMO_GROOVES.length);
    for (const demo of DEMO_GROOVES) {
      const groove = rows.find((r) => r.id === demo.id);
      expect(groove?.latestVersionId).toBe(demo.versionId);
      const version = versions.find((v) => v.id === demo.versionId);
      expect(version?.number).toBe(1);
      expect(version?.document).toEqual(assertGroove(demo.document));
      expect(version?.contentHash).toMatch(/^[0-9a-f]{64}$/);
    }
  });
});
