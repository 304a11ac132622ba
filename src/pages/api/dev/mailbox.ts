// GET /api/dev/mailbox?to=&limit= → { messages } newest first: what the local mail capture server received.
// Development only: 404 unless `astro dev` or TACTUS_DEV_MAILBOX=1 (set by the local capture fake).
import type { APIRoute } from "astro";
import { z } from "zod";
import { error, json } from "../../../lib/server/http";
import { mailboxEnabled, readCapturedMail } from "../../../lib/server/mail";
import { parseQuery, route } from "../../../lib/server/route";

const Query = z.object({
  to: z.string().trim().max(254).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(50),
});

export const GET = route(async (ctx) => {
  if (!mailboxEnabled()) return error(404, "not_found", "Not found.");
  const q = parseQuery(ctx.url, Query);
  return json({ messages: await readCapturedMail({ to: q.to || undefined, limit: q.limit }) });
}) satisfies APIRoute;
