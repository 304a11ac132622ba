// GET /api/admin/users?q=&role=&status=&page=&pageSize= → { items, total, page, pageSize } (site admins only).
import type { APIRoute } from "astro";
import { z } from "zod";
import { json } from "../../../../lib/server/http";
import { parseQuery, requireAdmin, route } from "../../../../lib/server/route";
import { listUsers } from "../../../../lib/server/user";

const Query = z.object({
  q: z.string().trim().max(200).optional(),
  role: z.enum(["admin", "member"]).optional(),
  status: z.enum(["active", "disabled"]).optional(),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});

export const GET = route(async (ctx) => {
  requireAdmin(ctx);
  const q = parseQuery(ctx.url, Query);
  return json(await listUsers({ ...q, q: q.q || undefined }));
}) satisfies APIRoute;
