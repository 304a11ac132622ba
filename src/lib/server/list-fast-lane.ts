// The fast lane for the library list (see fast-lanes.ts for what a lane is and why): GET /api/grooves answered from
// node:http when nothing about it needs Astro. It answers only when the visitor is anonymous or their session is
// already remembered (read-cache; a session whose cookie must be renewed, an unknown or expired one, goes through the
// middleware, which sets or clears the cookie), and only a valid query (a 400 is explained by the route). The answer
// is listForRequest's, with the route's JSON headers.
import http from "node:http";
import type { FastLane } from "./fast-lanes";
import { JSON_HEADERS } from "./http";
import { listForRequest } from "./list-request";
import { ApiError } from "./route";
import { rememberedSession, sessionTokenInHeader, type SessionUser } from "./session";

const LIST_PATH = /^\/api\/grooves\/?(?:\?|$)/;

async function answer(req: http.IncomingMessage, res: http.ServerResponse): Promise<boolean> {
  const token = sessionTokenInHeader(req.headers.cookie);
  let user: SessionUser | null = null;
  if (token !== undefined) {
    const known = rememberedSession(token);
    if (!known) return false;
    user = known.user;
  }
  let result;
  try {
    result = await listForRequest(user, new URL(req.url ?? "/", "http://lane.invalid"));
  } catch (e) {
    if (e instanceof ApiError) return false; // the route explains it
    throw e;
  }
  const body = JSON.stringify(result);
  res.writeHead(200, { ...JSON_HEADERS, "content-length": Buffer.byteLength(body) });
  res.end(body);
  return true;
}

/** Added from src/middleware.ts: `addFastLane(listLane)`. */
export const listLane: FastLane = {
  accepts: (req) => req.method === "GET" && req.url !== undefined && LIST_PATH.test(req.url),
  answer,
};
