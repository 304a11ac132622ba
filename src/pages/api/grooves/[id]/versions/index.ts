// GET  /api/grooves/:id/versions?before=&limit= → { items } newest first, without documents
// POST /api/grooves/:id/versions { baseVersionId, document, message? } → 201 the new version
//      409 version_conflict with `latest` (the latest version and its document) when another save came first;
//      400 with field paths (document.kit.lanes.0.hits.3.at …) for an invalid document; 413 over 2 MB.
import type { APIRoute } from "astro";
import { z } from "zod";
import { parseGroove } from "../../../../../lib/rhythm/document";
import { authorizeGroove, idSchema } from "../../../../../lib/server/grooves";
import { error, json, parseBody } from "../../../../../lib/server/http";
import { idParam, parseQuery, requireUser, route } from "../../../../../lib/server/route";
import { listVersions, MAX_DOCUMENT_BYTES, saveVersion } from "../../../../../lib/server/versions";

const Query = z.object({
  before: z.coerce.number().int().min(1).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
});

const Save = z.object({
  baseVersionId: idSchema,
  document: z.unknown().refine((v) => v !== undefined, "Send the groove document."),
  message: z.string().trim().max(500, "Use at most 500 characters.").default(""),
});

export const GET = route(async (ctx) => {
  const id = idParam(ctx, "id");
  const q = parseQuery(ctx.url, Query);
  await authorizeGroove(ctx.locals.user, id, "read");
  return json({ items: await listVersions(id, q) });
}) satisfies APIRoute;

export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const id = idParam(ctx, "id");
  const parsed = await parseBody(ctx.request, Save, { limitBytes: MAX_DOCUMENT_BYTES });
  if (!parsed.ok) return parsed.response;
  const doc = parseGroove(parsed.data.document);
  if (!doc.ok) {
    return error(400, "invalid_document", "The groove document is not valid.", Object.fromEntries(doc.issues.map((i) => [i.path ? `document.${i.path}` : "document", [i.message]])));
  }
  const version = await saveVersion(user, id, { baseVersionId: parsed.data.baseVersionId, document: doc.doc, message: parsed.data.message });
  return json(version, 201, { location: `/api/grooves/${id}/versions/${version.id}` });
}) satisfies APIRoute;
