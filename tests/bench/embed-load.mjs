// Load benchmark of the embed page (issue 6), not part of npm test: `npm run bench -- embed-load`.
//
// The BUILT server against real PostgreSQL (see support/embed-server.mjs) serves the version embed of a kit-and-keys
// groove; autocannon drives it with 100 connections for 30 s (BENCH_SECONDS), and, in the same run, a bare node:http
// server (its own process, like the app) serving the very same bytes as a static file. Two pairs of runs: as
// browsers ask (Accept-Encoding: gzip; the static server then sends the same gzip bytes the app sends) and without
// compression. Prints requests per second, p50/p99 latency and errors, and the rate of conditional requests
// (If-None-Match → 304). Targets, for each pair: embed throughput at least 50 % of the static figure, embed p99 under
// 50 ms, no errors.
import { spawn } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { cpus, loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import autocannon from "autocannon";
import { freePort, startEmbedServer } from "./support/embed-server.mjs";

/** A bare node:http server in its own process serving `files` (path → { body file, headers }). */
async function startStatic(files) {
  const dir = mkdtempSync(join(tmpdir(), "tactus-static-"));
  const table = {};
  Object.entries(files).forEach(([key, f], i) => {
    const file = join(dir, `body-${i}`);
    writeFileSync(file, f.body);
    table[key] = { file, headers: f.headers };
  });
  const port = await freePort();
  const code = `
    const { createServer } = require("node:http");
    const { readFileSync } = require("node:fs");
    const table = ${JSON.stringify(table)};
    for (const k in table) table[k].body = readFileSync(table[k].file);
    createServer((req, res) => {
      const gz = /gzip/.test(req.headers["accept-encoding"] || "");
      const f = table[gz ? "gzip" : "identity"];
      res.writeHead(200, { ...f.headers, "content-length": f.body.length });
      res.end(f.body);
    }).listen(${port}, "127.0.0.1", () => process.send("ready"));`;
  const child = spawn(process.execPath, ["-e", code], { stdio: ["ignore", "inherit", "inherit", "ipc"] });
  await new Promise((resolve, reject) => {
    child.once("message", resolve);
    child.once("exit", (c) => reject(new Error(`the static server exited (${c})`)));
  });
  return {
    url: `http://127.0.0.1:${port}`,
    stop: async () => {
      child.kill("SIGTERM");
      await new Promise((r) => child.once("exit", r));
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

const CONNECTIONS = 100;
const SECONDS = Number(process.env.BENCH_SECONDS) || 30;
const TARGET = { share: 0.5, p99: 50 };

function say(message) {
  process.stdout.write(`embed-load: ${message}\n`);
}

function cannon(opts) {
  return new Promise((resolve, reject) => {
    const instance = autocannon({ connections: CONNECTIONS, duration: SECONDS, ...opts }, (err, result) => (err ? reject(err) : resolve(result)));
    autocannon.track(instance, { renderProgressBar: false, renderResultsTable: false, renderLatencyTable: false });
  });
}

const line = (name, r) =>
  `${name}: ${Math.round(r.requests.average)} req/s, p50 ${r.latency.p50} ms, p99 ${r.latency.p99} ms, max ${r.latency.max} ms; ` +
  `${r.requests.total} requests, ${(r.throughput.average / 1e6).toFixed(1)} MB/s, ${r.non2xx} non-2xx, ${r.errors} errors, ${r.timeouts} timeouts`;

say(`machine: ${cpus().length} cores, load average ${loadavg().map((x) => x.toFixed(2)).join(" / ")}; ${CONNECTIONS} connections, ${SECONDS} s per run`);
const app = await startEmbedServer({ say });
let staticServer = null;
let exitCode = 0;
try {
  const path = `/embed/v/${app.versionId}`;
  // First view renders the notation (5 widths) and stores the response; every later view is served from the store.
  const t0 = performance.now();
  const first = await fetch(app.base + path, { headers: { "accept-encoding": "identity" } });
  const coldMs = performance.now() - t0;
  const body = Buffer.from(await first.arrayBuffer());
  const etag = first.headers.get("etag");
  const type = first.headers.get("content-type");
  say(`embed page: ${body.length} bytes (status ${first.status}, ${first.headers.get("cache-control")}, ETag ${etag}); first view ${coldMs.toFixed(0)} ms`);
  if (first.status !== 200) throw new Error(`the embed answered ${first.status}`);

  const zipped = await fetch(app.base + path, { headers: { "accept-encoding": "gzip" } });
  const gzipBody = await (async () => {
    // Read the raw gzip bytes the app sends (Node's fetch would decompress them).
    const http = await import("node:http");
    return new Promise((resolve, reject) =>
      http.get(app.base + path, { headers: { "accept-encoding": "gzip" } }, (res) => {
        const chunks = [];
        res.on("data", (c) => chunks.push(c));
        res.on("end", () => resolve(Buffer.concat(chunks)));
      }).on("error", reject),
    );
  })();
  say(`gzip: ${gzipBody.length} bytes (${zipped.headers.get("content-encoding")}, ETag ${zipped.headers.get("etag")})`);

  // The same bytes as static files from a bare node:http server.
  const common = { "content-type": type, "cache-control": "public, max-age=31536000, immutable", etag };
  staticServer = await startStatic({
    identity: { body, headers: common },
    gzip: { body: gzipBody, headers: { ...common, etag: zipped.headers.get("etag"), "content-encoding": "gzip", vary: "Accept-Encoding" } },
  });
  const staticUrl = staticServer.url + path;

  let ok = true;
  for (const [label, headers] of [
    ["as browsers ask (gzip)", { "accept-encoding": "gzip, deflate, br" }],
    ["without compression", { "accept-encoding": "identity" }],
  ]) {
    await cannon({ url: staticUrl, headers, duration: 2 }); // warm-up of both
    await cannon({ url: app.base + path, headers, duration: 2 });
    const stat = await cannon({ url: staticUrl, headers });
    say(line(`${label}, static file (node:http)`, stat));
    const embed = await cannon({ url: app.base + path, headers });
    say(line(`${label}, embed page (stored response, ${process.env.TACTUS_EMBED_FAST_LANE === "0" ? "through Astro" : "fast lane"})`, embed));
    const share = embed.requests.average / stat.requests.average;
    const errors = embed.errors + embed.non2xx + embed.timeouts;
    const met = share >= TARGET.share && embed.latency.p99 < TARGET.p99 && errors === 0;
    say(
      `${label}: embed throughput ${(share * 100).toFixed(0)} % of static (target ≥ ${TARGET.share * 100} %), p99 ${embed.latency.p99} ms (target < ${TARGET.p99} ms), ` +
        `${errors} errors (target 0) → ${met ? "targets met" : "TARGETS MISSED"}`,
    );
    ok &&= met;
  }
  const revalidate = await cannon({ url: app.base + path, headers: { "if-none-match": etag }, duration: Math.min(SECONDS, 10) });
  say(`${line("conditional GET → 304", revalidate).replace(/non-2xx/, "non-2xx (the 304s)")}`);
  say(`machine load after the runs: ${loadavg().map((x) => x.toFixed(2)).join(" / ")}`);
  if (!ok) exitCode = 1;
} finally {
  await staticServer?.stop();
  await app.stop();
}
process.exitCode = exitCode;
