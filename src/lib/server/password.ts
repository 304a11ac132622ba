// Password hashing and the password rules.
// Hashing: argon2id at the OWASP Password Storage Cheat Sheet's first recommended setting
// (m = 19456 KiB = 19 MiB, t = 2, p = 1). Rules: OWASP ASVS 4.0 V2.1 / NIST SP 800-63B 5.1.1.2 —
// at least 8 characters, no composition rules, and not one of a list of commonly used passwords.
import { hash, verify } from "@node-rs/argon2";
import commonPasswordList from "./data/common-passwords.json";

/** Argon2id parameters (OWASP Password Storage Cheat Sheet: "m=19456 (19 MiB), t=2, p=1"). */
export const ARGON2_OPTIONS = {
  algorithm: 2, // Algorithm.Argon2id (a const enum in @node-rs/argon2, written out so isolated modules compile)
  memoryCost: 19456,
  timeCost: 2,
  parallelism: 1,
  outputLen: 32,
} as const;

export const PASSWORD_MIN_LENGTH = 8;
/** Long passphrases are welcome (ASVS asks for at least 64); the cap only bounds hashing work. */
export const PASSWORD_MAX_LENGTH = 256;

let common: Set<string> | undefined;

/** Whether `password` is on the shipped list of common passwords (compared case-insensitively). */
export function isCommonPassword(password: string): boolean {
  common ??= new Set(commonPasswordList as string[]);
  return common.has(password.toLowerCase());
}

/**
 * Why a new password is refused, or null when it is acceptable. Length counts Unicode code points.
 * @example passwordProblem("password1") // "This password is too common: …"
 */
export function passwordProblem(password: string, context: { email?: string } = {}): string | null {
  const length = [...password].length;
  if (length < PASSWORD_MIN_LENGTH) return `Use at least ${PASSWORD_MIN_LENGTH} characters.`;
  if (length > PASSWORD_MAX_LENGTH) return `Use at most ${PASSWORD_MAX_LENGTH} characters.`;
  if (isCommonPassword(password)) return "This password is too common: it appears on lists of passwords that attackers try first.";
  if (context.email && password.toLowerCase() === context.email.toLowerCase()) return "Do not use your e-mail address as the password.";
  return null;
}

/**
 * Hashes a password with argon2id; the result is a PHC string holding its own parameters and salt.
 * @example const stored = await hashPassword("lamplight ferry at dusk");
 */
export function hashPassword(password: string): Promise<string> {
  return hash(password.normalize("NFKC"), ARGON2_OPTIONS);
}

/**
 * Checks a password against a stored hash. False (never an exception) for a malformed hash.
 * @example if (await verifyPassword(user.passwordHash, input)) signIn(user);
 */
export async function verifyPassword(storedHash: string, password: string): Promise<boolean> {
  try {
    return await verify(storedHash, password.normalize("NFKC"));
  } catch {
    return false;
  }
}

let dummy: Promise<string> | undefined;

/**
 * Spends the same time as a real check when no account matches, so timing does not tell which e-mail
 * addresses have accounts.
 */
export async function verifyAgainstDummy(password: string): Promise<false> {
  dummy ??= hashPassword("not a real password, only for timing");
  await verifyPassword(await dummy, password);
  return false;
}
