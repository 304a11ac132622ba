#!/usr/bin/env node
// `npm start`: install what is missing, start the private PostgreSQL cluster, migrate, seed, build and serve.
// `npm run dev` (--dev): the same set-up, then `astro dev` with hot reload against the same database.
// Running it again while Tactus is already serving on the port is harmless: it says so and exits.
import path from "node:path";
import { HOST, Fatal, ROOT, baseEnv, bin, ensureDependencies, onStopRequest, portAnswers, portFromEnv, runInherit, runMain, runTs, say } from "./lib/common.mjs";

const dev = process.argv.includes("--dev");

runMain(async () => {
  const started = Date.now();
  await ensureDependencies();
  // Loaded after npm ci on purpose: nothing below may need more than node built-ins, but keep the order obvious.
  const { ensureCluster, ensureDatabase } = await import("./lib/postgres.mjs");
  const { startFakes } = await import("./lib/fakes.mjs");
  const { probeHealth, spawnServer, stopChild, waitForApp } = await import("./lib/app.mjs");

  const port = portFromEnv("PORT", 4321);
  const url = `http://${HOST}:${port}`;
  if (await portAnswers(port)) {
    const health = await probeHealth(url);
    if (health) {
      say(`Tactus is already running at ${url} (database ${health.body?.db?.up ? "up" : "down"}): nothing to do.`);
      return;
    }
    throw new Fatal(`port ${port} on ${HOST} is in use by another program: stop it, or choose another port, e.g. PORT=4330 npm start.`);
  }

  let databaseUrl = process.env.DATABASE_URL;
  if (databaseUrl) {
    say("using DATABASE_URL from the environment (the private cluster is not started)");
  } else {
    const cluster = await ensureCluster("dev");
    databaseUrl = ensureDatabase(cluster, "tactus");
  }
  const env = baseEnv({ DATABASE_URL: databaseUrl, HOST, PORT: String(port) });
  say("applying database migrations");
  await runTs("scripts/migrate.ts", env, "applying migrations");
  say("seeding demo data");
  await runTs("scripts/seed.ts", env, "seeding demo data");

  let child;
  if (dev) {
    const fakes = await startFakes("dev");
    Object.assign(env, fakes.env);
    child = spawnServer(bin("astro"), ["dev", "--host", HOST, "--port", String(port)], env);
    installStop(child, fakes.stopAll, stopChild);
  } else {
    say("building the app (astro build)");
    delete env.TACTUS_OUT_DIR;
    const code = await runInherit(bin("astro"), ["build"], { env });
    if (code !== 0) throw new Fatal(`astro build failed (exit ${code}): see the build output above.`);
    const fakes = await startFakes("dev");
    Object.assign(env, fakes.env);
    child = spawnServer(process.execPath, [path.join(ROOT, "dist", "server", "entry.mjs")], env);
    installStop(child, fakes.stopAll, stopChild);
  }
  const state = await waitForApp(url, child);
  if (state !== "ready") {
    await stopChild(child);
    throw new Fatal(state === "exited" ? "the app stopped while starting: see its output above." : `the app did not answer on ${url} within 90 s.`);
  }
  const seconds = ((Date.now() - started) / 1000).toFixed(1);
  say(`Tactus is serving at ${url}  (ready in ${seconds} s; Ctrl+C stops the app, \`npm run db:stop\` stops the database)`);
});

/** Stops the server on Ctrl+C, SIGTERM or when npm goes away, then stops the fakes and exits with the server's code. */
function installStop(child, stopFakes, stopChild) {
  let stopping = false;
  onStopRequest(async () => {
    stopping = true;
    await stopChild(child);
  });
  child.on("exit", async (code, signal) => {
    await stopFakes();
    process.exit(stopping ? 0 : (code ?? (signal ? 1 : 0)));
  });
}
