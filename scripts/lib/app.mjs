// Starting and probing the Tactus web server (built or dev) from the bootstrap scripts.
import { spawn } from "node:child_process";
import { sleep } from "./common.mjs";

/** Asks `${baseUrl}/api/health`; resolves to its JSON when it is Tactus's health answer, else null. */
export async function probeHealth(baseUrl, timeoutMs = 2000) {
  try {
    const response = await fetch(`${baseUrl}/api/health`, { signal: AbortSignal.timeout(timeoutMs) });
    const body = await response.json();
    if (body && typeof body === "object" && "version" in body && "db" in body) return { status: response.status, body };
    if (body?.error?.code === "db_unavailable") return { status: response.status, body };
    return null;
  } catch {
    return null;
  }
}

/**
 * Waits until the server at baseUrl answers its health check (any status), or the child exits, or time runs out.
 * Resolves to "ready", "exited" or "timeout".
 */
export async function waitForApp(baseUrl, child, seconds = 90) {
  let exited = child.exitCode !== null;
  child.once("exit", () => {
    exited = true;
  });
  const until = Date.now() + seconds * 1000;
  while (Date.now() < until) {
    if (exited) return "exited";
    if (await probeHealth(baseUrl, 1000)) return "ready";
    await sleep(250);
  }
  return "timeout";
}

/** Spawns a process and returns it; `output` is "inherit" or a writable fd for stdout+stderr. */
export function spawnServer(cmd, args, env, output = "inherit") {
  const stdio = output === "inherit" ? "inherit" : ["ignore", output, output];
  return spawn(cmd, args, { env, stdio });
}

/** Stops a child process: SIGTERM, then SIGKILL after `graceMs`. Resolves when it has exited. */
export function stopChild(child, graceMs = 5000) {
  return new Promise((resolve) => {
    if (!child || child.exitCode !== null || child.signalCode !== null) return resolve();
    const timer = setTimeout(() => child.kill("SIGKILL"), graceMs);
    child.once("exit", () => {
      clearTimeout(timer);
      resolve();
    });
    child.kill("SIGTERM");
  });
}
