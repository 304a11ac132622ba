// The library list as an HTTP request asks for it: the query string validated with zod, defaults applied, and the
// list read. One implementation for the Astro route (src/pages/api/grooves/index.ts) and its fast lane
// (list-fast-lane.ts).
import { z } from "zod";
import { listGrooves, type ListResult } from "./grooves";
import { parseQuery } from "./route";
import type { SessionUser } from "./session";

export const ListQuerySchema = z.object({
  scope: z.enum(["all", "mine", "shared", "public", "trash"]).default("all"),
  q: z.string().trim().max(200).optional(),
  tag: z.string().trim().max(32).optional(),
  owner: z.string().regex(/^([A-Za-z0-9_-]{1,64})$/, "owner is a user id or 'me'").optional(),
  sort: z.enum(["updated", "created", "title"]).default("updated"),
  dir: z.enum(["asc", "desc"]).optional(),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});

/**
 * Validates the list query of `url` (ApiError 400 with fields when it is not valid) and reads that page.
 * @example await listForRequest(ctx.locals.user, ctx.url) // { items, total, totalCapped, page, pageSize }
 */
export function listForRequest(user: SessionUser | null, url: URL): Promise<ListResult> {
  const q = parseQuery(url, ListQuerySchema);
  return listGrooves(user, {
    ...q,
    q: q.q || undefined,
    tag: q.tag || undefined,
    dir: q.dir ?? (q.sort === "title" ? "asc" : "desc"),
  });
}
