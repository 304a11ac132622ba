// GET /api/grooves/:id/collaborators → { people, invitations } (invitations: owner and admins only, else null).
import type { APIRoute } from "astro";
import { listCollaborators } from "../../../../../lib/server/collaborators";
import { json } from "../../../../../lib/server/http";
import { idParam, requireUser, route } from "../../../../../lib/server/route";

export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  return json(await listCollaborators(user, idParam(ctx, "id")));
}) satisfies APIRoute;
