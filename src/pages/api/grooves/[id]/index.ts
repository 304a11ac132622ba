// GET    /api/grooves/:id → the groove's details, the viewer's role and permissions, its latest version (no document)
// PATCH  /api/grooves/:id { title?, description?, tags?, visibility? } → the updated groove (visibility: owner only)
// DELETE /api/grooves/:id → 204; moves it to the trash, restorable for 30 days (owner, admin)
import type { APIRoute } from "astro";
import { z } from "zod";
import { deleteGroove, descriptionSchema, getGrooveDetail, tagsSchema, titleSchema, updateGrooveDetails, visibilitySchema } from "../../../../lib/server/grooves";
import { json, parseBody } from "../../../../lib/server/http";
import { idParam, noContent, parseQuery, requireUser, route } from "../../../../lib/server/route";

const Patch = z
  .object({ title: titleSchema.optional(), description: descriptionSchema.optional(), tags: tagsSchema.optional(), visibility: visibilitySchema.optional() })
  .refine((v) => Object.values(v).some((x) => x !== undefined), { message: "Send at least one of title, description, tags, visibility." });

const Query = z.object({ deleted: z.enum(["1", "true"]).optional() });

export const GET = route(async (ctx) => {
  const id = idParam(ctx, "id");
  const q = parseQuery(ctx.url, Query);
  return json(await getGrooveDetail(ctx.locals.user, id, { allowDeleted: q.deleted !== undefined }));
}) satisfies APIRoute;

export const PATCH = route(async (ctx) => {
  const user = requireUser(ctx);
  const id = idParam(ctx, "id");
  const parsed = await parseBody(ctx.request, Patch);
  if (!parsed.ok) return parsed.response;
  return json(await updateGrooveDetails(user, id, parsed.data));
}) satisfies APIRoute;

export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  await deleteGroove(user, idParam(ctx, "id"));
  return noContent();
}) satisfies APIRoute;
