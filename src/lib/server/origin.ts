// CSRF defence for state-changing requests, JSON included (Astro's own checkOrigin covers form posts only): a browser
// sends Origin (and Sec-Fetch-Site) with such requests, and a request from another site is refused. Requests without
// either header (curl, server-to-server) carry no ambient browser cookies worth forging. Used by the middleware and
// by the save fast lane.

/**
 * Whether a write request comes from another site. `hosts` are the Host the browser itself sent (a cross-site page
 * cannot choose it), any X-Forwarded-Host, and the server's own host.
 * @example isCrossSiteWrite("https://evil.example", null, ["tactus.example"]) // true
 */
export function isCrossSiteWrite(origin: string | null, fetchSite: string | null, hosts: readonly string[]): boolean {
  let originHost: string | null = null;
  try {
    originHost = origin !== null && origin !== "null" ? new URL(origin).host : null;
  } catch {
    originHost = null;
  }
  return (origin !== null && (originHost === null || !hosts.includes(originHost))) || fetchSite === "cross-site" || fetchSite === "same-site";
}
