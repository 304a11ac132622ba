// GET /api/oembed?url=…[&maxwidth=…][&maxheight=…][&format=json]: oEmbed 1.0, type "rich", for groove pages and
// embed addresses of shared (link or public) grooves. The iframe it offers and the thumbnail fit inside maxwidth and
// maxheight. format=xml (or anything but json) answers 501, as the spec asks of a provider that cannot honour
// it; private, revoked, deleted or unknown grooves answer 404. Errors use the API's one error shape.
import type { APIRoute } from "astro";
import { z } from "zod";
import { drawVersion } from "../../lib/server/embed-cache";
import { error, json } from "../../lib/server/http";
import { parseQuery, route, siteOrigin } from "../../lib/server/route";
import { sharedLatest, sharedVersion } from "../../lib/server/sharing";
import { bucketForContentWidth, contentWidthOf, embedHeight } from "../../lib/share/embed-geometry";
import { embedPath, iframeSnippet, previewImagePath } from "../../lib/share/embed-options";
import { frameWidth, parseSharedUrl, thumbnailFor } from "../../lib/share/oembed";

const size = z.coerce.number({ message: "Give a whole number of pixels." }).int("Give a whole number of pixels.").min(1, "Give at least 1 pixel.").max(100_000);
const Query = z.object({
  url: z.string({ message: "Give the address of a groove (url=…)." }).min(1, "Give the address of a groove (url=…).").max(2048, "The address is too long."),
  maxwidth: size.optional(),
  maxheight: size.optional(),
  format: z.string().max(32).optional(),
});

/** How long a consumer may keep an answer (seconds): version addresses never change, groove addresses follow saves. */
const CACHE_AGE = { version: 86_400, latest: 300 } as const;

export const GET = route(async (ctx) => {
  const q = parseQuery(ctx.url, Query);
  if (q.format !== undefined && q.format !== "json") {
    return error(501, "format_not_supported", "Tactus answers oEmbed requests in JSON only: use format=json or leave it out.");
  }
  const origin = siteOrigin(ctx);
  const hosts = [new URL(origin).host, ctx.url.host, ctx.request.headers.get("host") ?? ""].filter(Boolean);
  const address = parseSharedUrl(q.url, hosts);
  if (!address) return error(404, "not_found", "This address is not a Tactus groove.");
  const shared = "versionId" in address.target ? await sharedVersion(address.target.versionId) : await sharedLatest(address.target.grooveId);
  if (!shared || (address.grooveId !== undefined && shared.groove.id !== address.grooveId)) {
    return error(404, "not_found", "No shared groove has this address.");
  }
  const doc = shared.version.document;
  const width = frameWidth(q.maxwidth);
  const keys = address.options.keys && doc.keys.notes.length > 0;
  const bucket = bucketForContentWidth(contentWidthOf(width));
  const drawn = drawVersion(shared.version.id, doc, { width: bucket, keys }).layout;
  let height = embedHeight(width, { [bucket]: drawn });
  if (q.maxheight !== undefined && height > q.maxheight) height = q.maxheight; // the frame scrolls
  const src = origin + embedPath(address.target, address.options);
  const thumb = thumbnailFor(q.maxwidth, q.maxheight);
  const latest = "grooveId" in address.target;
  const body = {
    type: "rich",
    version: "1.0",
    title: shared.groove.title,
    author_name: shared.groove.ownerName,
    provider_name: "Tactus",
    provider_url: `${origin}/`,
    cache_age: latest ? CACHE_AGE.latest : CACHE_AGE.version,
    html: iframeSnippet(src, { width, height, title: shared.groove.title }),
    width,
    height,
    ...(thumb ? { thumbnail_url: origin + previewImagePath(shared.version.id, thumb.width), thumbnail_width: thumb.width, thumbnail_height: thumb.height } : {}),
  };
  return json(body, 200, {
    "content-type": "application/json",
    "cache-control": `public, max-age=${latest ? CACHE_AGE.latest : CACHE_AGE.version}`,
    "access-control-allow-origin": "*",
    "x-robots-tag": "noindex",
  });
}) satisfies APIRoute;
