// Shared helpers for the account and library tests: an HTTP client for the BUILT server at TEST_BASE_URL, and
// direct access to its PostgreSQL database (DATABASE_URL) to arrange fixtures and to check what was written.
// Fixture users and sessions are inserted directly (fast, and the session layer has its own tests); every
// behaviour under test goes through HTTP.
import { createHash, randomBytes } from "node:crypto";
import canonicalize from "canonicalize";
import pg from "pg";
import { emptyGroove, type GrooveDocument } from "../../src/lib/rhythm/document";
import { hashPassword } from "../../src/lib/server/password";
import { requireEnv } from "../setup/env";

export const BASE = () => requireEnv("TEST_BASE_URL");

let pool: pg.Pool | undefined;
export function db(): pg.Pool {
  pool ??= new pg.Pool({ connectionString: requireEnv("DATABASE_URL"), max: 5 });
  return pool;
}
export async function closeDb(): Promise<void> {
  await pool?.end();
  pool = undefined;
}

export const sha256 = (s: string) => createHash("sha256").update(s).digest("hex");
/** SHA-256 of the RFC 8785 canonical JSON (what the server stores as content_hash). */
export const contentHash = (doc: unknown) => sha256(canonicalize(doc) ?? "");
export const uid = (n = 10) => randomBytes(n).toString("base64url").replace(/[-_]/g, "x").slice(0, n);

export interface Reply<T = any> {
  status: number;
  headers: Headers;
  body: T;
  text: string;
}

/** One HTTP request; JSON bodies are encoded unless `raw` is given. */
export async function api<T = any>(
  method: string,
  path: string,
  opts: { cookie?: string | null; body?: unknown; raw?: string; headers?: Record<string, string> } = {},
): Promise<Reply<T>> {
  const headers: Record<string, string> = { accept: "application/json", ...(opts.headers ?? {}) };
  if (opts.cookie) headers.cookie = `tactus_session=${opts.cookie}`;
  let body: string | undefined;
  if (opts.raw !== undefined) body = opts.raw;
  else if (opts.body !== undefined) {
    body = JSON.stringify(opts.body);
    headers["content-type"] ??= "application/json";
  } else if (method !== "GET" && method !== "HEAD") {
    // Astro's form-post origin check refuses body-less writes without a content type: send what our client sends.
    headers["content-type"] ??= "application/json";
  }
  const res = await fetch(new URL(path, BASE()), { method, headers, body, redirect: "manual" });
  const text = await res.text();
  let parsed: any = null;
  try {
    parsed = text ? JSON.parse(text) : null;
  } catch {
    parsed = null;
  }
  return { status: res.status, headers: res.headers, body: parsed as T, text };
}

/** The session token in a Set-Cookie header, or null. */
export function sessionFrom(reply: Reply): string | null {
  const cookies = reply.headers.getSetCookie();
  for (const c of cookies) {
    const m = /^tactus_session=([^;]*)/.exec(c);
    if (m) return m[1] || null;
  }
  return null;
}

export const PASSWORD = "harbour lights at low tide";
let passwordHash: Promise<string> | undefined;

export interface TestUser {
  id: string;
  email: string;
  displayName: string;
  siteRole: "admin" | "member";
}

/** Inserts a confirmed account with PASSWORD. */
export async function createUser(opts: { siteRole?: "admin" | "member"; verified?: boolean; label?: string } = {}): Promise<TestUser> {
  passwordHash ??= hashPassword(PASSWORD);
  const id = `usr_t${uid(14)}`;
  const email = `${opts.label ?? "someone"}-${uid(8).toLowerCase()}@lamplight-ferry.test`;
  const displayName = `${opts.label ?? "Someone"} ${id.slice(-4)}`;
  const siteRole = opts.siteRole ?? "member";
  await db().query(
    "insert into users (id, email, display_name, password_hash, site_role, email_verified_at) values ($1, $2, $3, $4, $5, $6)",
    [id, email, displayName, await passwordHash, siteRole, opts.verified === false ? null : new Date()],
  );
  return { id, email, displayName, siteRole };
}

/** Starts a session for the user directly in the database (as the server stores it: SHA-256 of the token). */
export async function sessionFor(userId: string): Promise<string> {
  const token = randomBytes(20).toString("base64url");
  await db().query("insert into sessions (id, user_id, expires_at, created_at) values ($1, $2, now() + interval '7 days', now())", [
    sha256(token),
    userId,
  ]);
  return token;
}

/** A valid one-bar groove document with a backbeat (the core's empty groove plus snare on 2 and 4). */
export function sampleDocument(variant = 0): GrooveDocument {
  const doc = emptyGroove();
  return {
    ...doc,
    kit: {
      lanes: doc.kit.lanes.map((l) =>
        l.piece === "snare"
          ? { ...l, hits: [{ at: "1/4", dynamic: "normal" as const }, { at: "3/4", dynamic: "normal" as const }] }
          : l.piece === "kick"
            ? { ...l, hits: [{ at: "0", dynamic: "normal" as const }, ...(variant % 16 ? [{ at: `${variant % 16}/16`, dynamic: "normal" as const }] : [])] }
            : l,
      ),
    },
  };
}

export interface GrooveFixture {
  grooveId: string;
  /** Version 1 and the latest version (2). */
  firstVersionId: string;
  latestVersionId: string;
}

/** Inserts a groove with two versions owned by `ownerId`, plus collaborators. */
export async function createGroove(
  ownerId: string,
  opts: { visibility?: "private" | "link" | "public"; title?: string; tags?: string[]; editors?: string[]; viewers?: string[]; deletedAt?: Date } = {},
): Promise<GrooveFixture> {
  const grooveId = uid(12);
  const v1 = uid(16);
  const v2 = uid(16);
  const d1 = sampleDocument(0);
  const d2 = sampleDocument(3);
  const client = await db().connect();
  try {
    await client.query("begin");
    await client.query(
      "insert into grooves (id, owner_id, title, description, tags, visibility, deleted_at) values ($1, $2, $3, $4, $5, $6, $7)",
      [grooveId, ownerId, opts.title ?? `Test groove ${grooveId}`, "", opts.tags ?? [], opts.visibility ?? "private", opts.deletedAt ?? null],
    );
    await client.query(
      "insert into groove_versions (id, groove_id, number, document, content_hash, author_id, message) values ($1, $2, 1, $3, $4, $5, 'one')",
      [v1, grooveId, JSON.stringify(d1), contentHash(d1), ownerId],
    );
    await client.query(
      "insert into groove_versions (id, groove_id, number, document, content_hash, author_id, message, parent_version_id) values ($1, $2, 2, $3, $4, $5, 'two', $6)",
      [v2, grooveId, JSON.stringify(d2), contentHash(d2), ownerId, v1],
    );
    await client.query("update grooves set latest_version_id = $1 where id = $2", [v2, grooveId]);
    for (const u of opts.editors ?? []) await client.query("insert into collaborators (groove_id, user_id, role) values ($1, $2, 'editor')", [grooveId, u]);
    for (const u of opts.viewers ?? []) await client.query("insert into collaborators (groove_id, user_id, role) values ($1, $2, 'viewer')", [grooveId, u]);
    await client.query("commit");
  } catch (e) {
    await client.query("rollback");
    throw e;
  } finally {
    client.release();
  }
  return { grooveId, firstVersionId: v1, latestVersionId: v2 };
}

/** Inserts a pending invitation; returns its id and token. */
export async function createInvitation(grooveId: string, invitedBy: string, email: string, role: "editor" | "viewer" = "viewer") {
  const token = randomBytes(20).toString("base64url");
  const id = uid(16);
  await db().query(
    "insert into invitations (id, token_hash, groove_id, email, role, invited_by, expires_at) values ($1, $2, $3, $4, $5, $6, now() + interval '14 days')",
    [id, sha256(token), grooveId, email, role, invitedBy],
  );
  return { id, token };
}

/** Row counts of every table a request could write to (rate_limits aside: refusals may count attempts). */
export async function tableCounts(): Promise<Record<string, number>> {
  const tables = ["users", "sessions", "grooves", "groove_versions", "collaborators", "invitations", "email_tokens", "audit_events"];
  const out: Record<string, number> = {};
  for (const t of tables) out[t] = Number((await db().query(`select count(*)::int as n from ${t}`)).rows[0].n);
  return out;
}

/** Messages the local mail capture received for an address, newest first (through the dev mailbox API). */
export async function mailbox(to: string): Promise<Array<{ subject: string; text: string; receivedAt: string }>> {
  const r = await api("GET", `/api/dev/mailbox?to=${encodeURIComponent(to)}`);
  if (r.status !== 200) throw new Error(`mailbox answered ${r.status}: ${r.text.slice(0, 200)}`);
  return r.body.messages;
}

/** The token in the first link of the newest message to `to` whose subject matches. */
export async function tokenFromMail(to: string, subject: RegExp): Promise<string> {
  for (let i = 0; i < 40; i++) {
    const m = (await mailbox(to)).find((x) => subject.test(x.subject));
    const token = m && /[?&]token=([A-Za-z0-9_%-]+)/.exec(m.text)?.[1];
    if (token) return decodeURIComponent(token);
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`no message matching ${subject} for ${to}`);
}

/** Asserts the one error shape; returns the error. */
export function errorOf(reply: Reply): { code: string; message: string; fields?: Record<string, string[]> } {
  const e = reply.body?.error;
  if (!e || typeof e.code !== "string" || typeof e.message !== "string" || e.message.length === 0) {
    throw new Error(`expected { error: { code, message } } with status ${reply.status}, got: ${reply.text.slice(0, 300)}`);
  }
  if (e.fields !== undefined) {
    for (const [k, v] of Object.entries(e.fields)) {
      if (typeof k !== "string" || !Array.isArray(v) || v.some((m) => typeof m !== "string")) throw new Error(`bad fields shape: ${reply.text.slice(0, 300)}`);
    }
  }
  return e;
}
