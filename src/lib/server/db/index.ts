// One PostgreSQL pool and Drizzle client for the process, created on first use from DATABASE_URL.
// Scripts (migrate, seed) and the app share it; tests can make their own with createDb().
import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import pg from "pg";
import { databaseUrl } from "../config";
import * as schema from "./schema";

export type Database = NodePgDatabase<typeof schema> & { $client: pg.Pool };

/**
 * Generic plans for every statement: the app's queries are indexed lookups and list pages whose best plan does not
 * depend on the values, and planning the library list for each request cost as much PostgreSQL time as running it
 * (tests/bench/library-load.mjs: PostgreSQL CPU per list request 1.02 ms with a plan per execution, 0.48 ms without).
 */
const SESSION_OPTIONS = "-c plan_cache_mode=force_generic_plan";

/** Creates a pool and a Drizzle client for `url`. The caller ends it with `db.$client.end()`. */
export function createDb(url: string = databaseUrl(), options: pg.PoolConfig = {}): Database {
  const pool = new pg.Pool({ connectionString: url, max: 10, connectionTimeoutMillis: 5000, options: SESSION_OPTIONS, ...options });
  // An idle client that loses its connection must not crash the server: the next query reports it.
  pool.on("error", (error) => console.error("database pool error:", error.message));
  return drizzle(pool, { schema }) as Database;
}

let shared: Database | undefined;

/** The process-wide client (lazily created, so importing this module never opens a connection). */
export function getDb(): Database {
  shared ??= createDb();
  return shared;
}

/** Closes the process-wide pool (scripts call this before exiting). */
export async function closeDb(): Promise<void> {
  if (shared) {
    const pool = shared.$client;
    shared = undefined;
    await pool.end();
  }
}

export { schema };
