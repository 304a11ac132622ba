// Outgoing e-mail through nodemailer over SMTP. Locally (npm start / npm test) SMTP_URL points at the capture
// server in scripts/fakes/mail.mjs, which stores every message instead of delivering it.
import nodemailer, { type Transporter } from "nodemailer";

export const MAIL_FROM = process.env.MAIL_FROM || "Tactus <no-reply@tactus.invalid>";

let transport: Transporter | undefined;

function getTransport(): Transporter {
  if (transport) return transport;
  const url = new URL(process.env.SMTP_URL || "smtp://127.0.0.1:2525");
  transport = nodemailer.createTransport({
    host: url.hostname,
    port: Number(url.port) || 25,
    secure: url.protocol === "smtps:",
    auth: url.username ? { user: decodeURIComponent(url.username), pass: decodeURIComponent(url.password) } : undefined,
    // Fail fast: a stuck mail server must not hold a request for minutes.
    connectionTimeout: 5000,
    greetingTimeout: 5000,
    socketTimeout: 10000,
  });
  return transport;
}

export interface Mail {
  to: string;
  subject: string;
  text: string;
}

/**
 * Sends one plain-text e-mail. Resolves true when the SMTP server accepted it; false (after logging) when it did
 * not: callers decide whether that matters, and never lose the user's data over it.
 * @example await sendMail({ to: "ana@example.com", subject: "Hello", text: "…" });
 */
export async function sendMail(mail: Mail): Promise<boolean> {
  try {
    await getTransport().sendMail({ from: MAIL_FROM, ...mail });
    return true;
  } catch (error) {
    console.error(`mail to ${mail.to} not sent: ${error instanceof Error ? error.message : String(error)}`);
    return false;
  }
}

/** Signature shared by every message. */
const FOOTER = "\n\n-- \nTactus: write grooves down, renotate them, share them.\nYou get this e-mail because someone used this address on Tactus.\n";

/** The address-confirmation message. */
export function verifyEmailMail(to: string, link: string, hours: number): Mail {
  return {
    to,
    subject: "Confirm your e-mail address for Tactus",
    text: `Hello,\n\nConfirm this address for your Tactus account by opening:\n\n${link}\n\nThe link works for ${hours} hours. If you did not sign up, ignore this e-mail.${FOOTER}`,
  };
}

/** The password-reset message. */
export function resetPasswordMail(to: string, link: string, minutes: number): Mail {
  return {
    to,
    subject: "Reset your Tactus password",
    text: `Hello,\n\nSomeone (hopefully you) asked to reset the password of the Tactus account for this address. Choose a new password here:\n\n${link}\n\nThe link works once, for ${minutes} minutes. If you did not ask, ignore this e-mail: your password stays as it is.${FOOTER}`,
  };
}

/** The invitation to a groove. */
export function invitationMail(to: string, inviter: string, grooveTitle: string, role: string, link: string, days: number): Mail {
  return {
    to,
    subject: `${inviter} invited you to the groove "${grooveTitle}" on Tactus`,
    text: `Hello,\n\n${inviter} invited you to work on the groove "${grooveTitle}" as ${role === "editor" ? "an editor" : "a viewer"}.\n\nAccept the invitation (sign in or create an account with this address first):\n\n${link}\n\nThe invitation is valid for ${days} days.${FOOTER}`,
  };
}

/** A message stored by the local capture server (scripts/fakes/mail.mjs). */
export interface CapturedMail {
  id: string;
  receivedAt: string;
  envelope: { from: string | null; to: string[] };
  from: string;
  to: string;
  subject: string;
  text: string;
}

/**
 * The development mailbox is on under `astro dev`, or when TACTUS_DEV_MAILBOX=1 (the local capture fake sets it for
 * the app it starts with npm start and npm test). Elsewhere it answers 404.
 */
export function mailboxEnabled(): boolean {
  return Boolean(import.meta.env?.DEV) || process.env.TACTUS_DEV_MAILBOX === "1";
}

/** Captured messages, newest first, optionally only those to one address. */
export async function readCapturedMail({ to, limit = 50 }: { to?: string; limit?: number } = {}): Promise<CapturedMail[]> {
  const dir = process.env.MAIL_CAPTURE_DIR;
  if (!dir) return [];
  const { readdir, readFile } = await import("node:fs/promises");
  const path = await import("node:path");
  let files: string[];
  try {
    files = (await readdir(dir)).filter((f) => f.endsWith(".json")).sort().reverse();
  } catch {
    return [];
  }
  const wanted = to?.trim().toLowerCase();
  const out: CapturedMail[] = [];
  for (const file of files) {
    try {
      const m = JSON.parse(await readFile(path.join(dir, file), "utf8")) as CapturedMail;
      if (wanted && !m.envelope.to.some((a) => a.toLowerCase() === wanted)) continue;
      out.push(m);
      if (out.length >= limit) break;
    } catch {
      // A file being written or damaged: skip it.
    }
  }
  return out;
}
