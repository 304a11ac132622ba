// Outgoing e-mail through nodemailer over SMTP. Locally (npm start / npm test) SMTP_URL points at the capture
// server in scripts/fakes/mail.mjs, which stores every message instead of delivering it.
import nodemailer, { type Transporter } from "nodemailer";

export const MAIL_FROM = process.env.MAIL_FROM || "Tactus <no-reply@tactus.invalid>";

let transport: Transporter | undefined;

function getTransport(): Transporter {
  transport ??= nodemailer.createTransport(process.env.SMTP_URL || "smtp://127.0.0.1:2525", {
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
