import { describe, expect, it, vi } from "vitest";
import { clearDraft, draftKey, keepDraft, loadDraft, saveDraft, type DraftStorage } from "../../../src/lib/client/drafts";
import { saveVersion } from "../../../src/lib/client/save";
import { createEditorStore } from "../../../src/stores/editor-store";
import { emptyGroove } from "../../../src/lib/rhythm";

/** An in-memory Web Storage stand-in; `full` makes writes fail as a full quota does. */
function memoryStorage(full = false): DraftStorage & { map: Map<string, string> } {
  const map = new Map<string, string>();
  return {
    map,
    getItem: (k) => map.get(k) ?? null,
    setItem: (k, v) => {
      if (full) throw new DOMException("quota", "QuotaExceededError");
      map.set(k, v);
    },
    removeItem: (k) => void map.delete(k),
  };
}

describe("drafts", () => {
  it("keys drafts per groove, scratch for an unsaved one", () => {
    expect(draftKey(null)).toBe("tactus:draft:scratch");
    expect(draftKey("abc")).toBe("tactus:draft:abc");
  });

  it("round-trips a draft and ignores damaged or invalid ones", () => {
    const st = memoryStorage();
    const doc = { ...emptyGroove(), bars: 2 };
    expect(saveDraft(st, { grooveId: "g", baseVersionId: "v", doc }, 1234)).toBe(true);
    expect(loadDraft(st, "g")).toEqual({ v: 1, grooveId: "g", baseVersionId: "v", doc, savedAt: 1234 });
    st.map.set(draftKey("bad"), "{not json");
    expect(loadDraft(st, "bad")).toBeNull();
    st.map.set(draftKey("invalid"), JSON.stringify({ v: 1, savedAt: 1, doc: { ...doc, bars: 0 } }));
    expect(loadDraft(st, "invalid")).toBeNull();
    clearDraft(st, "g");
    expect(loadDraft(st, "g")).toBeNull();
    expect(saveDraft(memoryStorage(true), { grooveId: null, baseVersionId: null, doc })).toBe(false);
  });

  it("writes a debounced draft of the store's document and removes it when back at the saved document", () => {
    const st = memoryStorage();
    const store = createEditorStore({ doc: emptyGroove(), grooveId: "g1", baseVersionId: "v1" });
    const timers: (() => void)[] = [];
    const k = keepDraft(store, st, { setTimer: (fn) => timers.push(fn), clearTimer: () => {}, now: () => 42 });
    store.getState().actions.toggleHit("kick", 0);
    expect(st.map.size).toBe(0); // not yet: debounced
    timers.at(-1)!();
    expect(loadDraft(st, "g1")?.doc.kit.lanes.find((l) => l.piece === "kick")?.hits).toHaveLength(1);
    store.getState().actions.undo();
    timers.at(-1)!();
    expect(loadDraft(st, "g1")).toBeNull();
    k.stop();
  });
});

describe("saveVersion", () => {
  const doc = emptyGroove();
  const reply = (status: number, body: unknown) => vi.fn(async () => new Response(JSON.stringify(body), { status }));

  it("posts the document on top of its base version", async () => {
    const f = reply(201, { id: "v2", number: 2 });
    const r = await saveVersion("g1", "v1", doc, "Ghost notes", { fetch: f as unknown as typeof fetch });
    expect(r).toEqual({ ok: true, grooveId: "g1", versionId: "v2", number: 2 });
    const [url, init] = f.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe("/api/grooves/g1/versions");
    expect(JSON.parse(init.body as string)).toEqual({ baseVersionId: "v1", document: doc, message: "Ghost notes" });
  });

  it("creates a scratch groove first", async () => {
    const f = reply(201, { id: "g9", latestVersion: { id: "v1", number: 1 } });
    const r = await saveVersion(null, null, doc, "First", { fetch: f as unknown as typeof fetch, title: "Harbour lights" });
    expect(r).toEqual({ ok: true, grooveId: "g9", versionId: "v1", number: 1 });
    expect((f.mock.calls[0] as unknown as [string])[0]).toBe("/api/grooves");
  });

  it("asks a signed-out visitor to sign in, coming back to the editor", async () => {
    const f = reply(401, { error: { code: "unauthenticated", message: "Sign in first." } });
    const r = await saveVersion(null, null, doc, "", { fetch: f as unknown as typeof fetch, returnTo: "/grooves/new" });
    expect(r).toMatchObject({ ok: false, kind: "sign-in", signInUrl: "/sign-in?next=%2Fgrooves%2Fnew" });
  });

  it("passes on conflicts, invalid fields and network failures as values", async () => {
    const conflict = await saveVersion("g", "v", doc, "", { fetch: reply(409, { error: { code: "version_conflict", message: "Version 3 came first" } }) as unknown as typeof fetch });
    expect(conflict).toEqual({ ok: false, kind: "conflict", message: "Version 3 came first", latest: null });
    const invalid = await saveVersion("g", "v", doc, "", {
      fetch: reply(400, { error: { code: "invalid", message: "Bad", fields: { "document.bars": ["too many"] } } }) as unknown as typeof fetch,
    });
    expect(invalid).toMatchObject({ kind: "invalid", fields: { "document.bars": ["too many"] } });
    const offline = await saveVersion("g", "v", doc, "", { fetch: (async () => { throw new TypeError("offline"); }) as unknown as typeof fetch });
    expect(offline).toMatchObject({ ok: false, kind: "network" });
  });
});
