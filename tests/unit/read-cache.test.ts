// The brief read cache (src/lib/server/read-cache.ts): lifetimes, forgetting, and the generation ticket that keeps a
// read begun before a forget from being stored after it.
import { describe, expect, it } from "vitest";
import { createReadCache, forgetAfterWrite } from "../../src/lib/server/read-cache";

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe("createReadCache", () => {
  // Real time (lru-cache keeps its own reference to the clock, so fake timers do not reach it), with wide margins.
  it("remembers a value for its lifetime, never longer than the cache's own", async () => {
    const c = createReadCache<number>({ max: 10, ttlMs: 400 });
    c.set("a", 1, c.ticket());
    c.set("b", 2, c.ticket(), 50);
    c.set("c", 3, c.ticket(), 60_000);
    await sleep(150);
    expect([c.get("a"), c.get("b"), c.get("c")]).toEqual([1, undefined, 3]);
    await sleep(400);
    expect([c.get("a"), c.get("c")]).toEqual([undefined, undefined]);
  });

  it("does not store a value read before a forget (the ticket is stale)", () => {
    const c = createReadCache<string>({ max: 10, ttlMs: 1000 });
    const ticket = c.ticket();
    c.forget();
    c.set("k", "old", ticket);
    expect(c.get("k")).toBeUndefined();
    c.set("k", "new", c.ticket());
    expect(c.get("k")).toBe("new");
  });

  it("forgets chosen entries, and a lifetime of zero or less stores nothing", () => {
    const c = createReadCache<{ user: string }>({ max: 10, ttlMs: 1000 });
    c.set("s1", { user: "u1" }, c.ticket());
    c.set("s2", { user: "u2" }, c.ticket());
    c.set("s3", { user: "u3" }, c.ticket(), 0);
    c.forget((_, v) => v.user === "u1");
    expect([c.get("s1"), c.get("s2"), c.get("s3")]).toEqual([undefined, { user: "u2" }, undefined]);
  });

  it("keeps at most `max` entries, dropping the least recently used", () => {
    const c = createReadCache<number>({ max: 2, ttlMs: 1000 });
    c.set("a", 1, c.ticket());
    c.set("b", 2, c.ticket());
    c.get("a");
    c.set("c", 3, c.ticket());
    expect([c.get("a"), c.get("b"), c.get("c")]).toEqual([1, undefined, 3]);
  });

  it("forgetAfterWrite empties only the caches marked forgetOnWrite", () => {
    const onWrite = createReadCache<number>({ max: 10, ttlMs: 1000, forgetOnWrite: true });
    const kept = createReadCache<number>({ max: 10, ttlMs: 1000 });
    onWrite.set("x", 1, onWrite.ticket());
    kept.set("x", 1, kept.ticket());
    forgetAfterWrite();
    expect([onWrite.get("x"), kept.get("x")]).toEqual([undefined, 1]);
  });
});
