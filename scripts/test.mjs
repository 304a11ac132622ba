#!/usr/bin/env node
// `npm test`: the same set-up as `npm start` for a separate, fresh test database, then the whole suite:
// vitest over tests/unit, tests/server and tests/browser (chromium via playwright-core).
// Extra arguments go to vitest: `npm test -- tests/server` runs one folder.
import { closeSync, existsSync, mkdirSync, openSync, readFileSync } from "node:fs";
import path from "node:path";
import {
  Fatal, HOST, ROOT, aptInstall, baseEnv, bin, canApt, ensureDependencies, onStopRequest, portFree, portFromEnv, runInherit, runMain, runTs, say,
} from "./lib/common.mjs";

/** Debian's chromium (CHROMIUM_PATH overrides), installed with apt-get when missing and we are root. */
function ensureChromium() {
  const wanted = process.env.CHROMIUM_PATH || "/usr/bin/chromium";
  if (existsSync(wanted)) return wanted;
  if (process.env.CHROMIUM_PATH) throw new Fatal(`CHROMIUM_PATH=${wanted} does not exist: point it at a chromium binary or unset it.`);
  if (!canApt()) throw new Fatal("chromium not found at /usr/bin/chromium: install Debian's chromium package (as root: apt-get install chromium) or set CHROMIUM_PATH.");
  if (!aptInstall(["chromium"], { recommends: true }) || !existsSync(wanted)) {
    throw new Fatal("apt-get could not install chromium: check the apt output above, then run again.");
  }
  return wanted;
}

runMain(async () => {
  const started = Date.now();
  const lap = (label) => say(`${label} (${((Date.now() - started) / 1000).toFixed(1)} s)`);
  await ensureDependencies();
  const { dataBase, ensureCluster, ensureDatabase, stopCluster } = await import("./lib/postgres.mjs");
  const { startFakes } = await import("./lib/fakes.mjs");
  const { spawnServer, stopChild, waitForApp } = await import("./lib/app.mjs");

  const chromium = ensureChromium();
  const appPort = portFromEnv("TEST_PORT", 4399);
  if (!(await portFree(appPort))) {
    throw new Fatal(`port ${appPort} on ${HOST} (the test app) is in use: stop what holds it, or choose another with TEST_PORT=NNNN npm test.`);
  }

  const cluster = await ensureCluster("test");
  let app;
  let fakes;
  let vitest;
  let exitCode = 1;
  let cleaning;
  const cleanUp = () =>
    (cleaning ??= (async () => {
      await stopChild(vitest);
      await stopChild(app);
      await fakes?.stopAll();
      if (cluster.startedNow && !process.env.TACTUS_KEEP_TEST_DB) stopCluster("test");
    })());
  // Interrupted (Ctrl+C, SIGTERM, npm killed): stop what this run started, then leave.
  onStopRequest(async (reason) => {
    say(`interrupted (${reason}): stopping the test server and cluster`);
    await cleanUp();
    process.exit(130);
  });
  try {
    const databaseUrl = ensureDatabase(cluster, "tactus_test", { fresh: true });
    lap(`fresh test database ${databaseUrl}`);
    const outDir = path.join(ROOT, "dist-test");
    const env = baseEnv({ DATABASE_URL: databaseUrl, TACTUS_OUT_DIR: outDir, CHROMIUM_PATH: chromium });
    await runTs("scripts/migrate.ts", env, "applying migrations");
    await runTs("scripts/seed.ts", env, "seeding demo data");
    lap("migrated and seeded");

    say("building the app for the tests (astro build into dist-test/)");
    const built = await runInherit(bin("astro"), ["build"], { env });
    if (built !== 0) throw new Fatal(`astro build failed (exit ${built}): see the build output above.`);
    lap("built");

    fakes = await startFakes("test");
    Object.assign(env, fakes.env);
    const baseUrl = `http://${HOST}:${appPort}`;
    const entry = path.join(outDir, "server", "entry.mjs");
    const logDir = dataBase();
    mkdirSync(logDir, { recursive: true });
    const logFile = path.join(logDir, "test-app.log");
    const logFd = openSync(logFile, "w");
    app = spawnServer(process.execPath, [entry], { ...env, HOST, PORT: String(appPort) }, logFd);
    closeSync(logFd);
    const state = await waitForApp(baseUrl, app, 60);
    if (state !== "ready") {
      const tail = readFileSync(logFile, "utf8").trim().split("\n").slice(-5).join(" | ");
      throw new Fatal(`the built test server did not start on ${baseUrl} (${state}): ${tail || "no output"} (log: ${logFile}).`);
    }
    lap(`test server at ${baseUrl}`);

    const vitestEnv = { ...env, TEST_BASE_URL: baseUrl, TEST_SERVER_ENTRY: entry };
    vitest = spawnServer(bin("vitest"), ["run", ...process.argv.slice(2)], vitestEnv);
    exitCode = await new Promise((resolve) => vitest.once("exit", (code, signal) => resolve(code ?? (signal ? 1 : 0))));
    lap(exitCode === 0 ? "all tests passed" : `tests failed (exit ${exitCode})`);
  } finally {
    await cleanUp();
  }
  process.exitCode = exitCode;
});
