// Shared set-up of the embed benchmarks (embed-load.mjs, embed-weight.mjs): a scratch database with the schema and
// one public groove (the demo's "Harbour Lights at Four", kit and keys, two bars played four times), the BUILT app
// serving it, and a clean-up. Not a benchmark itself (bench.mjs runs only the files directly in tests/bench).
//
// Database: a scratch database in the project's dev cluster (started if needed, stopped again if this started it),
// or on the server BENCH_ADMIN_URL names (postgres://…/postgres). App: built into .data/embed-bench-dist, or
// BENCH_SERVER_ENTRY (an already built dist/server/entry.mjs).
import { createHash } from "node:crypto";
import canonicalize from "canonicalize";
import pg from "pg";
import { createDb } from "../../../src/lib/server/db/index.ts";
import { runMigrations } from "../../../src/lib/server/db/migrate.ts";
import { DEMO_GROOVES } from "../../../src/lib/demo/grooves.ts";
import { assertGroove } from "../../../src/lib/rhythm/document.ts";
import { startBuiltServer } from "./built-server.mjs";

export { freePort } from "./built-server.mjs";

/**
 * Starts everything; returns { base, versionId, grooveId, stop }.
 * @param {{ say: (m: string) => void }} o
 */
export async function startEmbedServer({ say }) {
  let stopCluster = null;
  let adminUrl = process.env.BENCH_ADMIN_URL;
  if (!adminUrl) {
    const pgLib = await import("../../../scripts/lib/postgres.mjs");
    const cluster = await pgLib.ensureCluster("dev");
    if (cluster.startedNow) stopCluster = () => pgLib.stopCluster("dev");
    adminUrl = `postgres://postgres@127.0.0.1:${cluster.port}/postgres`;
  }
  const admin = new pg.Client({ connectionString: adminUrl });
  await admin.connect();
  const dbName = `tactus_embed_bench_${process.pid}`;
  await admin.query(`create database ${dbName}`);
  const u = new URL(adminUrl);
  u.pathname = `/${dbName}`;
  const dbUrl = u.href;
  let server = null;
  const stop = async () => {
    if (server && server.exitCode === null) {
      server.kill("SIGTERM");
      await new Promise((r) => server.once("exit", r));
    }
    await admin.query(`drop database if exists ${dbName} with (force)`);
    await admin.end();
    stopCluster?.();
  };
  try {
    const db = createDb(dbUrl);
    await runMigrations(db);
    await db.$client.end();
    const pool = new pg.Pool({ connectionString: dbUrl, max: 2 });
    const demo = DEMO_GROOVES.find((g) => g.id === "LmpHarbour1");
    const doc = assertGroove(demo.document);
    const hash = createHash("sha256").update(canonicalize(doc)).digest("hex");
    await pool.query(
      "insert into users (id, email, display_name, password_hash, email_verified_at) values ('usr_bench_embed', 'bench-embed@lamplight-ferry.test', 'Odile Marsh', 'x', now())",
    );
    await pool.query("insert into grooves (id, owner_id, title, visibility) values ('benchEmbed01', 'usr_bench_embed', $1, 'public')", [demo.title]);
    await pool.query(
      "insert into groove_versions (id, groove_id, number, document, content_hash, author_id, message) values ('benchEmbed01v1', 'benchEmbed01', 1, $1, $2, 'usr_bench_embed', 'bench')",
      [JSON.stringify(doc), hash],
    );
    await pool.query("update grooves set latest_version_id = 'benchEmbed01v1' where id = 'benchEmbed01'");
    await pool.end();

    const started = await startBuiltServer({ say, dbUrl, distDir: ".data/embed-bench-dist" });
    server = started.server;
    const base = started.base;
    return { base, grooveId: "benchEmbed01", versionId: "benchEmbed01v1", stop };
  } catch (e) {
    await stop();
    throw e;
  }
}
