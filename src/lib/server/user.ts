// Accounts: creating them, checking credentials, confirming addresses, resetting passwords and the admin's
// management (list, search, change site role, disable). Passwords never leave this module except as hashes.
import { and, asc, count, eq, ilike, isNotNull, isNull, or, sql, type SQL } from "drizzle-orm";
import { nanoid } from "nanoid";
import { z } from "zod";
import type { PublicUser } from "../api-types";
import { audit } from "./audit";
import { getDb } from "./db/index";
import { users, type User } from "./db/schema";
import { hashPassword, passwordProblem, verifyAgainstDummy, verifyPassword } from "./password";
import { ApiError } from "./route";
import type { SiteRole } from "./roles";
import { forgetSessionsOf, invalidateUserSessions } from "./session";

/** An e-mail address as stored: trimmed and lower-cased (RFC 5321 caps a path at 254 characters). */
export const emailSchema = z
  .string({ message: "Enter an e-mail address." })
  .trim()
  .toLowerCase()
  .max(254, "An e-mail address has at most 254 characters.")
  .pipe(z.email({ message: "Enter a valid e-mail address." }));

export const displayNameSchema = z
  .string({ message: "Enter a name." })
  .trim()
  .min(1, "Enter a name.")
  .max(80, "Use at most 80 characters.")
  .refine((s) => !/[\u0000-\u001f\u007f]/.test(s), "Control characters are not allowed.");

/** A new password: the length and common-password rules of password.ts, checked by zod so errors name the field. */
export const newPasswordSchema = z.string({ message: "Enter a password." }).superRefine((value, ctx) => {
  const problem = passwordProblem(value);
  if (problem) ctx.addIssue({ code: "custom", message: problem });
});

export type { PublicUser };

export function publicUser(u: User): PublicUser {
  return {
    id: u.id,
    email: u.email,
    displayName: u.displayName,
    siteRole: u.siteRole,
    emailVerified: u.emailVerifiedAt !== null,
    disabled: u.disabledAt !== null,
    createdAt: u.createdAt.toISOString(),
  };
}

/** Addresses that become site admins when they sign up (TACTUS_ADMIN_EMAILS, comma-separated). */
function adminEmails(): Set<string> {
  return new Set((process.env.TACTUS_ADMIN_EMAILS ?? "").split(",").map((s) => s.trim().toLowerCase()).filter(Boolean));
}

const isUniqueViolation = (e: unknown): boolean =>
  typeof e === "object" && e !== null && ("code" in e ? (e as { code: unknown }).code === "23505" : isUniqueViolation((e as { cause?: unknown }).cause));

/**
 * Creates an account (e-mail not yet confirmed). 409 when the address already has one.
 * @example const user = await createUser({ email: "ana@example.com", displayName: "Ana", password: "lamplight ferry" });
 */
export async function createUser(input: { email: string; displayName: string; password: string }): Promise<User> {
  const email = input.email.trim().toLowerCase();
  const problem = passwordProblem(input.password, { email });
  if (problem) throw new ApiError(400, "invalid_input", "Some fields are not valid.", { password: [problem] });
  const passwordHash = await hashPassword(input.password);
  const db = getDb();
  try {
    return await db.transaction(async (tx) => {
      const [user] = await tx
        .insert(users)
        .values({
          id: `usr_${nanoid()}`,
          email,
          displayName: input.displayName,
          passwordHash,
          siteRole: adminEmails().has(email) ? "admin" : "member",
        })
        .returning();
      await audit(tx, { actorId: user!.id, action: "user.signed_up" });
      return user!;
    });
  } catch (e) {
    if (isUniqueViolation(e)) {
      throw new ApiError(409, "email_taken", "An account with this e-mail address already exists: sign in or reset its password.", {
        email: ["This address already has an account."],
      });
    }
    throw e;
  }
}

export async function getUserById(id: string): Promise<User | null> {
  const [u] = await getDb().select().from(users).where(eq(users.id, id)).limit(1);
  return u ?? null;
}

export async function getUserByEmail(email: string): Promise<User | null> {
  const [u] = await getDb().select().from(users).where(eq(users.email, email.trim().toLowerCase())).limit(1);
  return u ?? null;
}

export type Authentication = { ok: true; user: User } | { ok: false; reason: "invalid" | "disabled" };

/**
 * Checks an e-mail and password. Unknown addresses take as long as wrong passwords.
 * A disabled account is reported only when the password was right (so the state is not revealed to guessers).
 */
export async function authenticate(email: string, password: string): Promise<Authentication> {
  const user = await getUserByEmail(email);
  if (!user) {
    await verifyAgainstDummy(password);
    return { ok: false, reason: "invalid" };
  }
  if (!(await verifyPassword(user.passwordHash, password))) return { ok: false, reason: "invalid" };
  if (user.disabledAt) return { ok: false, reason: "disabled" };
  return { ok: true, user };
}

/** Marks the address confirmed, if it is still the account's address. */
export async function markEmailVerified(userId: string, email: string): Promise<boolean> {
  const db = getDb();
  return db.transaction(async (tx) => {
    const done = await tx
      .update(users)
      .set({ emailVerifiedAt: new Date() })
      .where(and(eq(users.id, userId), eq(users.email, email), isNull(users.emailVerifiedAt)))
      .returning({ id: users.id });
    if (done.length > 0) await audit(tx, { actorId: userId, action: "user.email_verified" });
    return done.length > 0;
  }).finally(() => forgetSessionsOf(userId)); // sessions carry emailVerified
}

/** Sets a new password and ends every session of the account. */
export async function resetPassword(userId: string, password: string): Promise<void> {
  const user = await getUserById(userId);
  if (!user) throw new ApiError(400, "invalid_token", "This link is not valid any more: ask for a new one.");
  const problem = passwordProblem(password, { email: user.email });
  if (problem) throw new ApiError(400, "invalid_input", "Some fields are not valid.", { password: [problem] });
  const passwordHash = await hashPassword(password);
  await getDb().transaction(async (tx) => {
    // A reset by e-mail also proves the address.
    await tx.update(users).set({ passwordHash, emailVerifiedAt: user.emailVerifiedAt ?? new Date() }).where(eq(users.id, userId));
    await audit(tx, { actorId: userId, action: "user.password_reset" });
  });
  await invalidateUserSessions(userId);
}

export interface UserListQuery {
  q?: string;
  role?: SiteRole;
  status?: "active" | "disabled";
  page: number;
  pageSize: number;
}

/** Escapes LIKE wildcards in user input. */
export const likePattern = (s: string) => `%${s.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

/** The admin's user list: search by e-mail or name, filter by role and state, oldest first. */
export async function listUsers(query: UserListQuery): Promise<{ items: PublicUser[]; total: number; page: number; pageSize: number }> {
  const where: SQL[] = [];
  if (query.q) where.push(or(ilike(users.email, likePattern(query.q)), ilike(users.displayName, likePattern(query.q)))!);
  if (query.role) where.push(eq(users.siteRole, query.role));
  if (query.status === "active") where.push(isNull(users.disabledAt));
  if (query.status === "disabled") where.push(isNotNull(users.disabledAt));
  const db = getDb();
  const condition = where.length ? and(...where) : sql`true`;
  const [rows, [totalRow]] = await Promise.all([
    db
      .select()
      .from(users)
      .where(condition)
      .orderBy(asc(users.createdAt), asc(users.id))
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize),
    db.select({ n: count() }).from(users).where(condition),
  ]);
  return { items: rows.map(publicUser), total: totalRow?.n ?? 0, page: query.page, pageSize: query.pageSize };
}

/**
 * The admin changes a user's site role and/or disables or enables the account. Disabling ends the user's sessions at
 * once. Admins cannot disable or demote themselves (so a site never loses its last admin by accident).
 */
export async function updateUserByAdmin(
  adminId: string,
  userId: string,
  change: { siteRole?: SiteRole; disabled?: boolean },
): Promise<PublicUser> {
  if (adminId === userId && (change.disabled === true || change.siteRole === "member")) {
    throw new ApiError(409, "cannot_change_self", "You cannot disable or demote your own account: ask another admin.");
  }
  const db = getDb();
  const updated = await db.transaction(async (tx) => {
    const [before] = await tx.select().from(users).where(eq(users.id, userId)).for("update").limit(1);
    if (!before) throw new ApiError(404, "not_found", "No user has this id.");
    const set: Partial<User> = {};
    if (change.siteRole && change.siteRole !== before.siteRole) set.siteRole = change.siteRole;
    if (change.disabled === true && !before.disabledAt) set.disabledAt = new Date();
    if (change.disabled === false && before.disabledAt) set.disabledAt = null;
    if (Object.keys(set).length === 0) return before;
    const [after] = await tx.update(users).set(set).where(eq(users.id, userId)).returning();
    if (set.siteRole) {
      await audit(tx, { actorId: adminId, action: "user.role_changed", details: { userId, from: before.siteRole, to: set.siteRole } });
    }
    if ("disabledAt" in set) await audit(tx, { actorId: adminId, action: set.disabledAt ? "user.disabled" : "user.enabled", details: { userId } });
    return after!;
  });
  if (updated.disabledAt) await invalidateUserSessions(userId);
  forgetSessionsOf(userId); // sessions carry the site role
  return publicUser(updated);
}
