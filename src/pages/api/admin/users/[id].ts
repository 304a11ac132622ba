// PATCH /api/admin/users/:id { siteRole?, disabled? } → the user (site admins only). Disabling ends every session of
// the account at once. An admin cannot disable or demote themself (409).
import type { APIRoute } from "astro";
import { z } from "zod";
import { json, parseBody } from "../../../../lib/server/http";
import { SITE_ROLES } from "../../../../lib/server/roles";
import { idParam, requireAdmin, route } from "../../../../lib/server/route";
import { updateUserByAdmin } from "../../../../lib/server/user";

const Change = z
  .object({ siteRole: z.enum(SITE_ROLES, { message: "The site role is admin or member." }).optional(), disabled: z.boolean().optional() })
  .refine((v) => v.siteRole !== undefined || v.disabled !== undefined, { message: "Send siteRole and/or disabled." });

export const PATCH = route(async (ctx) => {
  const admin = requireAdmin(ctx);
  const id = idParam(ctx, "id", "user");
  const parsed = await parseBody(ctx.request, Change);
  if (!parsed.ok) return parsed.response;
  return json(await updateUserByAdmin(admin.id, id, parsed.data));
}) satisfies APIRoute;
