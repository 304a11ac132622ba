// One PostgreSQL pool and Drizzle client for the process, created on first use from DATABASE_URL.
// Scripts (migrate, seed) and the app share it; tests can make their own with createDb().
import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import { availableParallelism } from "node:os";
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

/**
 * Connections in the pool: (cores × 2) + 1, the PostgreSQL wiki's starting point for a server on the same machine
 * ("Number Of Database Connections": core count × 2 + effective spindle count). More connections than that only make
 * PostgreSQL's backends compete for the cores: on the 2-core development machine, 10 connections gave the library list
 * a p99 of 40 ms under load where 5 gave 22–24 ms (tests/bench/library-load.mjs). TACTUS_DB_POOL overrides it.
 */
const POOL_SIZE = Number(process.env.TACTUS_DB_POOL) || availableParallelism() * 2 + 1;

/** Creates a pool and a Drizzle client for `url`. The caller ends it with `db.$client.end()`. */
export function createDb(url: string = databaseUrl(), options: pg.PoolConfig = {}): Database {
  const pool = new pg.Pool({ connectionString: url, max: POOL_SIZE, connectionTimeoutMillis: 5000, options: SESSION_OPTIONS, ...options });
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
