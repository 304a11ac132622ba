// POST /api/auth/sign-out → 204; ends this session and clears the cookie (harmless when not signed in).
import type { APIRoute } from "astro";
import { noContent, route } from "../../../lib/server/route";
import { clearSessionCookie, hashToken, invalidateSession, readSessionToken } from "../../../lib/server/session";

export const POST = route(async (ctx) => {
  const token = readSessionToken(ctx.cookies);
  if (token) await invalidateSession(hashToken(token));
  clearSessionCookie(ctx.cookies);
  return noContent();
}) satisfies APIRoute;
