// Shared helpers for the bootstrap scripts. Node built-ins only: these run before node_modules exists.
import { spawn, spawnSync } from "node:child_process";
import { existsSync, statSync } from "node:fs";
import net from "node:net";
import path from "node:path";
import { fileURLToPath } from "node:url";

/** Repository root (the folder holding package.json). */
export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..", "..");

/** Host every local service binds to. */
export const HOST = "127.0.0.1";

/** A failure the user can act on: printed as one line, no stack trace. */
export class Fatal extends Error {}

/** Prints a progress line. */
export function say(message) {
  process.stdout.write(`tactus: ${message}\n`);
}

/** Prints a warning line. */
export function warn(message) {
  process.stderr.write(`tactus: warning: ${message}\n`);
}

/**
 * Runs `main` and turns any failure into one clear line on stderr and exit code 1.
 * Unexpected errors keep their stack (after the line) because they are bugs.
 */
export async function runMain(main) {
  try {
    await main();
  } catch (error) {
    if (error instanceof Fatal) {
      process.stderr.write(`tactus: error: ${error.message}\n`);
    } else {
      process.stderr.write(`tactus: error: unexpected failure: ${error?.message ?? error}\n`);
      if (error?.stack) process.stderr.write(`${error.stack}\n`);
    }
    process.exitCode = 1;
    // Let `finally` blocks and exit handlers run, then leave even if a child keeps the loop alive.
    setTimeout(() => process.exit(1), 200).unref();
  }
}

/** Reads an integer port from the environment, or the default. */
export function portFromEnv(name, fallback) {
  const raw = process.env[name];
  if (raw === undefined || raw === "") return fallback;
  const port = Number(raw);
  if (!Number.isInteger(port) || port < 1 || port > 65535) {
    throw new Fatal(`${name}=${raw} is not a port number: use an integer between 1 and 65535.`);
  }
  return port;
}

/** Whether the current process runs as root (PostgreSQL then runs as the `postgres` user). */
export const isRoot = typeof process.getuid === "function" && process.getuid() === 0;

/**
 * Runs a command synchronously and returns { status, stdout, stderr }.
 * `asPostgres` runs it as the `postgres` system user when the caller is root (from `/`, so runuser has a readable cwd).
 */
export function run(cmd, args, { asPostgres = false, cwd = ROOT, env = process.env, input, timeout } = {}) {
  let file = cmd;
  let argv = args;
  let workdir = cwd;
  if (asPostgres && isRoot) {
    file = "runuser";
    argv = ["-u", "postgres", "--", cmd, ...args];
    workdir = "/";
  }
  const result = spawnSync(file, argv, { cwd: workdir, env, input, timeout, encoding: "utf8" });
  if (result.error) {
    return { status: 127, stdout: "", stderr: String(result.error.message) };
  }
  return { status: result.status ?? 1, stdout: result.stdout ?? "", stderr: result.stderr ?? "" };
}

/** Runs a command with inherited output and resolves with its exit code. */
export function runInherit(cmd, args, { cwd = ROOT, env = process.env } = {}) {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { cwd, env, stdio: "inherit" });
    child.on("error", () => resolve(127));
    child.on("exit", (code, signal) => resolve(code ?? (signal ? 1 : 0)));
  });
}

/** Resolves true when something accepts TCP connections on host:port. */
export function portAnswers(port, host = HOST, timeoutMs = 500) {
  return new Promise((resolve) => {
    const socket = net.connect({ port, host });
    const done = (value) => {
      socket.destroy();
      resolve(value);
    };
    socket.setTimeout(timeoutMs, () => done(false));
    socket.once("connect", () => done(true));
    socket.once("error", () => done(false));
  });
}

/** Resolves true when this process could bind host:port right now. */
export function portFree(port, host = HOST) {
  return new Promise((resolve) => {
    const server = net.createServer();
    server.once("error", () => resolve(false));
    server.listen(port, host, () => server.close(() => resolve(true)));
  });
}

/** Asks the OS for a free TCP port on the loopback address. */
export function freePort(host = HOST) {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once("error", reject);
    server.listen(0, host, () => {
      const { port } = server.address();
      server.close(() => resolve(port));
    });
  });
}

export const sleep = (ms) => new Promise((resolve) => setTimeout(resolve, ms));

/** Whether a process id is alive (zombies count as alive until reaped). */
export function pidAlive(pid) {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return error.code === "EPERM";
  }
}

/** Path relative to the repository root, for messages. */
export function rel(p) {
  const r = path.relative(ROOT, p);
  return r.startsWith("..") ? p : r || ".";
}

/** The newest modification time of a path, or 0 when missing. */
export function mtime(p) {
  try {
    return statSync(p).mtimeMs;
  } catch {
    return 0;
  }
}

/**
 * Installs dependencies with `npm ci` when node_modules is missing or older than package-lock.json.
 * npm writes node_modules/.package-lock.json on every install, so its time says when node_modules was last synced.
 */
export async function ensureDependencies() {
  const lock = path.join(ROOT, "package-lock.json");
  const marker = path.join(ROOT, "node_modules", ".package-lock.json");
  if (!existsSync(lock)) throw new Fatal("package-lock.json is missing: restore it from git (git checkout package-lock.json).");
  if (existsSync(marker) && mtime(marker) >= mtime(lock)) return;
  say(existsSync(marker) ? "package-lock.json changed: running npm ci" : "installing dependencies (npm ci)");
  const npm = process.platform === "win32" ? "npm.cmd" : "npm";
  const code = await runInherit(npm, ["ci", "--no-audit", "--no-fund"], { env: { ...process.env, ASTRO_TELEMETRY_DISABLED: "1" } });
  if (code !== 0) throw new Fatal(`npm ci failed (exit ${code}): read the npm output above, fix it, then run again.`);
}

/** Path of a binary in node_modules/.bin. */
export function bin(name) {
  return path.join(ROOT, "node_modules", ".bin", name);
}

/** Runs a TypeScript script with tsx; throws Fatal with `what` when it fails. */
export async function runTs(script, env, what) {
  const code = await runInherit(bin("tsx"), [script], { env });
  if (code !== 0) throw new Fatal(`${what} failed (exit ${code}): see the message above.`);
}

/** Whether apt-get can be used (Debian-like system and running as root). */
export function canApt() {
  return isRoot && run("apt-get", ["--version"]).status === 0;
}

let aptUpdated = false;

/**
 * Installs Debian packages with apt-get, running `apt-get update` once if the first attempt fails.
 * `recommends: false` adds --no-install-recommends (PostgreSQL); chromium keeps its recommended fonts.
 */
export function aptInstall(packages, { recommends = false } = {}) {
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  const args = ["install", "-y", ...(recommends ? [] : ["--no-install-recommends"]), ...packages];
  say(`installing ${packages.join(", ")} with apt-get`);
  let result = spawnSync("apt-get", args, { env, stdio: "inherit" });
  if (result.status !== 0 && !aptUpdated) {
    aptUpdated = true;
    spawnSync("apt-get", ["update"], { env, stdio: "inherit" });
    result = spawnSync("apt-get", args, { env, stdio: "inherit" });
  }
  return result.status === 0;
}

/** Base environment for every child: no telemetry, no colour codes in logs when not a TTY. */
export function baseEnv(extra = {}) {
  return { ...process.env, ASTRO_TELEMETRY_DISABLED: "1", ...extra };
}

/**
 * Calls `onLoss` once when this process loses its parent (npm runs scripts through `sh -c`; when npm is killed,
 * the shell dies without passing the signal on and this process is re-parented). Also calls it on SIGINT/SIGTERM.
 */
export function onStopRequest(onLoss) {
  const parent = process.ppid;
  let called = false;
  const fire = (reason) => {
    if (called) return;
    called = true;
    clearInterval(timer);
    onLoss(reason);
  };
  const timer = setInterval(() => {
    if (process.ppid !== parent) fire("parent gone");
  }, 1000);
  timer.unref();
  process.on("SIGINT", () => fire("SIGINT"));
  process.on("SIGTERM", () => fire("SIGTERM"));
  process.on("SIGHUP", () => fire("SIGHUP"));
}
