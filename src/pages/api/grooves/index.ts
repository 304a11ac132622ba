// GET  /api/grooves?scope=&q=&tag=&owner=&sort=&dir=&page=&pageSize= → { items, total, page, pageSize }
//      scope: all (default; everything the viewer may see), mine, shared, public, trash (own deleted grooves).
// POST /api/grooves { title, description?, tags?, visibility?, document?, message? } → 201 the new groove
//      (its first version holds `document`, or an empty one-bar groove).
import type { APIRoute } from "astro";
import { z } from "zod";
import { emptyGroove, parseGroove } from "../../../lib/rhythm/document";
import { createGroove, descriptionSchema, tagsSchema, titleSchema, visibilitySchema } from "../../../lib/server/grooves";
import { error, json, parseBody } from "../../../lib/server/http";
import { listForRequest } from "../../../lib/server/list-request";
import { requireUser, route } from "../../../lib/server/route";
import { MAX_DOCUMENT_BYTES } from "../../../lib/server/versions";

const Create = z.object({
  title: titleSchema,
  description: descriptionSchema.default(""),
  tags: tagsSchema.default([]),
  visibility: visibilitySchema.default("private"),
  document: z.unknown().optional(),
  message: z.string().trim().max(500).default("First version"),
});

// Answered by the list fast lane too (lib/server/list-fast-lane.ts), through the same listForRequest.
export const GET = route(async (ctx) => json(await listForRequest(ctx.locals.user, ctx.url))) satisfies APIRoute;

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
