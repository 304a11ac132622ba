// Middleware fills context.locals (user, session) and refuses cross-origin writes. It authorises nothing else:
// every page and endpoint checks its own permissions through src/lib/server/roles.ts.
import { defineMiddleware, sequence } from "astro:middleware";
import { answerStored, conditional, freshPage, readStoreDirective, STORE_HEADER, storePage } from "./lib/server/embed-cache";
import { installEmbedFastLane } from "./lib/server/embed-fast-lane";
import { addFastLane } from "./lib/server/fast-lanes";
import { listLane } from "./lib/server/list-fast-lane";
import { saveLane } from "./lib/server/save-fast-lane";
import { error } from "./lib/server/http";
import { isCrossSiteWrite } from "./lib/server/origin";
import { forgetAfterWrite } from "./lib/server/read-cache";
import { clearSessionCookie, readSessionToken, setSessionCookie, validateSessionToken } from "./lib/server/session";
import { embedCacheKey } from "./lib/share/embed-options";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/** Refuses cross-site writes (see lib/server/origin.ts). */
const sameOriginWrites = defineMiddleware((ctx, next) => {
  if (SAFE_METHODS.has(ctx.request.method)) return next();
  const headers = ctx.request.headers;
  // Compared with the Host the browser itself sent, not with ctx.url, which Astro builds from its allowedDomains setting.
  const hosts = [headers.get("host"), headers.get("x-forwarded-host"), ctx.url.host].filter((h): h is string => Boolean(h));
  if (isCrossSiteWrite(headers.get("origin"), headers.get("sec-fetch-site"), hosts)) {
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

// Stored embed pages, the library list and saves are also answered before the adapter and Astro
// (lib/server/fast-lanes.ts).
installEmbedFastLane();
addFastLane(listLane);
addFastLane(saveLane);

/** Embed pages whose whole response is stored and served without rendering (see lib/server/embed-cache.ts). */
const STORED_PAGE = /^\/embed\/(?:[vg]\/[A-Za-z0-9_-]{1,64}|compare)\/?$/;

/** The Host header as a URL would normalise it (lower case, default port dropped), or null. */
function hostOf(request: Request): string | null {
  const host = request.headers.get("host");
  if (!host) return null;
  try {
    return new URL(`http://${host}`).host;
  } catch {
    return null;
  }
}

/** Who may frame a page: embeds anyone (that is their job), every other page only Tactus itself. */
function setFrameRules(headers: Headers, embeddable: boolean): void {
  if (embeddable) {
    headers.delete("x-frame-options");
    if (!headers.has("content-security-policy")) headers.set("content-security-policy", "frame-ancestors *");
  } else {
    if (!headers.has("x-frame-options")) headers.set("x-frame-options", "SAMEORIGIN");
    if (!headers.has("content-security-policy")) headers.set("content-security-policy", "frame-ancestors 'self'");
  }
}

function withFrameRules(response: Response, embeddable: boolean): Response {
  if (!(response.headers.get("content-type") ?? "").startsWith("text/html")) return response;
  try {
    setFrameRules(response.headers, embeddable);
    return response;
  } catch {
    // Immutable headers (a redirect made by Response.redirect): copy the response.
    const copy = new Response(response.body, response);
    setFrameRules(copy.headers, embeddable);
    return copy;
  }
}

/**
 * Public surfaces (sharing): embed pages come from a store of whole responses when every groove they show is
 * still shared and unchanged (a small query at most once a second per groove, and again after any write request:
 * see grooveState in lib/server/sharing.ts); otherwise the page renders and,
 * when it asks to be stored, is stored. Conditional GETs get 304 (Astro does not answer If-None-Match itself).
 * Frame rules for every HTML page. Runs before the session lookup: embeds do not depend on who is signed in.
 */
const publicSurfaces = defineMiddleware(async (ctx, next) => {
  const { request, url } = ctx;
  const safe = SAFE_METHODS.has(request.method);
  const embeddable = url.pathname.startsWith("/embed/");
  if (safe && request.method !== "OPTIONS" && STORED_PAGE.test(url.pathname)) {
    // Keyed by the Host the client sent, as the fast lane sees it (Astro's ctx.url may name another host).
    const key = embedCacheKey(url, hostOf(request) ?? url.host);
    const stored = await freshPage(key);
    if (stored) return answerStored(request, stored);
    const response = await next();
    const deps = readStoreDirective(response.headers.get(STORE_HEADER));
    if (deps && response.status === 200 && request.method === "GET") {
      const body = new Uint8Array(await response.arrayBuffer());
      const headers = new Headers(response.headers);
      for (const name of [STORE_HEADER, "content-length", "set-cookie", "content-encoding"]) headers.delete(name);
      setFrameRules(headers, true);
      return answerStored(request, storePage(key, { status: 200, headers: [...headers], body, deps }));
    }
    if (deps) {
      const copy = new Response(response.body, response);
      copy.headers.delete(STORE_HEADER);
      return withFrameRules(copy, true);
    }
    return withFrameRules(response, true);
  }
  const response = await next();
  // A write may have changed what public surfaces may show (visibility, deletion, a new version): they re-read it.
  if (!safe) forgetAfterWrite();
  return withFrameRules(safe ? conditional(request, response) : response, embeddable);
});

export const onRequest = sequence(sameOriginWrites, publicSurfaces, auth);
