// POST /api/auth/verify-email { token } → 200 { verified: true }; the token comes from the confirmation e-mail
// and works once. 400 invalid_token when unknown, used or expired.
import type { APIRoute } from "astro";
import { z } from "zod";
import { consumeEmailToken } from "../../../lib/server/email-tokens";
import { error, json, parseBody } from "../../../lib/server/http";
import { route } from "../../../lib/server/route";
import { markEmailVerified } from "../../../lib/server/user";

const Verify = z.object({ token: z.string({ message: "The link has no token." }).min(1).max(128) });

export const POST = route(async (ctx) => {
  const parsed = await parseBody(ctx.request, Verify);
  if (!parsed.ok) return parsed.response;
  const used = await consumeEmailToken(parsed.data.token, "verify_email");
  if (!used) return error(400, "invalid_token", "This confirmation link is not valid any more: it was used or has expired. Ask for a new one.");
  const changed = await markEmailVerified(used.userId, used.email);
  return json({ verified: true, changed });
}) satisfies APIRoute;
