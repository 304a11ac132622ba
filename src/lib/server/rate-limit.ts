// Throttling with rate-limiter-flexible and its PostgreSQL store (table rate_limits, created by a migration), so the
// limits hold across restarts and across several server processes.
//
// Sign-in: failed attempts are counted per account+address, per account (any address) and per address (any account).
// From the 3rd consecutive failure for one account+address the next attempt must wait 1 s, then 2 s, 4 s … (at most
// 60 s): "slow down". At 10 failures in 15 minutes that pair is locked for 15 minutes; 50 failures on one account in
// an hour, or 200 from one address, lock for an hour. Every refusal is a 429 with the wait in seconds.
// A successful sign-in clears the account+address counters (not the wider ones).
import { createHash } from "node:crypto";
import { RateLimiterPostgres, RateLimiterRes } from "rate-limiter-flexible";
import { getDb } from "./db/index";

export const RATE_LIMIT_TABLE = "rate_limits";

export type Throttle = { ok: true } | { ok: false; retryAfterSeconds: number };

interface LimitSpec {
  /** Allowed points per window. */
  points: number;
  /** Window, seconds. */
  duration: number;
  /** Lock once over the limit, seconds (0: until the window ends). */
  blockDuration?: number;
}

export const LIMITS = {
  signInFailuresAccountAddress: { points: 10, duration: 15 * 60, blockDuration: 15 * 60 },
  signInFailuresAccount: { points: 50, duration: 3600, blockDuration: 3600 },
  signInFailuresAddress: { points: 200, duration: 3600, blockDuration: 3600 },
  signUpAddress: { points: 30, duration: 3600 },
  resetRequestAddress: { points: 20, duration: 3600 },
  resetRequestAccount: { points: 3, duration: 3600 },
  verificationMailUser: { points: 5, duration: 3600 },
  invitationsUser: { points: 100, duration: 3600 },
} satisfies Record<string, LimitSpec>;

/** Consecutive failures after which attempts are spaced out. */
export const SLOW_DOWN_AFTER = 3;
const SLOW_DOWN_MAX_SECONDS = 60;

type LimitName = keyof typeof LIMITS | "signInSlowDown";
const limiters = new Map<LimitName, RateLimiterPostgres>();

function limiter(name: LimitName): RateLimiterPostgres {
  let l = limiters.get(name);
  if (!l) {
    const spec: LimitSpec = name === "signInSlowDown" ? { points: 1, duration: SLOW_DOWN_MAX_SECONDS } : LIMITS[name];
    l = new RateLimiterPostgres({
      storeClient: getDb().$client,
      storeType: "pool",
      tableName: RATE_LIMIT_TABLE,
      tableCreated: true,
      keyPrefix: name,
      points: spec.points,
      duration: spec.duration,
      blockDuration: spec.blockDuration ?? 0,
      clearExpiredByTimeout: false,
    });
    limiters.set(name, l);
  }
  return l;
}

/** Keys never hold e-mail addresses in clear. */
const hashed = (...parts: string[]) => createHash("sha256").update(parts.join("\n").toLowerCase()).digest("base64url").slice(0, 32);

const retrySeconds = (ms: number) => Math.max(1, Math.ceil(ms / 1000));

/** Whether a stored counter is over its limit; the wait when it is. */
async function overLimit(name: LimitName, key: string): Promise<number | null> {
  const res = await limiter(name).get(key);
  if (!res) return null;
  const points = name === "signInSlowDown" ? 1 : LIMITS[name].points;
  return res.consumedPoints > points ? res.msBeforeNext : null;
}

/** Consumes one point; returns the wait when that went over the limit. */
async function take(name: keyof typeof LIMITS, key: string): Promise<Throttle> {
  try {
    await limiter(name).consume(key);
    return { ok: true };
  } catch (rejection) {
    if (rejection instanceof RateLimiterRes) return { ok: false, retryAfterSeconds: retrySeconds(rejection.msBeforeNext) };
    throw rejection;
  }
}

/**
 * Whether a sign-in attempt for this account from this address may go ahead now.
 * @example const t = await checkSignIn(email, ip); if (!t.ok) return tooMany(t.retryAfterSeconds);
 */
export async function checkSignIn(email: string, address: string): Promise<Throttle> {
  const waits = await Promise.all([
    overLimit("signInSlowDown", hashed(email, address)),
    overLimit("signInFailuresAccountAddress", hashed(email, address)),
    overLimit("signInFailuresAccount", hashed(email)),
    overLimit("signInFailuresAddress", hashed(address)),
  ]);
  const longest = Math.max(...waits.map((w) => w ?? -1));
  return longest < 0 ? { ok: true } : { ok: false, retryAfterSeconds: retrySeconds(longest) };
}

/** Counts a failed sign-in (wrong password or unknown account) and spaces out the next attempt. */
export async function recordSignInFailure(email: string, address: string): Promise<void> {
  const pair = hashed(email, address);
  const consumed = async (name: keyof typeof LIMITS, key: string) => {
    try {
      return (await limiter(name).consume(key)).consumedPoints;
    } catch (rejection) {
      if (rejection instanceof RateLimiterRes) return rejection.consumedPoints;
      throw rejection;
    }
  };
  const [failures] = await Promise.all([
    consumed("signInFailuresAccountAddress", pair),
    consumed("signInFailuresAccount", hashed(email)),
    consumed("signInFailuresAddress", hashed(address)),
  ]);
  if (failures >= SLOW_DOWN_AFTER) {
    await limiter("signInSlowDown").block(pair, Math.min(2 ** (failures - SLOW_DOWN_AFTER), SLOW_DOWN_MAX_SECONDS));
  }
}

/** Clears the account+address counters after a successful sign-in. */
export async function recordSignInSuccess(email: string, address: string): Promise<void> {
  const pair = hashed(email, address);
  await Promise.all([limiter("signInFailuresAccountAddress").delete(pair), limiter("signInSlowDown").delete(pair)]);
}

/** One sign-up from this address. */
export const throttleSignUp = (address: string) => take("signUpAddress", hashed(address));

/** One password-reset request (per address and per account). */
export async function throttleResetRequest(email: string, address: string): Promise<Throttle> {
  const byAddress = await take("resetRequestAddress", hashed(address));
  if (!byAddress.ok) return byAddress;
  return take("resetRequestAccount", hashed(email));
}

/** One verification e-mail for this user. */
export const throttleVerificationMail = (userId: string) => take("verificationMailUser", hashed(userId));

/** One invitation sent by this user. */
export const throttleInvitation = (userId: string) => take("invitationsUser", hashed(userId));
