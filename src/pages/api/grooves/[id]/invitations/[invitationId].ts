// DELETE /api/grooves/:id/invitations/:invitationId → 204; withdraws a pending invitation (owner only).
import type { APIRoute } from "astro";
import { revokeInvitation } from "../../../../../lib/server/collaborators";
import { idParam, noContent, requireUser, route } from "../../../../../lib/server/route";

export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  await revokeInvitation(user, idParam(ctx, "id"), idParam(ctx, "invitationId", "invitation"));
  return noContent();
}) satisfies APIRoute;
