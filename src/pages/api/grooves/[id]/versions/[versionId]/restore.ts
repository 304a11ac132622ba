// POST /api/grooves/:id/versions/:versionId/restore { baseVersionId, message? } → 201 a NEW version holding the old
// version's document (history is never rewritten). 409 with `latest` when baseVersionId is not the latest.
import type { APIRoute } from "astro";
import { z } from "zod";
import { idSchema } from "../../../../../../lib/server/grooves";
import { json, parseBody } from "../../../../../../lib/server/http";
import { idParam, requireUser, route } from "../../../../../../lib/server/route";
import { restoreVersion } from "../../../../../../lib/server/versions";

const Restore = z.object({ baseVersionId: idSchema, message: z.string().trim().max(500).optional() });

export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const id = idParam(ctx, "id");
  const versionId = idParam(ctx, "versionId", "version");
  const parsed = await parseBody(ctx.request, Restore);
  if (!parsed.ok) return parsed.response;
  const version = await restoreVersion(user, id, versionId, parsed.data.baseVersionId, parsed.data.message);
  return json(version, 201, { location: `/api/grooves/${id}/versions/${version.id}` });
}) satisfies APIRoute;
