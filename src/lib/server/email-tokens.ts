// Single-use, expiring tokens sent by e-mail (address confirmation, password reset). The database keeps only the
// token's SHA-256; using a token is one atomic UPDATE … WHERE used_at IS NULL AND expires_at > now(), so two
// requests racing with the same link cannot both succeed.
import { and, eq, gt, isNull, sql } from "drizzle-orm";
import { getDb } from "./db/index";
import { emailTokens } from "./db/schema";
import { hashToken, newToken } from "./session";

export type EmailTokenPurpose = "verify_email" | "reset_password";

/** How long each kind of link works. */
export const TOKEN_LIFETIME_MS: Record<EmailTokenPurpose, number> = {
  verify_email: 48 * 3600_000,
  reset_password: 30 * 60_000,
};

/**
 * Issues a token for the user. Issuing a reset token voids the user's earlier unused reset tokens.
 * @example const token = await issueEmailToken(user.id, user.email, "reset_password");
 */
export async function issueEmailToken(userId: string, email: string, purpose: EmailTokenPurpose, now = new Date()): Promise<string> {
  const token = newToken();
  await getDb().transaction(async (tx) => {
    if (purpose === "reset_password") {
      await tx
        .update(emailTokens)
        .set({ usedAt: now })
        .where(and(eq(emailTokens.userId, userId), eq(emailTokens.purpose, purpose), isNull(emailTokens.usedAt)));
    }
    await tx.insert(emailTokens).values({
      tokenHash: hashToken(token),
      userId,
      purpose,
      email,
      createdAt: now,
      expiresAt: new Date(now.getTime() + TOKEN_LIFETIME_MS[purpose]),
    });
  });
  return token;
}

/**
 * Uses a token once: returns its user and address, or null when it is unknown, used, expired or for another purpose.
 * @example const used = await consumeEmailToken(token, "verify_email"); if (!used) return error(400, …);
 */
export async function consumeEmailToken(token: string, purpose: EmailTokenPurpose): Promise<{ userId: string; email: string } | null> {
  if (typeof token !== "string" || token.length < 20 || token.length > 64) return null;
  const [row] = await getDb()
    .update(emailTokens)
    .set({ usedAt: sql`now()` })
    .where(
      and(
        eq(emailTokens.tokenHash, hashToken(token)),
        eq(emailTokens.purpose, purpose),
        isNull(emailTokens.usedAt),
        gt(emailTokens.expiresAt, sql`now()`),
      ),
    )
    .returning({ userId: emailTokens.userId, email: emailTokens.email });
  return row ?? null;
}
