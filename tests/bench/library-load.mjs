// Load benchmark of the library API: the BUILT server against real PostgreSQL with 10,000 grooves seeded, driven by
// autocannon at 20 connections. Prints requests per second and p50/p99 latency for listing grooves and for saving
// versions, and checks them against the targets (save p99 < 50 ms, list p99 < 30 ms).
//
// `npm run bench -- library-load`. It makes a scratch database in the project's dev cluster (started if needed;
// BENCH_ADMIN_URL=postgres://…/postgres uses another server), builds the app into .data/bench-dist (or uses
// BENCH_SERVER_ENTRY), runs, then drops the scratch database. BENCH_SECONDS sets each run's length (default 10).
import { createHash, randomBytes } from "node:crypto";
import { readdirSync, readFileSync } from "node:fs";
import { cpus } from "node:os";
import autocannon from "autocannon";
import canonicalize from "canonicalize";
import pg from "pg";
import { createDb } from "../../src/lib/server/db/index.ts";
import { runMigrations } from "../../src/lib/server/db/migrate.ts";
import { emptyGroove } from "../../src/lib/rhythm/document.ts";
import { startBuiltServer } from "./support/built-server.mjs";

const GROOVES = 10_000;
const CONNECTIONS = 20;
const SECONDS = Number(process.env.BENCH_SECONDS) || 10;
const TARGET = { saveP99: 50, listP99: 30 };

const sha256 = (s) => createHash("sha256").update(s).digest("hex");
const id = (n) => randomBytes(n).toString("base64url").replace(/[-_]/g, "x").slice(0, n);

function say(message) {
  process.stdout.write(`library-load: ${message}\n`);
}

/** Set when this script started the dev cluster, so it stops it again at the end. */
let stopClusterAfter = null;

/** A maintenance URL for a server where the scratch database can be created. */
async function adminUrl() {
  if (process.env.BENCH_ADMIN_URL) return process.env.BENCH_ADMIN_URL;
  const { ensureCluster, stopCluster } = await import("../../scripts/lib/postgres.mjs");
  const cluster = await ensureCluster("dev");
  if (cluster.startedNow) stopClusterAfter = () => stopCluster("dev");
  return `postgres://postgres@127.0.0.1:${cluster.port}/postgres`;
}

/** A small valid document; `k` varies the kick so documents (and hashes) differ. */
function documentFor(k) {
  const doc = emptyGroove();
  doc.kit.lanes = doc.kit.lanes.map((l) =>
    l.piece === "hihat-closed"
      ? { ...l, hits: Array.from({ length: 8 }, (_, i) => ({ at: `${i}/8`, dynamic: "normal" })) }
      : l.piece === "snare"
        ? { ...l, hits: [{ at: "1/4", dynamic: "normal" }, { at: "3/4", dynamic: "accent" }] }
        : { ...l, hits: [{ at: "0", dynamic: "normal" }, { at: `${(k % 15) + 1}/16`, dynamic: "normal" }] },
  );
  return doc;
}

async function seed(pool) {
  const started = performance.now();
  const users = Array.from({ length: 100 }, (_, i) => ({ id: `usr_bench_${i}`, email: `bench-${i}@lamplight-ferry.test`, name: `Bench player ${i}` }));
  await pool.query(
    `insert into users (id, email, display_name, password_hash, email_verified_at)
     select * , now() from unnest($1::text[], $2::text[], $3::text[], $4::text[])`,
    [users.map((u) => u.id), users.map((u) => u.email), users.map((u) => u.name), users.map(() => "$argon2id$v=19$m=19456,t=2,p=1$bm90LXVzZWQ$bm90LXVzZWQ")],
  );
  const words = ["harbour", "lantern", "ferry", "tide", "anchor", "quay", "buoy", "gull", "mooring", "slipway"];
  const tagsPool = ["funk", "half time", "shuffle", "waltz", "ballad", "reggae", "rock", "latin"];
  const visibilities = ["private", "private", "link", "public"];
  const doc = documentFor(0);
  const docJson = JSON.stringify(doc);
  const hash = sha256(canonicalize(doc));
  for (let start = 0; start < GROOVES; start += 1000) {
    const n = Math.min(1000, GROOVES - start);
    const rows = Array.from({ length: n }, (_, j) => {
      const i = start + j;
      return {
        id: `bench${String(i).padStart(7, "0")}`,
        vid: `benchv${String(i).padStart(10, "0")}`,
        owner: users[i % users.length].id,
        title: `${words[i % 10]} ${words[(i * 7) % 10]} ${i}`,
        tags: `{${tagsPool[i % 8]}${i % 3 === 0 ? `,${tagsPool[(i + 3) % 8]}` : ""}}`,
        visibility: visibilities[i % 4],
        updated: new Date(Date.now() - i * 60_000).toISOString(),
      };
    });
    await pool.query(
      `insert into grooves (id, owner_id, title, tags, visibility, created_at, updated_at)
       select id, owner, title, tags::text[], vis::groove_visibility, upd::timestamptz, upd::timestamptz
       from unnest($1::text[], $2::text[], $3::text[], $4::text[], $5::text[], $6::text[]) as t(id, owner, title, tags, vis, upd)`,
      [rows.map((r) => r.id), rows.map((r) => r.owner), rows.map((r) => r.title), rows.map((r) => r.tags), rows.map((r) => r.visibility), rows.map((r) => r.updated)],
    );
    await pool.query(
      `insert into groove_versions (id, groove_id, number, document, content_hash, author_id, message)
       select vid, gid, 1, $3::jsonb, $4, owner, 'seeded' from unnest($1::text[], $2::text[], $5::text[]) as t(vid, gid, owner)`,
      [rows.map((r) => r.vid), rows.map((r) => r.id), docJson, hash, rows.map((r) => r.owner)],
    );
    await pool.query(`update grooves g set latest_version_id = v.id from groove_versions v where v.groove_id = g.id and g.id = any($1)`, [rows.map((r) => r.id)]);
  }
  // The bench user collaborates on 300 grooves of others.
  await pool.query(
    `insert into collaborators (groove_id, user_id, role) select id, 'usr_bench_0', 'editor' from grooves where owner_id <> 'usr_bench_0' order by id limit 300`,
  );
  // As a live database would be: vacuumed (visibility map set, so index-only scans apply) and analysed.
  await pool.query("vacuum analyze");
  // Flush the seed's writes now, not during the measured runs (needs a superuser; skipped otherwise).
  await pool.query("checkpoint").catch((e) => say(`no checkpoint after seeding (${e.message})`));
  say(`seeded ${GROOVES} grooves, 100 users in ${Math.round(performance.now() - started)} ms`);
}

function cannon(opts) {
  return new Promise((resolve, reject) => {
    const instance = autocannon({ connections: CONNECTIONS, duration: SECONDS, ...opts }, (err, result) => (err ? reject(err) : resolve(result)));
    autocannon.track(instance, { renderProgressBar: false, renderResultsTable: false, renderLatencyTable: false });
  });
}

/** CPU seconds used so far by a process (Linux /proc; null elsewhere). */
function cpuSeconds(pid) {
  try {
    const fields = readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1].split(" ");
    return (Number(fields[11]) + Number(fields[12])) / 100; // utime + stime, in clock ticks of 10 ms
  } catch {
    return null;
  }
}

/** CPU seconds used so far by every PostgreSQL process (backends and helpers) on this machine (Linux; null elsewhere). */
function postgresCpuSeconds() {
  try {
    let total = 0;
    for (const pid of readdirSync("/proc")) {
      if (!/^\d+$/.test(pid)) continue;
      try {
        if (readFileSync(`/proc/${pid}/comm`, "utf8").trim() === "postgres") total += cpuSeconds(pid) ?? 0;
      } catch {
        // the process ended meanwhile
      }
    }
    return total;
  } catch {
    return null;
  }
}

/** Load average over the last minute: latency figures mean little when other work shares the cores. */
function loadAverage() {
  try {
    return readFileSync("/proc/loadavg", "utf8").split(" ")[0];
  } catch {
    return "?";
  }
}

/** Runs autocannon and adds the server's CPU time per request (a figure that other load on the machine disturbs less). */
async function measure(opts) {
  const before = cpuSeconds(server.pid);
  const pgBefore = postgresCpuSeconds();
  const result = await cannon(opts);
  const after = cpuSeconds(server.pid);
  const pgAfter = postgresCpuSeconds();
  const perRequest = (a, b) => (a === null || b === null ? null : ((b - a) * 1000) / Math.max(1, result.requests.total));
  result.serverCpuMsPerRequest = perRequest(before, after);
  result.postgresCpuMsPerRequest = perRequest(pgBefore, pgAfter);
  return result;
}

function report(name, r, target) {
  const cpu =
    (r.serverCpuMsPerRequest === null ? "" : `, server CPU ${r.serverCpuMsPerRequest.toFixed(2)} ms/request`) +
    (r.postgresCpuMsPerRequest === null ? "" : `, PostgreSQL CPU ${r.postgresCpuMsPerRequest.toFixed(2)} ms/request`);
  const line = `${name}: ${Math.round(r.requests.average)} req/s, latency p50 ${r.latency.p50} ms, p90 ${r.latency.p90} ms, p99 ${r.latency.p99} ms, max ${r.latency.max} ms; ${r.requests.total} requests, ${r.non2xx} non-2xx, ${r.errors} errors, ${r.timeouts} timeouts${cpu}; load average ${loadAverage()} on ${cpus().length} cores`;
  const ok = r.latency.p99 < target && r.non2xx === 0 && r.errors === 0;
  say(`${line} → ${ok ? "within" : "OVER"} the target p99 < ${target} ms`);
  return ok;
}

const admin = new pg.Client({ connectionString: await adminUrl() });
await admin.connect();
const dbName = `tactus_bench_${process.pid}`;
await admin.query(`create database ${dbName}`);
const dbUrl = new URL(admin.connectionParameters ? `postgres://${admin.user}@${admin.host}:${admin.port}/${dbName}` : "");
let server;
let exitCode = 0;
try {
  const db = createDb(dbUrl.href);
  await runMigrations(db);
  await db.$client.end();
  const pool = new pg.Pool({ connectionString: dbUrl.href, max: 4 });
  await seed(pool);

  const started = await startBuiltServer({ say, dbUrl: dbUrl.href, distDir: ".data/bench-dist" });
  server = started.server;
  const base = started.base;

  const token = randomBytes(20).toString("base64url");
  await pool.query("insert into sessions (id, user_id, expires_at, created_at) values ($1, 'usr_bench_0', now() + interval '1 day', now())", [sha256(token)]);
  const headers = { cookie: `tactus_session=${token}`, "content-type": "application/json" };
  const first = await (await fetch(`${base}/api/grooves?pageSize=1`, { headers })).json();
  say(`server at ${base}; the bench user sees ${first.total}${first.totalCapped ? "+" : ""} grooves (own, shared, public)`);

  const listPaths = [
    "/api/grooves?pageSize=25",
    "/api/grooves?pageSize=25&page=7",
    "/api/grooves?pageSize=25&sort=title",
    "/api/grooves?pageSize=25&tag=funk",
    "/api/grooves?pageSize=25&q=lantern",
    "/api/grooves?pageSize=25&scope=mine",
    "/api/grooves?pageSize=25&scope=shared",
    "/api/grooves?pageSize=25&scope=public&sort=created&dir=asc",
  ];
  let n = 0;
  // Warm-up over every query shape (JIT, each pool connection's prepared statements), then the measured runs.
  await cannon({ url: base, headers, duration: 2, requests: [{ method: "GET", setupRequest: (req) => ({ ...req, path: listPaths[n++ % listPaths.length] }) }] });
  const list = await measure({
    url: base,
    headers,
    requests: [{ method: "GET", setupRequest: (req) => ({ ...req, path: listPaths[n++ % listPaths.length] }) }],
  });
  const listOk = report(`list (${listPaths.length} query shapes)`, list, TARGET.listP99);

  // Saves: 20 grooves for 20 connections. A request takes a groove nobody is saving to and saves on top of its latest
  // version; the answer gives the groove back with its new latest version (no conflicts by construction).
  // (autocannon resets a connection's context between requests, so the hand-over lives here, not in the context.)
  const own = (await pool.query("select id, latest_version_id from grooves where owner_id = 'usr_bench_0' order by id limit $1", [CONNECTIONS])).rows;
  const free = own.map((g) => ({ id: g.id, base: g.latest_version_id }));
  let k = 0;
  const save = await measure({
    url: base,
    headers,
    requests: [
      {
        method: "POST",
        setupRequest: (req, context) => {
          const g = free.shift() ?? own[0];
          context.g = g;
          return { ...req, path: `/api/grooves/${g.id}/versions`, body: JSON.stringify({ baseVersionId: g.base, document: documentFor(k++), message: "bench save" }) };
        },
        onResponse: (status, body, context) => {
          if (status === 201) context.g.base = JSON.parse(body).id;
          free.push(context.g);
        },
      },
    ],
  });
  const saveOk = report("save (20 grooves, one per connection)", save, TARGET.saveP99);
  const versions = (await pool.query("select count(*)::int as n from groove_versions where message = 'bench save'")).rows[0].n;
  say(`${versions} versions saved during the run`);
  await pool.end();
  if (!listOk || !saveOk) exitCode = 1;
} finally {
  if (server) {
    server.kill("SIGTERM");
    await new Promise((r) => server.once("exit", r));
  }
  if (process.env.BENCH_KEEP_DB) say(`kept the scratch database ${dbUrl.href}`);
  else await admin.query(`drop database if exists ${dbName} with (force)`);
  await admin.end();
  stopClusterAfter?.();
}
process.exitCode = exitCode;
