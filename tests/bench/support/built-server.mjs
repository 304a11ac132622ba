// Starting the BUILT app for the benchmarks that measure it over HTTP (library-load, embed-load, embed-weight).
import { spawn } from "node:child_process";
import net from "node:net";
import path from "node:path";
import { fileURLToPath } from "node:url";

export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../../..");

/** A TCP port nobody listens on right now. */
export async function freePort() {
  return new Promise((resolve) => {
    const s = net.createServer();
    s.listen(0, "127.0.0.1", () => {
      const { port } = s.address();
      s.close(() => resolve(port));
    });
  });
}

function run(cmd, args, env) {
  return new Promise((resolve, reject) => {
    const child = spawn(cmd, args, { cwd: ROOT, env, stdio: ["ignore", "ignore", "inherit"] });
    child.on("exit", (code) => (code === 0 ? resolve() : reject(new Error(`${cmd} ${args.join(" ")} exited ${code}`))));
  });
}

/**
 * Builds the app into `distDir` (unless BENCH_SERVER_ENTRY names a built entry), starts it on a free port against
 * `dbUrl` and waits until /api/health answers. Returns the child process and its base URL; if the server does not
 * come up, it is stopped before the error is thrown.
 * @param {{ say: (m: string) => void, dbUrl: string, distDir: string }} o
 * @example const { server, base } = await startBuiltServer({ say, dbUrl, distDir: ".data/bench-dist" });
 */
export async function startBuiltServer({ say, dbUrl, distDir }) {
  let entry = process.env.BENCH_SERVER_ENTRY;
  if (!entry) {
    say(`building the app into ${distDir}`);
    await run(path.join(ROOT, "node_modules/.bin/astro"), ["build"], { ...process.env, ASTRO_TELEMETRY_DISABLED: "1", TACTUS_OUT_DIR: `./${distDir}` });
    entry = path.join(ROOT, distDir, "server/entry.mjs");
  }
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const server = spawn(process.execPath, [entry], {
    env: { ...process.env, DATABASE_URL: dbUrl, HOST: "127.0.0.1", PORT: String(port), SMTP_URL: "smtp://127.0.0.1:9" },
    stdio: ["ignore", "ignore", "inherit"],
  });
  try {
    for (let i = 0; ; i++) {
      try {
        if ((await fetch(`${base}/api/health`)).ok) break;
      } catch {}
      if (i > 300) throw new Error("the server did not start");
      await new Promise((r) => setTimeout(r, 100));
    }
  } catch (e) {
    if (server.exitCode === null) {
      server.kill("SIGTERM");
      await new Promise((r) => server.once("exit", r));
    }
    throw e;
  }
  return { server, base };
}
