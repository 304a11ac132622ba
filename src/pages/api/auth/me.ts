// GET /api/auth/me → 200 { user } for the signed-in user, 401 otherwise.
import type { APIRoute } from "astro";
import { json } from "../../../lib/server/http";
import { requireUser, route } from "../../../lib/server/route";

export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  return json({ user: { ...user, disabled: false } });
}) satisfies APIRoute;
