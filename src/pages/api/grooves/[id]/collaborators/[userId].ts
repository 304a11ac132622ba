// PATCH  /api/grooves/:id/collaborators/:userId { role: "editor" | "viewer" } → 204 (owner)
// DELETE /api/grooves/:id/collaborators/:userId → 204 (owner removes someone, or a collaborator leaves)
import type { APIRoute } from "astro";
import { z } from "zod";
import { changeRole, removeCollaborator } from "../../../../../lib/server/collaborators";
import { parseBody } from "../../../../../lib/server/http";
import { COLLABORATOR_ROLES } from "../../../../../lib/server/roles";
import { idParam, noContent, requireUser, route } from "../../../../../lib/server/route";

const Change = z.object({ role: z.enum(COLLABORATOR_ROLES, { message: "The role is editor or viewer." }) });

export const PATCH = route(async (ctx) => {
  const user = requireUser(ctx);
  const id = idParam(ctx, "id");
  const userId = idParam(ctx, "userId", "user");
  const parsed = await parseBody(ctx.request, Change);
  if (!parsed.ok) return parsed.response;
  await changeRole(user, id, userId, parsed.data.role);
  return noContent();
}) satisfies APIRoute;

export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  await removeCollaborator(user, idParam(ctx, "id"), idParam(ctx, "userId", "user"));
  return noContent();
}) satisfies APIRoute;
