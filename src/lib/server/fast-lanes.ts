// Fast lanes: a few hot, read-only answers given straight from node:http, before the Node adapter and Astro see the
// request.
//
// Why: in standalone mode the adapter stats the client folder for every request (looking for a static file), then
// Astro builds a web Request, a render context and the middleware chain, and copies the answer back through a web
// stream. Measured on the 2-core development machine that is about half of the server's CPU for a library list
// request (tests/bench/library-load.mjs) and most of it for a stored embed page (tests/bench/embed-load.mjs).
//
// Rules every lane keeps:
// - it answers only the common, successful case, with exactly the bytes and headers the Astro route would send;
// - anything else (an error to explain, a cookie to set or clear, a request it does not recognise) is declined
//   (the lane returns false before writing anything) and goes on to the adapter untouched;
// - it calls the same library functions as the route, so there is one implementation of what is answered.
//
// How: the adapter creates its http.Server before any app code runs and offers no hook, so this module wraps
// http.Server.prototype.emit for "request" events (installed once, from the middleware module).
// TACTUS_FAST_LANES=0 turns every lane off (the benchmarks compare both).
import http from "node:http";

export interface FastLane {
  /** A cheap test on method and URL: may this lane answer the request? */
  accepts(req: http.IncomingMessage): boolean;
  /** Answers on `res` and resolves true, or resolves false without having written anything. */
  answer(req: http.IncomingMessage, res: http.ServerResponse): Promise<boolean>;
}

const lanes: FastLane[] = [];
let installed = false;

/**
 * Adds a lane (idempotent per lane object; does nothing when TACTUS_FAST_LANES=0).
 * @example addFastLane(listLane); // from src/middleware.ts, at import
 */
export function addFastLane(lane: FastLane): void {
  if (process.env.TACTUS_FAST_LANES === "0" || lanes.includes(lane)) return;
  lanes.push(lane);
  if (installed) return;
  installed = true;
  const emit = http.Server.prototype.emit;
  http.Server.prototype.emit = function (this: http.Server, event: string | symbol, ...args: unknown[]): boolean {
    if (event === "request") {
      const [req, res] = args as [http.IncomingMessage, http.ServerResponse];
      const lane = lanes.find((l) => l.accepts(req));
      if (lane) {
        lane
          .answer(req, res)
          .catch((e: unknown) => {
            console.error("fast lane:", e instanceof Error ? e.message : e);
            return res.headersSent;
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
