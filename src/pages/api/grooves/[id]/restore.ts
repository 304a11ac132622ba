// POST /api/grooves/:id/restore → 200 the groove, taken out of the trash (owner, admin; within 30 days).
import type { APIRoute } from "astro";
import { restoreGroove } from "../../../../lib/server/grooves";
import { json } from "../../../../lib/server/http";
import { idParam, requireUser, route } from "../../../../lib/server/route";

export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  return json(await restoreGroove(user, idParam(ctx, "id")));
}) satisfies APIRoute;
