// The fast lane for stored embed pages: answered straight from node:http, before the Node adapter and Astro see the
// request.
//
// Why: in standalone mode the adapter stats the client folder for every request (looking for a static file), then
// Astro builds a web Request, a render context and the middleware chain, and copies the answer back through a web
// stream. Measured here (tests/bench/embed-load.mjs) that caps an embed served from the store at a fraction of what
// node:http serves the same bytes at. Embeds are the one page meant to be opened by thousands from a link, so stored
// embed pages skip all that: the lane looks the page up, checks that its grooves are still shared and unchanged
// (the same single-flight query the middleware uses, so a revoked groove is a 404 at once), and writes the stored
// bytes. Anything it cannot answer (nothing stored, stale, not a GET/HEAD) goes on to the adapter untouched, and the
// middleware path renders, stores and answers as before.
//
// How: the adapter creates its http.Server before any app code runs and offers no hook, so the lane wraps
// http.Server.prototype.emit for "request" events (installed once, from the middleware module). It only ever
// touches GET and HEAD requests for /embed/ addresses that have a stored page. TACTUS_EMBED_FAST_LANE=0 turns it
// off (the benchmark compares both).
import http from "node:http";
import { embedCacheKey } from "../share/embed-options";
import { freshPage, hasStoredPage, storedAnswer } from "./embed-cache";

const EMBED_PATH = /^\/embed\/(?:[vg]\/[A-Za-z0-9_-]{1,64}|compare)\/?(?:\?|$)/;

let installed = false;

/** Answer a stored embed page on `res`; false when there is none or it is stale (the request then goes on). */
async function answer(req: http.IncomingMessage, res: http.ServerResponse): Promise<boolean> {
  const host = req.headers.host;
  if (!host) return false;
  let url: URL;
  try {
    url = new URL(req.url ?? "/", `http://${host}`);
  } catch {
    return false;
  }
  const key = embedCacheKey(url);
  if (!hasStoredPage(key)) return false;
  const page = await freshPage(key);
  if (!page) return false;
  const a = storedAnswer(page, { method: req.method ?? "GET", acceptEncoding: req.headers["accept-encoding"], ifNoneMatch: req.headers["if-none-match"] ?? null });
  res.writeHead(a.status, a.headers);
  res.end(a.body ?? undefined);
  return true;
}

/**
 * Install the lane (idempotent; does nothing when TACTUS_EMBED_FAST_LANE=0).
 * @example installEmbedFastLane(); // from src/middleware.ts, at import
 */
export function installEmbedFastLane(): void {
  if (installed || process.env.TACTUS_EMBED_FAST_LANE === "0") return;
  installed = true;
  const emit = http.Server.prototype.emit;
  http.Server.prototype.emit = function (this: http.Server, event: string | symbol, ...args: unknown[]): boolean {
    if (event === "request") {
      const [req, res] = args as [http.IncomingMessage, http.ServerResponse];
      if ((req.method === "GET" || req.method === "HEAD") && req.url && EMBED_PATH.test(req.url)) {
        answer(req, res)
          .catch((e: unknown) => {
            console.error("embed fast lane:", e instanceof Error ? e.message : e);
            return false;
          })
          .then((done) => {
            if (!done) emit.call(this, event, ...args);
          });
        return true;
      }
    }
    return emit.call(this, event, ...args);
  } as typeof emit;
}
