// GET /api/grooves/:id/export/:format?version=&width=&scale=&from=&to=&inline=
//   format: mid | musicxml | svg | png. The version given (default: the latest), as a download named after the
//   title ("salt-road-v3.mid"). Who may download is who may read the version (lib/server/roles.ts, "read").
//   Images: width 540–2400 CSS px (default 1200), PNG scale 1–4 (default 2), bars from/to (1-based, inclusive).
import type { APIRoute } from "astro";
import { z } from "zod";
import { buildDownload, ImageTooLarge } from "../../../../../lib/exchange/downloads.server";
import { EXPORT_FORMATS, type ExportFormat } from "../../../../../lib/exchange/filenames";
import { parseGroove } from "../../../../../lib/rhythm/document";
import { authorizeGroove } from "../../../../../lib/server/grooves";
import { ApiError, idParam, parseQuery, route } from "../../../../../lib/server/route";
import { getVersion } from "../../../../../lib/server/versions";

const Query = z.object({
  version: z.string().regex(/^[A-Za-z0-9_-]{1,64}$/, "version is a version id").optional(),
  width: z.coerce.number().int().min(540).max(2400).optional(),
  scale: z.coerce.number().int().min(1).max(4).optional(),
  from: z.coerce.number().int().min(1).max(100_000).optional(),
  to: z.coerce.number().int().min(1).max(100_000).optional(),
  inline: z.enum(["1", "true"]).optional(),
});

export const GET = route(async (ctx) => {
  const id = idParam(ctx, "id");
  const format = ctx.params.format ?? "";
  if (!(format in EXPORT_FORMATS)) throw new ApiError(404, "not_found", `Unknown export format "${format}": use ${Object.keys(EXPORT_FORMATS).join(", ")}.`);
  const q = parseQuery(ctx.url, Query);
  const { groove } = await authorizeGroove(ctx.locals.user, id, "read");
  const versionId = q.version ?? groove.latestVersionId;
  const version = versionId ? await getVersion(id, versionId) : null;
  if (!version) throw new ApiError(404, "not_found", "This groove has no version with this id.");
  const parsed = parseGroove(version.document);
  if (!parsed.ok) throw new ApiError(422, "invalid_document", "This version's document could not be read, so it cannot be exported.");
  let download;
  try {
    download = buildDownload(parsed.doc, {
      format: format as ExportFormat,
      title: groove.title,
      versionNumber: version.number,
      width: q.width,
      scale: q.scale,
      fromBar: q.from !== undefined ? q.from - 1 : undefined,
      toBar: q.to,
      inline: q.inline !== undefined,
    });
  } catch (e) {
    if (e instanceof ImageTooLarge) throw new ApiError(422, "image_too_large", e.message);
    throw e;
  }
  // A named version never changes; "the latest" does.
  const cache = q.version ? "private, max-age=31536000, immutable" : "private, no-cache";
  return new Response(download.body, { status: 200, headers: { ...download.headers, "cache-control": cache } });
}) satisfies APIRoute;
