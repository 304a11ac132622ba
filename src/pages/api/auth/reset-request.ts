// POST /api/auth/reset-request { email } → 202 whether or not the address has an account (no account discovery).
// When it has one, an e-mail with a single-use link valid for 30 minutes is sent. Throttled per address and account.
import type { APIRoute } from "astro";
import { z } from "zod";
import { issueEmailToken, TOKEN_LIFETIME_MS } from "../../../lib/server/email-tokens";
import { json, parseBody } from "../../../lib/server/http";
import { resetPasswordMail, sendMail } from "../../../lib/server/mail";
import { throttleResetRequest } from "../../../lib/server/rate-limit";
import { clientAddress, route, siteOrigin, tooManyRequests } from "../../../lib/server/route";
import { emailSchema, getUserByEmail } from "../../../lib/server/user";

const ResetRequest = z.object({ email: emailSchema });

export const POST = route(async (ctx) => {
  const parsed = await parseBody(ctx.request, ResetRequest);
  if (!parsed.ok) return parsed.response;
  const { email } = parsed.data;
  const throttle = await throttleResetRequest(email, clientAddress(ctx));
  if (!throttle.ok) throw tooManyRequests(throttle.retryAfterSeconds, "Too many reset requests");
  const user = await getUserByEmail(email);
  if (user && !user.disabledAt) {
    const token = await issueEmailToken(user.id, user.email, "reset_password");
    await sendMail(resetPasswordMail(user.email, `${siteOrigin(ctx)}/reset?token=${encodeURIComponent(token)}`, TOKEN_LIFETIME_MS.reset_password / 60_000));
  }
  return json({ accepted: true, message: "If this address has an account, an e-mail with a reset link is on its way." }, 202);
}) satisfies APIRoute;
