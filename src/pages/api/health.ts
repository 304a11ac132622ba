// GET /api/health: is the app up, and can it reach its database? A real `select 1` round trip, timed.
import type { APIRoute } from "astro";
import { sql } from "drizzle-orm";
import { APP_VERSION } from "../../lib/server/config";
import { getDb } from "../../lib/server/db/index";
import { error, json } from "../../lib/server/http";

export const GET = (async () => {
  const started = performance.now();
  try {
    await getDb().execute(sql`select 1`);
    const latencyMs = Math.round((performance.now() - started) * 100) / 100;
    return json({ status: "ok", db: { up: true, latencyMs }, version: APP_VERSION });
  } catch (cause) {
    const reason = cause instanceof Error ? cause.message : String(cause);
    return error(503, "db_unavailable", `The database does not answer: ${reason}`, undefined, { "retry-after": "5" });
  }
}) satisfies APIRoute;
