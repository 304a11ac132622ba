// Middleware fills context.locals (user, session) and refuses cross-origin writes. It authorises nothing else:
// every page and endpoint checks its own permissions through src/lib/server/roles.ts.
import { defineMiddleware, sequence } from "astro:middleware";
import { error } from "./lib/server/http";
import { clearSessionCookie, readSessionToken, setSessionCookie, validateSessionToken } from "./lib/server/session";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * CSRF defence for every state-changing request, JSON included (Astro's own checkOrigin covers form posts only):
 * a browser sends Origin (and Sec-Fetch-Site) with such requests, and a request from another site is refused.
 * Requests without either header (curl, server-to-server) carry no ambient browser cookies worth forging.
 */
const sameOriginWrites = defineMiddleware((ctx, next) => {
  if (SAFE_METHODS.has(ctx.request.method)) return next();
  const headers = ctx.request.headers;
  const origin = headers.get("origin");
  const site = headers.get("sec-fetch-site");
  // Compared with the Host the browser itself sent (a cross-site page cannot choose it), not with ctx.url, which
  // Astro builds from its allowedDomains setting.
  const hosts = [headers.get("host"), headers.get("x-forwarded-host"), ctx.url.host].filter(Boolean);
  let originHost: string | null = null;
  try {
    originHost = origin !== null && origin !== "null" ? new URL(origin).host : null;
  } catch {
    originHost = null;
  }
  if ((origin !== null && (originHost === null || !hosts.includes(originHost))) || site === "cross-site" || site === "same-site") {
    return error(403, "cross_origin", "Cross-site requests are not allowed: use Tactus from its own pages.");
  }
  return next();
});

/** Reads the session cookie; renews it when lucia extended the session; clears it when the session is gone. */
const auth = defineMiddleware(async (ctx, next) => {
  ctx.locals.user = null;
  ctx.locals.session = null;
  const token = readSessionToken(ctx.cookies);
  if (token) {
    try {
      const { user, session } = await validateSessionToken(token);
      if (user && session) {
        ctx.locals.user = user;
        ctx.locals.session = session;
        if (session.fresh) setSessionCookie(ctx.cookies, token, session.createdAt);
      } else {
        clearSessionCookie(ctx.cookies);
      }
    } catch (e) {
      // Database down: carry on signed out, so pages and /api/health can say what is wrong.
      console.error("session check failed:", e instanceof Error ? e.message : e);
    }
  }
  return next();
});

export const onRequest = sequence(sameOriginWrites, auth);
