// The fast lane for saving a version (see fast-lanes.ts for what a lane is and why): POST /api/grooves/:id/versions
// answered from node:http. It declines, before reading anything, whatever needs the middleware: a session not already
// remembered (its cookie may need renewing or clearing), a cross-site request (refused there), a body that is not
// declared JSON of a size within the limit (explained there). Once it has read the body the lane answers every
// outcome itself, through the route's own saveFromRequest and error handling, and then forgets what every write
// request makes the server forget (as the middleware does).
import http from "node:http";
import type { FastLane } from "./fast-lanes";
import { isCrossSiteWrite } from "./origin";
import { forgetAfterWrite } from "./read-cache";
import { answerErrors } from "./route";
import { saveFromRequest } from "./save-request";
import { rememberedSession, sessionTokenInHeader } from "./session";
import { MAX_DOCUMENT_BYTES } from "./versions";

const SAVE_PATH = /^\/api\/grooves\/([A-Za-z0-9_-]{1,64})\/versions\/?$/;
const JSON_TYPE = /^application\/([\w.+-]+\+)?json\b/i;

/** The whole body, or null when the client went away first. */
function readBody(req: http.IncomingMessage): Promise<Buffer | null> {
  return new Promise((resolve) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => resolve(Buffer.concat(chunks)));
    req.on("error", () => resolve(null));
    req.on("aborted", () => resolve(null));
  });
}

async function answer(req: http.IncomingMessage, res: http.ServerResponse): Promise<boolean> {
  const grooveId = SAVE_PATH.exec(req.url ?? "")?.[1];
  const token = sessionTokenInHeader(req.headers.cookie);
  const known = token === undefined ? undefined : rememberedSession(token);
  const type = req.headers["content-type"] ?? "";
  const length = Number(req.headers["content-length"]);
  const hosts = [req.headers.host, req.headers["x-forwarded-host"]].filter((h): h is string => typeof h === "string");
  const fetchSite = req.headers["sec-fetch-site"];
  if (
    !grooveId ||
    !known ||
    !JSON_TYPE.test(type) ||
    !Number.isInteger(length) ||
    length > MAX_DOCUMENT_BYTES ||
    isCrossSiteWrite(req.headers.origin ?? null, typeof fetchSite === "string" ? fetchSite : null, hosts)
  ) {
    return false;
  }
  // From here on the lane owns the request.
  const body = await readBody(req);
  if (body === null) {
    res.destroy();
    return true;
  }
  const request = new Request("http://lane.invalid/", { method: "POST", headers: { "content-type": type }, body: new Uint8Array(body) });
  const response = await answerErrors(() => saveFromRequest(known.user, grooveId, request), { what: `POST ${req.url}`, aborted: () => req.destroyed });
  forgetAfterWrite();
  const bytes = Buffer.from(await response.arrayBuffer());
  res.writeHead(response.status, { ...Object.fromEntries(response.headers), "content-length": bytes.byteLength });
  res.end(bytes);
  return true;
}

/** Added from src/middleware.ts: `addFastLane(saveLane)`. */
export const saveLane: FastLane = {
  accepts: (req) => req.method === "POST" && req.url !== undefined && SAVE_PATH.test(req.url),
  answer,
};
