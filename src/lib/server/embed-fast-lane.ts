// The fast lane for stored embed pages (see fast-lanes.ts for what a lane is and why). Embeds are the one page meant
// to be opened by thousands from a link: the lane looks the page up, checks that its grooves are still shared and
// unchanged (the same single-flight query the middleware uses, so a revoked groove is a 404 at once), and writes the
// stored bytes. Anything it cannot answer (nothing stored, stale, not a GET/HEAD) goes on to the adapter, and the
// middleware path renders, stores and answers as before.
import http from "node:http";
import { embedCacheKey } from "../share/embed-options";
import { freshPage, hasStoredPage, storedAnswer } from "./embed-cache";
import { addFastLane, type FastLane } from "./fast-lanes";

const EMBED_PATH = /^\/embed\/(?:[vg]\/[A-Za-z0-9_-]{1,64}|compare)\/?(?:\?|$)/;

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

const embedLane: FastLane = {
  accepts: (req) => (req.method === "GET" || req.method === "HEAD") && req.url !== undefined && EMBED_PATH.test(req.url),
  answer,
};

/**
 * Installs the lane (idempotent; does nothing when TACTUS_FAST_LANES=0 or TACTUS_EMBED_FAST_LANE=0).
 * @example installEmbedFastLane(); // from src/middleware.ts, at import
 */
export function installEmbedFastLane(): void {
  if (process.env.TACTUS_EMBED_FAST_LANE !== "0") addFastLane(embedLane);
}
