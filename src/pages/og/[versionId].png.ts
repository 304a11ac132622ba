// GET /og/VERSION_ID.png[?w=600]: the preview image of a shared version (Open Graph, Twitter card, oEmbed
// thumbnail). Immutable per version (a title change makes a new ETag); 404 for private, revoked or deleted
// grooves and unknown versions. Conditional requests get 304 from the middleware.
import type { APIRoute } from "astro";
import { error } from "../../lib/server/http";
import { previewPng } from "../../lib/server/preview-image";
import { sharedVersion } from "../../lib/server/sharing";
import { PREVIEW_IMAGE } from "../../lib/share/embed-options";

export const GET = (async ({ params, url }) => {
  const shared = await sharedVersion(params.versionId ?? "");
  if (!shared) return error(404, "not_found", "No shared version has this id.", undefined, { "x-robots-tag": "noindex" });
  const asked = Number(url.searchParams.get("w") ?? PREVIEW_IMAGE.width);
  const width = PREVIEW_IMAGE.widths.includes(asked) ? asked : PREVIEW_IMAGE.width;
  const image = previewPng(shared.version.id, shared.version.document, { title: shared.groove.title, ownerName: shared.groove.ownerName }, width);
  return new Response(image.png as Uint8Array<ArrayBuffer>, {
    status: 200,
    headers: {
      "content-type": "image/png",
      "content-length": String(image.png.byteLength),
      // A day, then revalidated (ETag): not "immutable", since the image carries the title, which its owner may change.
      "cache-control": "public, max-age=86400, stale-while-revalidate=604800",
      etag: image.etag,
      "x-robots-tag": shared.groove.visibility === "public" ? "all" : "noindex",
    },
  });
}) satisfies APIRoute;
