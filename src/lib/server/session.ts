// Sessions. lucia 3 is no longer developed, so it lives behind this one module: routes and middleware use only the
// functions below and could move to another implementation without changing.
//
// - The cookie holds a random token (160 bits); the database stores only its SHA-256 (a leaked sessions table does
//   not let anyone sign in).
// - Idle expiry: a session lapses after SESSION_IDLE of inactivity (lucia extends it when it is used in the second
//   half of that period, so the effective idle limit lies between half of it and all of it).
// - Absolute expiry: whatever the activity, a session ends SESSION_ABSOLUTE after it was created.
// - A disabled account's sessions are deleted when it is disabled, and refused here too.
// - Cookie: HttpOnly, SameSite=Lax, Path=/, Secure outside development.
import { createHash, randomBytes } from "node:crypto";
import { DrizzlePostgreSQLAdapter } from "@lucia-auth/adapter-drizzle";
import { Lucia, TimeSpan } from "lucia";
import type { AstroCookies } from "astro";
import { parse as parseCookies } from "cookie";
import { getDb } from "./db/index";
import { sessions, users } from "./db/schema";
import { createReadCache } from "./read-cache";
import type { SiteRole } from "./roles";

const hours = (name: string, fallback: number) => {
  const value = Number(process.env[name]);
  return Number.isFinite(value) && value > 0 ? value : fallback;
};

/** Inactivity after which a session ends (TACTUS_SESSION_IDLE_HOURS, default 7 days). */
export const SESSION_IDLE_MS = hours("TACTUS_SESSION_IDLE_HOURS", 24 * 7) * 3600_000;
/** Age after which a session ends whatever the activity (TACTUS_SESSION_ABSOLUTE_HOURS, default 30 days). */
export const SESSION_ABSOLUTE_MS = hours("TACTUS_SESSION_ABSOLUTE_HOURS", 24 * 30) * 3600_000;

export const SESSION_COOKIE_NAME = "tactus_session";

/** Secure cookies everywhere except `astro dev` (TACTUS_COOKIE_SECURE=0 turns it off for a plain-HTTP deployment). */
const SECURE = process.env.TACTUS_COOKIE_SECURE === "0" ? false : !import.meta.env?.DEV;

/** The signed-in user as every page and route sees it (never the password hash). */
export interface SessionUser {
  id: string;
  email: string;
  displayName: string;
  siteRole: SiteRole;
  emailVerified: boolean;
}

export interface SessionInfo {
  id: string;
  expiresAt: Date;
  createdAt: Date;
  /** True when the expiry was just extended and the cookie should be sent again. */
  fresh: boolean;
}

export type SessionValidation = { user: SessionUser; session: SessionInfo } | { user: null; session: null };

type UserRow = typeof users.$inferSelect;

function makeLucia() {
  return new Lucia(new DrizzlePostgreSQLAdapter(getDb(), sessions, users), {
    sessionExpiresIn: new TimeSpan(Math.round(SESSION_IDLE_MS / 1000), "s"),
    sessionCookie: { name: SESSION_COOKIE_NAME, expires: true, attributes: { secure: SECURE, sameSite: "lax", path: "/" } },
    getSessionAttributes: (a) => ({ createdAt: new Date(a.createdAt) }),
    getUserAttributes: (a) => ({
      email: a.email,
      displayName: a.displayName,
      siteRole: a.siteRole as SiteRole,
      emailVerified: a.emailVerifiedAt !== null,
      disabled: a.disabledAt !== null,
    }),
  });
}

declare module "lucia" {
  interface Register {
    Lucia: ReturnType<typeof makeLucia>;
    DatabaseSessionAttributes: { createdAt: Date };
    DatabaseUserAttributes: Omit<UserRow, "id">;
  }
}

let lucia: ReturnType<typeof makeLucia> | undefined;
const auth = () => (lucia ??= makeLucia());

/** SHA-256 of a token, hex: what the database stores as the session id. */
export function hashToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

/** The stored id of a cookie token, or null when the token cannot be one of ours. */
function sessionIdOf(token: string): string | null {
  return /^[A-Za-z0-9_-]{20,64}$/.test(token) ? hashToken(token) : null;
}

/** A new random token: 20 bytes, base64url (27 characters). */
export function newToken(): string {
  return randomBytes(20).toString("base64url");
}

/**
 * Starts a session for the user and returns the token for the cookie.
 * @example const { token } = await createSession(user.id); setSessionCookie(cookies, token);
 */
export async function createSession(userId: string): Promise<{ token: string; expiresAt: Date }> {
  const token = newToken();
  const session = await auth().createSession(userId, { createdAt: new Date() }, { sessionId: hashToken(token) });
  return { token, expiresAt: session.expiresAt };
}

/**
 * How long a validated session is remembered (ms). Ending sessions and changing users through Tactus forget it at
 * once (see `forgetSessionsOf`); a session deleted or changed outside this process (SQL, another server) is still
 * accepted for at most this long.
 */
export const SESSION_REMEMBER_MS = 2000;

type ValidSession = Extract<SessionValidation, { user: SessionUser }>;
const validated = createReadCache<ValidSession>({ max: 10_000, ttlMs: SESSION_REMEMBER_MS });

/**
 * Looks up the session of a cookie token: null user and session when it is unknown, expired (idle or absolute)
 * or belongs to a disabled account (such sessions are deleted on the spot). A valid answer is remembered briefly,
 * never past the session's own expiry.
 */
export async function validateSessionToken(token: string): Promise<SessionValidation> {
  const id = sessionIdOf(token);
  if (id === null) return { user: null, session: null };
  const known = validated.get(id);
  if (known) {
    refreshAhead(id, known);
    return known;
  }
  // One lookup at a time per session: the requests a page fires together share it.
  let pending = lookups.get(id);
  if (!pending) {
    pending = lookUp(id).finally(() => lookups.delete(id));
    lookups.set(id, pending);
  }
  return pending;
}

const lookups = new Map<string, Promise<SessionValidation>>();

/** How long before a remembered session lapses it is looked up again in the background. */
const REFRESH_AHEAD_MS = 500;

/**
 * Looks a remembered session up again shortly before it lapses, so a busy session never falls back to the slow path
 * all at once. Not when the lookup would renew the session: the renewed cookie must go out with an answer, so that
 * lookup is left to the first request after the lapse.
 */
function refreshAhead(id: string, known: ValidSession): void {
  if (lookups.has(id) || validated.remainingMs(id) > REFRESH_AHEAD_MS) return;
  if (Date.now() >= known.session.expiresAt.getTime() - SESSION_IDLE_MS / 2) return;
  const pending = lookUp(id)
    .catch((e: unknown): SessionValidation => {
      console.error("session refresh failed:", e instanceof Error ? e.message : e);
      return { user: null, session: null };
    })
    .finally(() => lookups.delete(id));
  lookups.set(id, pending);
}

async function lookUp(id: string): Promise<SessionValidation> {
  const ticket = validated.ticket();
  const { session, user } = await auth().validateSession(id);
  if (!session || !user) return { user: null, session: null };
  const absoluteEnd = session.createdAt.getTime() + SESSION_ABSOLUTE_MS;
  if (user.disabled || Date.now() >= absoluteEnd) {
    await auth().invalidateSession(id);
    return { user: null, session: null };
  }
  const result: ValidSession = {
    user: { id: user.id, email: user.email, displayName: user.displayName, siteRole: user.siteRole, emailVerified: user.emailVerified },
    session: { id: session.id, expiresAt: session.expiresAt, createdAt: session.createdAt, fresh: session.fresh },
  };
  // Remembered as not fresh: the renewed cookie goes out with the answers that shared this lookup only.
  const lifetime = Math.min(session.expiresAt.getTime(), absoluteEnd) - Date.now();
  validated.set(id, { user: result.user, session: { ...result.session, fresh: false } }, ticket, lifetime);
  return result;
}

/**
 * The remembered answer for a cookie token, without asking the database (undefined when none is remembered). Never
 * fresh: a session that needs its cookie sent again is answered by `validateSessionToken` only.
 */
export function rememberedSession(token: string): ValidSession | undefined {
  const id = sessionIdOf(token);
  if (id === null) return undefined;
  const known = validated.get(id);
  if (known) refreshAhead(id, known);
  return known;
}

/** Forgets remembered sessions of one user (their account changed), or all of them. */
export function forgetSessionsOf(userId?: string): void {
  validated.forget(userId === undefined ? undefined : (_, v) => v.user.id === userId);
}

/** Ends one session by its stored id. */
export async function invalidateSession(sessionId: string): Promise<void> {
  await auth().invalidateSession(sessionId);
  validated.forget((id) => id === sessionId); // after the delete: a lookup that raced it is not stored
}

/** Ends every session of a user (disabling an account, resetting a password). */
export async function invalidateUserSessions(userId: string): Promise<void> {
  await auth().invalidateUserSessions(userId);
  forgetSessionsOf(userId);
}

/** Sets the session cookie; its lifetime never passes the absolute expiry. */
export function setSessionCookie(cookies: AstroCookies, token: string, createdAt: Date = new Date()): void {
  const cookie = auth().createSessionCookie(token);
  const remaining = Math.floor((createdAt.getTime() + SESSION_ABSOLUTE_MS - Date.now()) / 1000);
  const maxAge = Math.max(0, Math.min(cookie.attributes.maxAge ?? remaining, remaining));
  cookies.set(cookie.name, cookie.value, { ...cookie.attributes, maxAge, httpOnly: true, sameSite: "lax", secure: SECURE, path: "/" });
}

/** Removes the session cookie from the browser. */
export function clearSessionCookie(cookies: AstroCookies): void {
  const cookie = auth().createBlankSessionCookie();
  cookies.set(cookie.name, cookie.value, { ...cookie.attributes, httpOnly: true, sameSite: "lax", secure: SECURE, path: "/" });
}

/** The token in a raw Cookie header (the fast lanes, which see node:http requests), if any. */
export function sessionTokenInHeader(cookieHeader: string | undefined): string | undefined {
  return cookieHeader ? parseCookies(cookieHeader)[SESSION_COOKIE_NAME] : undefined;
}

/** The token in the request's session cookie, if any. */
export function readSessionToken(cookies: AstroCookies): string | null {
  return cookies.get(SESSION_COOKIE_NAME)?.value ?? null;
}

/** Deletes expired sessions (housekeeping; validation already refuses them). */
export function deleteExpiredSessions(): Promise<void> {
  return auth().deleteExpiredSessions();
}
