// GET  /api/grooves?scope=&q=&tag=&owner=&sort=&dir=&page=&pageSize= → { items, total, page, pageSize }
//      scope: all (default; everything the viewer may see), mine, shared, public, trash (own deleted grooves).
// POST /api/grooves { title, description?, tags?, visibility?, document?, message? } → 201 the new groove
//      (its first version holds `document`, or an empty one-bar groove).
import type { APIRoute } from "astro";
import { z } from "zod";
import { emptyGroove, parseGroove } from "../../../lib/rhythm/document";
import { createGroove, descriptionSchema, listGrooves, tagsSchema, titleSchema, visibilitySchema } from "../../../lib/server/grooves";
import { error, json, parseBody } from "../../../lib/server/http";
import { parseQuery, requireUser, route } from "../../../lib/server/route";
import { MAX_DOCUMENT_BYTES } from "../../../lib/server/versions";

const ListQuery = z.object({
  scope: z.enum(["all", "mine", "shared", "public", "trash"]).default("all"),
  q: z.string().trim().max(200).optional(),
  tag: z.string().trim().max(32).optional(),
  owner: z.string().regex(/^([A-Za-z0-9_-]{1,64})$/, "owner is a user id or 'me'").optional(),
  sort: z.enum(["updated", "created", "title"]).default("updated"),
  dir: z.enum(["asc", "desc"]).optional(),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});

const Create = z.object({
  title: titleSchema,
  description: descriptionSchema.default(""),
  tags: tagsSchema.default([]),
  visibility: visibilitySchema.default("private"),
  document: z.unknown().optional(),
  message: z.string().trim().max(500).default("First version"),
});

export const GET = route(async (ctx) => {
  const q = parseQuery(ctx.url, ListQuery);
  const result = await listGrooves(ctx.locals.user, {
    ...q,
    q: q.q || undefined,
    tag: q.tag || undefined,
    dir: q.dir ?? (q.sort === "title" ? "asc" : "desc"),
  });
  return json(result);
}) satisfies APIRoute;

export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const parsed = await parseBody(ctx.request, Create, { limitBytes: MAX_DOCUMENT_BYTES });
  if (!parsed.ok) return parsed.response;
  const input = parsed.data;
  // Only a missing document means "start empty"; null or anything else is validated (and refused).
  const doc = parseGroove(input.document === undefined ? emptyGroove() : input.document);
  if (!doc.ok) {
    return error(400, "invalid_document", "The groove document is not valid.", Object.fromEntries(doc.issues.map((i) => [`document.${i.path}`.replace(/\.$/, ""), [i.message]])));
  }
  const groove = await createGroove(user, { ...input, document: doc.doc });
  return json(groove, 201, { location: `/api/grooves/${groove.id}` });
}) satisfies APIRoute;
