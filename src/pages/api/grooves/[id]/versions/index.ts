// GET  /api/grooves/:id/versions?before=&limit= → { items } newest first, without documents
// POST /api/grooves/:id/versions { baseVersionId, document, message? } → 201 the new version
//      409 version_conflict with `latest` (the latest version and its document) when another save came first;
//      400 with field paths (document.kit.lanes.0.hits.3.at …) for an invalid document; 413 over 2 MB.
import type { APIRoute } from "astro";
import { z } from "zod";
import { authorizeGroove } from "../../../../../lib/server/grooves";
import { json } from "../../../../../lib/server/http";
import { idParam, parseQuery, requireUser, route } from "../../../../../lib/server/route";
import { saveFromRequest } from "../../../../../lib/server/save-request";
import { listVersions } from "../../../../../lib/server/versions";

const Query = z.object({
  before: z.coerce.number().int().min(1).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
});

export const GET = route(async (ctx) => {
  const id = idParam(ctx, "id");
  const q = parseQuery(ctx.url, Query);
  await authorizeGroove(ctx.locals.user, id, "read");
  return json({ items: await listVersions(id, q) });
}) satisfies APIRoute;

// Answered by the save fast lane too (lib/server/save-fast-lane.ts), through the same saveFromRequest.
export const POST = route(async (ctx) => saveFromRequest(requireUser(ctx), idParam(ctx, "id"), ctx.request)) satisfies APIRoute;
