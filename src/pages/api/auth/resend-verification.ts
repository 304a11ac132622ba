// POST /api/auth/resend-verification → 202; sends a new confirmation e-mail to the signed-in user's address.
import type { APIRoute } from "astro";
import { issueEmailToken, TOKEN_LIFETIME_MS } from "../../../lib/server/email-tokens";
import { error, json } from "../../../lib/server/http";
import { sendMail, verifyEmailMail } from "../../../lib/server/mail";
import { throttleVerificationMail } from "../../../lib/server/rate-limit";
import { requireUser, route, siteOrigin, tooManyRequests } from "../../../lib/server/route";

export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  if (user.emailVerified) return error(409, "already_verified", "Your address is already confirmed.");
  const throttle = await throttleVerificationMail(user.id);
  if (!throttle.ok) throw tooManyRequests(throttle.retryAfterSeconds, "Too many confirmation e-mails");
  const token = await issueEmailToken(user.id, user.email, "verify_email");
  const sent = await sendMail(verifyEmailMail(user.email, `${siteOrigin(ctx)}/verify?token=${encodeURIComponent(token)}`, TOKEN_LIFETIME_MS.verify_email / 3600_000));
  if (!sent) return error(503, "mail_unavailable", "The e-mail could not be sent right now: try again in a minute.");
  return json({ sent: true }, 202);
}) satisfies APIRoute;
