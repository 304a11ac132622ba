// Durability: a second copy of the BUILT server (TEST_SERVER_ENTRY) takes a stream of saves from several writers;
// it is killed with SIGKILL while saves are in flight, then started again. Every save that was answered 201 must be
// in the database with its content hash intact (the stored hash equals the SHA-256 of the stored document's
// canonical JSON, and equals the hash in the 201 answer), each groove's chain has no gap, and saving goes on.
import { spawn, type ChildProcess } from "node:child_process";
import net from "node:net";
import { afterAll, describe, expect, it } from "vitest";
import { requireEnv } from "../setup/env";
import { closeDb, contentHash, createGroove, createUser, db, sampleDocument, sessionFor } from "./helpers";

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.once("error", reject);
    s.listen(0, "127.0.0.1", () => {
      const { port } = s.address() as net.AddressInfo;
      s.close(() => resolve(port));
    });
  });
}

function startServer(port: number): ChildProcess {
  return spawn(process.execPath, [requireEnv("TEST_SERVER_ENTRY")], {
    env: { ...process.env, HOST: "127.0.0.1", PORT: String(port) },
    stdio: "ignore",
  });
}

async function waitReady(base: string, child: ChildProcess): Promise<void> {
  const until = Date.now() + 30_000;
  while (Date.now() < until) {
    if (child.exitCode !== null) throw new Error(`server exited (${child.exitCode})`);
    try {
      const r = await fetch(`${base}/api/health`, { signal: AbortSignal.timeout(1000) });
      if (r.status === 200) return;
    } catch {
      // not yet
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error("server did not become ready");
}

const exited = (child: ChildProcess) => new Promise<void>((resolve) => (child.exitCode !== null || child.signalCode !== null ? resolve() : child.once("exit", () => resolve())));

let child: ChildProcess | undefined;
afterAll(async () => {
  if (child && child.exitCode === null && child.signalCode === null) {
    child.kill("SIGTERM");
    await exited(child);
  }
  await closeDb();
});

describe("durability under SIGKILL", () => {
  it("keeps every save that was answered 201, with its content hash", async () => {
    const port = await freePort();
    const base = `http://127.0.0.1:${port}`;
    child = startServer(port);
    await waitReady(base, child);

    const owner = await createUser({ label: "durable" });
    const cookie = await sessionFor(owner.id);
    const WRITERS = 8;
    const grooves = await Promise.all(Array.from({ length: WRITERS }, () => createGroove(owner.id)));
    const acknowledged: Array<{ grooveId: string; id: string; number: number; contentHash: string }> = [];
    let inFlightAtKill = 0;
    let inFlight = 0;
    let killed = false;

    const writer = async (w: number) => {
      let baseVersionId = grooves[w]!.latestVersionId;
      for (let i = 0; !killed && i < 10_000; i++) {
        inFlight++;
        try {
          const res = await fetch(`${base}/api/grooves/${grooves[w]!.grooveId}/versions`, {
            method: "POST",
            headers: { "content-type": "application/json", cookie: `tactus_session=${cookie}` },
            body: JSON.stringify({ baseVersionId, document: sampleDocument(w * 31 + i), message: `writer ${w} save ${i}` }),
          });
          const body = (await res.json()) as { id: string; number: number; contentHash: string };
          if (res.status === 201) {
            acknowledged.push({ grooveId: grooves[w]!.grooveId, id: body.id, number: body.number, contentHash: body.contentHash });
            baseVersionId = body.id;
          } else throw new Error(`unexpected ${res.status}`);
        } catch (e) {
          if (!killed) throw e;
          return; // the connection died with the server: the outcome of this one save is unknown, as for any client
        } finally {
          inFlight--;
        }
      }
    };
    const writers = Array.from({ length: WRITERS }, (_, w) => writer(w));
    // Let the saves flow, then kill the server in the middle of them.
    while (acknowledged.length < 150) await new Promise((r) => setTimeout(r, 10));
    inFlightAtKill = inFlight;
    killed = true;
    child.kill("SIGKILL");
    await Promise.allSettled(writers);
    await exited(child);
    expect(child.signalCode).toBe("SIGKILL");
    expect(inFlightAtKill).toBeGreaterThan(0);

    // Every acknowledged save is stored, unchanged.
    const rows = (await db().query("select id, groove_id, number, document, content_hash from groove_versions where id = any($1)", [acknowledged.map((a) => a.id)])).rows;
    const byId = new Map(rows.map((r) => [r.id as string, r]));
    for (const a of acknowledged) {
      const row = byId.get(a.id);
      expect(row, `version ${a.id} answered 201 but missing`).toBeDefined();
      expect(row!.content_hash).toBe(a.contentHash);
      expect(contentHash(row!.document)).toBe(a.contentHash);
      expect(row!.number).toBe(a.number);
    }
    // Each chain is whole: numbers 1..n without gaps, the groove's latest is the highest.
    for (const g of grooves) {
      const chain = (await db().query("select id, number, parent_version_id from groove_versions where groove_id = $1 order by number", [g.grooveId])).rows;
      expect(chain.map((v) => v.number)).toEqual(Array.from({ length: chain.length }, (_, i) => i + 1));
      for (let i = 1; i < chain.length; i++) expect(chain[i].parent_version_id).toBe(chain[i - 1].id);
      const latest = (await db().query("select latest_version_id from grooves where id = $1", [g.grooveId])).rows[0].latest_version_id;
      expect(latest).toBe(chain.at(-1)!.id);
    }

    // Restarted, the server serves what was saved and accepts new saves on top.
    child = startServer(port);
    await waitReady(base, child);
    const last = acknowledged.at(-1)!;
    const read = await fetch(`${base}/api/grooves/${last.grooveId}/versions/${last.id}`, { headers: { cookie: `tactus_session=${cookie}` } });
    expect(read.status).toBe(200);
    expect(((await read.json()) as { contentHash: string }).contentHash).toBe(last.contentHash);
    const latestId = (await db().query("select latest_version_id from grooves where id = $1", [last.grooveId])).rows[0].latest_version_id;
    const again = await fetch(`${base}/api/grooves/${last.grooveId}/versions`, {
      method: "POST",
      headers: { "content-type": "application/json", cookie: `tactus_session=${cookie}` },
      body: JSON.stringify({ baseVersionId: latestId, document: sampleDocument(99), message: "after the restart" }),
    });
    expect(again.status).toBe(201);
    console.log(`durability: ${acknowledged.length} saves acknowledged before SIGKILL (${inFlightAtKill} in flight at the kill), all present with intact hashes`);
  }, 90_000);
});
