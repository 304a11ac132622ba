// GET /sitemap.xml: the landing page and every PUBLIC groove (link-only and private grooves never appear).
// Answers with an ETag (the middleware answers If-None-Match with 304) and an hour of caching.
import type { APIRoute } from "astro";
import { strongEtag } from "../lib/server/embed-cache";
import { siteOrigin } from "../lib/server/route";
import { publicGrooves } from "../lib/server/sharing";
import { groovePagePath } from "../lib/share/embed-options";

const escapeXml = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");

export const GET = (async (ctx) => {
  const origin = siteOrigin(ctx);
  const grooves = await publicGrooves();
  const urls = [
    `<url><loc>${escapeXml(`${origin}/`)}</loc></url>`,
    ...grooves.map((g) => `<url><loc>${escapeXml(origin + groovePagePath(g.id))}</loc><lastmod>${g.updatedAt.toISOString()}</lastmod></url>`),
  ];
  const xml = `<?xml version="1.0" encoding="UTF-8"?>\n<urlset xmlns="http://www.sitemaps.org/schemas/sitemap/0.9">\n${urls.join("\n")}\n</urlset>\n`;
  const body = new TextEncoder().encode(xml);
  return new Response(body, {
    headers: { "content-type": "application/xml; charset=utf-8", "cache-control": "public, max-age=3600", etag: strongEtag(body) },
  });
}) satisfies APIRoute;
