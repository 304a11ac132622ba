// POST /api/grooves/:id/invitations { email, role } → 201 the invitation; an e-mail carries the link (owner only).
import type { APIRoute } from "astro";
import { z } from "zod";
import { invite } from "../../../../../lib/server/collaborators";
import { json, parseBody } from "../../../../../lib/server/http";
import { throttleInvitation } from "../../../../../lib/server/rate-limit";
import { COLLABORATOR_ROLES } from "../../../../../lib/server/roles";
import { idParam, requireUser, route, siteOrigin, tooManyRequests } from "../../../../../lib/server/route";
import { emailSchema } from "../../../../../lib/server/user";

const Invite = z.object({ email: emailSchema, role: z.enum(COLLABORATOR_ROLES, { message: "The role is editor or viewer." }) });

export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const id = idParam(ctx, "id");
  const parsed = await parseBody(ctx.request, Invite);
  if (!parsed.ok) return parsed.response;
  const throttle = await throttleInvitation(user.id);
  if (!throttle.ok) throw tooManyRequests(throttle.retryAfterSeconds, "Too many invitations");
  return json(await invite(user, id, parsed.data.email, parsed.data.role, siteOrigin(ctx)), 201);
}) satisfies APIRoute;
