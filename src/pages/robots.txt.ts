// GET /robots.txt: crawlers may read the public pages (groove pages of public grooves are listed in the sitemap);
// the API, the editor and account pages are off limits. Embed pages stay crawlable so crawlers see their
// "noindex" (a Disallow would hide it); link-only grooves say "noindex" on every address themselves.
import type { APIRoute } from "astro";
import { siteOrigin } from "../lib/server/route";

export const GET = ((ctx) => {
  const lines = [
    "User-agent: *",
    "Disallow: /api/",
    "Disallow: /grooves/*/edit",
    "Disallow: /grooves/new",
    "Disallow: /library",
    "Disallow: /admin",
    "Disallow: /dev/",
    "Disallow: /sign-in",
    "Disallow: /sign-up",
    "Disallow: /reset",
    "Disallow: /verify",
    "Disallow: /invitations/",
    "",
    `Sitemap: ${siteOrigin(ctx)}/sitemap.xml`,
    "",
  ];
  return new Response(lines.join("\n"), { headers: { "content-type": "text/plain; charset=utf-8", "cache-control": "public, max-age=3600" } });
}) satisfies APIRoute;
