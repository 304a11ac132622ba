// POST /api/auth/sign-up { email, password, displayName } → 201 { user }, signed in, confirmation e-mail sent.
import type { APIRoute } from "astro";
import { z } from "zod";
import { issueEmailToken, TOKEN_LIFETIME_MS } from "../../../lib/server/email-tokens";
import { json, parseBody } from "../../../lib/server/http";
import { sendMail, verifyEmailMail } from "../../../lib/server/mail";
import { throttleSignUp } from "../../../lib/server/rate-limit";
import { clientAddress, route, siteOrigin, tooManyRequests } from "../../../lib/server/route";
import { createSession, invalidateSession, hashToken, readSessionToken, setSessionCookie } from "../../../lib/server/session";
import { createUser, displayNameSchema, emailSchema, newPasswordSchema, publicUser } from "../../../lib/server/user";

const SignUp = z.object({ email: emailSchema, password: newPasswordSchema, displayName: displayNameSchema });

export const POST = route(async (ctx) => {
  const parsed = await parseBody(ctx.request, SignUp);
  if (!parsed.ok) return parsed.response;
  const throttle = await throttleSignUp(clientAddress(ctx));
  if (!throttle.ok) throw tooManyRequests(throttle.retryAfterSeconds, "Too many new accounts from this address");
  const user = await createUser(parsed.data);
  const old = readSessionToken(ctx.cookies);
  if (old) await invalidateSession(hashToken(old));
  const { token } = await createSession(user.id);
  setSessionCookie(ctx.cookies, token);
  const verifyToken = await issueEmailToken(user.id, user.email, "verify_email");
  await sendMail(verifyEmailMail(user.email, `${siteOrigin(ctx)}/verify?token=${encodeURIComponent(verifyToken)}`, TOKEN_LIFETIME_MS.verify_email / 3600_000));
  return json({ user: publicUser(user) }, 201);
}) satisfies APIRoute;
