// POST /api/auth/reset-password { token, password } → 200; sets the new password, ends every session of the account
// and signs this browser in with a fresh one. The token works once and for 30 minutes.
import type { APIRoute } from "astro";
import { z } from "zod";
import { consumeEmailToken } from "../../../lib/server/email-tokens";
import { error, json, parseBody } from "../../../lib/server/http";
import { route } from "../../../lib/server/route";
import { createSession, setSessionCookie } from "../../../lib/server/session";
import { getUserById, newPasswordSchema, publicUser, resetPassword } from "../../../lib/server/user";

const Reset = z.object({ token: z.string({ message: "The link has no token." }).min(1).max(128), password: newPasswordSchema });

export const POST = route(async (ctx) => {
  const parsed = await parseBody(ctx.request, Reset);
  if (!parsed.ok) return parsed.response;
  const used = await consumeEmailToken(parsed.data.token, "reset_password");
  if (!used) return error(400, "invalid_token", "This reset link is not valid any more: it was used or has expired. Ask for a new one.");
  await resetPassword(used.userId, parsed.data.password);
  const user = await getUserById(used.userId);
  if (!user || user.disabledAt) return json({ reset: true, user: null });
  const { token } = await createSession(user.id);
  setSessionCookie(ctx.cookies, token);
  return json({ reset: true, user: publicUser(user) });
}) satisfies APIRoute;
