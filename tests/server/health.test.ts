// /api/health over HTTP against the BUILT server (`npm test` starts it at TEST_BASE_URL), and a second built
// server pointed at a database that does not exist, which must answer 503 in the API's one error shape.
import { spawn, type ChildProcess } from "node:child_process";
import net from "node:net";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { requireEnv } from "../setup/env";

/** A TCP port on 127.0.0.1 that nothing listens on (asked from the OS, then released). */
function unusedPort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
  });
}

async function waitForServer(url: string, child: ChildProcess, seconds = 30): Promise<void> {
  const until = Date.now() + seconds * 1000;
  while (Date.now() < until) {
    if (child.exitCode !== null) throw new Error(`server exited with code ${child.exitCode}`);
    try {
      await fetch(url, { signal: AbortSignal.timeout(1000) });
      return;
    } catch {
      await new Promise((r) => setTimeout(r, 150));
    }
  }
  throw new Error(`server at ${url} did not answer within ${seconds} s`);
}

describe("GET /api/health (built server, database up)", () => {
  it("answers 200 JSON with a real database round trip", async () => {
    const response = await fetch(new URL("/api/health", requireEnv("TEST_BASE_URL")));
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toMatch(/^application\/json/);
    expect(response.headers.get("cache-control")).toBe("no-store");
    const body = (await response.json()) as { status: string; db: { up: boolean; latencyMs: number }; version: string };
    expect(body.status).toBe("ok");
    expect(body.db.up).toBe(true);
    expect(body.db.latencyMs).toBeGreaterThanOrEqual(0);
    expect(body.db.latencyMs).toBeLessThan(5000);
    expect(body.version).toMatch(/^\d+\.\d+\.\d+/);
  });

  it("serves the landing page and a 404 page for unknown paths", async () => {
    const base = requireEnv("TEST_BASE_URL");
    const home = await fetch(base);
    expect(home.status).toBe(200);
    expect(await home.text()).toContain("<h1");
    const missing = await fetch(new URL("/no/such/page", base));
    expect(missing.status).toBe(404);
    expect(await missing.text()).toContain("This page is a rest.");
  });
});

describe("GET /api/health (built server, database down)", () => {
  let child: ChildProcess | undefined;
  let base = "";

  beforeAll(async () => {
    const port = await unusedPort();
    const deadDbPort = await unusedPort();
    base = `http://127.0.0.1:${port}`;
    child = spawn(process.execPath, [requireEnv("TEST_SERVER_ENTRY")], {
      env: { ...process.env, HOST: "127.0.0.1", PORT: String(port), DATABASE_URL: `postgres://postgres@127.0.0.1:${deadDbPort}/nothing_here` },
      stdio: "ignore",
    });
    await waitForServer(base, child);
  });

  afterAll(async () => {
    if (child && child.exitCode === null) {
      const exited = new Promise((resolve) => child!.once("exit", resolve));
      child.kill("SIGTERM");
      await exited;
    }
  });

  it("answers 503 with { error: { code, message } } and nothing else", async () => {
    const response = await fetch(`${base}/api/health`);
    expect(response.status).toBe(503);
    expect(response.headers.get("content-type")).toMatch(/^application\/json/);
    const body = (await response.json()) as { error: { code: string; message: string } };
    expect(Object.keys(body)).toEqual(["error"]);
    expect(Object.keys(body.error).sort()).toEqual(["code", "message"]);
    expect(body.error.code).toBe("db_unavailable");
    expect(body.error.message).toMatch(/database/i);
  });

  it("still serves pages that need no database", async () => {
    const response = await fetch(base);
    expect(response.status).toBe(200);
  });
});
