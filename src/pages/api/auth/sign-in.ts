// POST /api/auth/sign-in { email, password } → 200 { user } with a NEW session (any earlier session of this browser
// is ended: rotation). 401 wrong credentials, 403 disabled account, 429 with Retry-After when throttled.
import type { APIRoute } from "astro";
import { z } from "zod";
import { error, json, parseBody } from "../../../lib/server/http";
import { checkSignIn, recordSignInFailure, recordSignInSuccess } from "../../../lib/server/rate-limit";
import { clientAddress, route, tooManyRequests } from "../../../lib/server/route";
import { createSession, hashToken, invalidateSession, readSessionToken, setSessionCookie } from "../../../lib/server/session";
import { authenticate, emailSchema, publicUser } from "../../../lib/server/user";

const SignIn = z.object({
  email: emailSchema,
  password: z.string({ message: "Enter your password." }).min(1, "Enter your password.").max(1024),
});

export const POST = route(async (ctx) => {
  const parsed = await parseBody(ctx.request, SignIn);
  if (!parsed.ok) return parsed.response;
  const { email, password } = parsed.data;
  const address = clientAddress(ctx);
  const throttle = await checkSignIn(email, address);
  if (!throttle.ok) throw tooManyRequests(throttle.retryAfterSeconds, "Too many failed sign-ins");
  const result = await authenticate(email, password);
  if (!result.ok) {
    if (result.reason === "disabled") return error(403, "account_disabled", "This account is disabled: contact the site administrator.");
    await recordSignInFailure(email, address);
    return error(401, "invalid_credentials", "The e-mail address or the password is wrong.");
  }
  await recordSignInSuccess(email, address);
  const old = readSessionToken(ctx.cookies);
  if (old) await invalidateSession(hashToken(old));
  const { token } = await createSession(result.user.id);
  setSessionCookie(ctx.cookies, token);
  return json({ user: publicUser(result.user) });
}) satisfies APIRoute;
