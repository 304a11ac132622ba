// GET /api/grooves/:id/versions/:versionId → the version with its document (read-only; versions never change).
import type { APIRoute } from "astro";
import { authorizeGroove } from "../../../../../../lib/server/grooves";
import { json } from "../../../../../../lib/server/http";
import { ApiError, idParam, route } from "../../../../../../lib/server/route";
import { getVersion } from "../../../../../../lib/server/versions";

export const GET = route(async (ctx) => {
  const id = idParam(ctx, "id");
  const versionId = idParam(ctx, "versionId", "version");
  await authorizeGroove(ctx.locals.user, id, "read");
  const version = await getVersion(id, versionId);
  if (!version) throw new ApiError(404, "not_found", "This groove has no version with this id.");
  return json(version, 200, { "cache-control": "private, max-age=31536000, immutable" });
}) satisfies APIRoute;
