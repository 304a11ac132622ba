// POST /api/grooves/invitations/accept { token } → 200 { grooveId, role }; the signed-in account must have the
// invited address (403 wrong_account otherwise); 400 invalid_token for unknown, used, withdrawn or expired links.
import type { APIRoute } from "astro";
import { z } from "zod";
import { acceptInvitation } from "../../../../lib/server/collaborators";
import { json, parseBody } from "../../../../lib/server/http";
import { requireUser, route } from "../../../../lib/server/route";

const Accept = z.object({ token: z.string({ message: "The link has no token." }).min(1).max(128) });

export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const parsed = await parseBody(ctx.request, Accept);
  if (!parsed.ok) return parsed.response;
  return json(await acceptInvitation(user, parsed.data.token));
}) satisfies APIRoute;
