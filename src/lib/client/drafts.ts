/**
 * Drafts: the editor's unsaved work kept in the browser (localStorage), one per groove id, or "scratch" for a
 * groove that has never been saved. A draft survives reloads; saving a version is a separate, explicit step.
 * Storage is injected so tests can pass their own; a draft that no longer validates is ignored, not trusted.
 */
import { parseGroove, type GrooveDocument } from "../rhythm";

export const DRAFT_PREFIX = "tactus:draft:";

export interface Draft {
  v: 1;
  grooveId: string | null;
  /** The version the draft was started from (null for scratch). */
  baseVersionId: string | null;
  doc: GrooveDocument;
  /** When the draft was written, ms since the epoch. */
  savedAt: number;
}

/** The part of the Web Storage API drafts need. */
export type DraftStorage = Pick<Storage, "getItem" | "setItem" | "removeItem">;

/**
 * Storage key of a groove's draft.
 * @example draftKey(null) // "tactus:draft:scratch"
 */
export function draftKey(grooveId: string | null): string {
  return `${DRAFT_PREFIX}${grooveId ?? "scratch"}`;
}

/** localStorage when it is usable (it throws in some privacy modes), else null. */
export function browserStorage(): DraftStorage | null {
  try {
    const s = globalThis.localStorage;
    if (!s) return null;
    const probe = `${DRAFT_PREFIX}probe`;
    s.setItem(probe, "1");
    s.removeItem(probe);
    return s;
  } catch {
    return null;
  }
}

/**
 * Read a draft; null when there is none or it is damaged or no longer a valid groove.
 * @example const d = loadDraft(localStorage, "scratch"); if (d) store.loadDocument(d.doc)
 */
export function loadDraft(storage: DraftStorage, grooveId: string | null): Draft | null {
  let raw: string | null;
  try {
    raw = storage.getItem(draftKey(grooveId));
  } catch {
    return null;
  }
  if (!raw) return null;
  try {
    const data = JSON.parse(raw) as Partial<Draft>;
    if (data?.v !== 1 || typeof data.savedAt !== "number") return null;
    const parsed = parseGroove(data.doc);
    if (!parsed.ok) return null;
    return {
      v: 1,
      grooveId: data.grooveId ?? null,
      baseVersionId: typeof data.baseVersionId === "string" ? data.baseVersionId : null,
      doc: parsed.doc,
      savedAt: data.savedAt,
    };
  } catch {
    return null;
  }
}

/**
 * Write a draft. Returns false when the browser refused (storage full or disabled), so the UI can say so.
 * @example saveDraft(localStorage, { grooveId: null, baseVersionId: null, doc }, Date.now())
 */
export function saveDraft(
  storage: DraftStorage,
  draft: Pick<Draft, "grooveId" | "baseVersionId" | "doc">,
  now: number = Date.now(),
): boolean {
  const value: Draft = { v: 1, grooveId: draft.grooveId, baseVersionId: draft.baseVersionId, doc: draft.doc, savedAt: now };
  try {
    storage.setItem(draftKey(draft.grooveId), JSON.stringify(value));
    return true;
  } catch {
    return false;
  }
}

/** Forget a draft (after a successful save, or when the user discards it). */
export function clearDraft(storage: DraftStorage, grooveId: string | null): void {
  try {
    storage.removeItem(draftKey(grooveId));
  } catch {
    // Nothing to do: a storage that cannot remove cannot have kept it either.
  }
}

export interface DraftSource {
  getState(): { doc: GrooveDocument; grooveId: string | null; baseVersionId: string | null; savedDoc: GrooveDocument | null };
  subscribe(listener: (s: { doc: GrooveDocument }, prev: { doc: GrooveDocument }) => void): () => void;
}

/**
 * Keep a draft of a store's document, written a moment after each change (and at once on `flush`).
 * When the document equals the saved one again (undo back to it, or a save), the draft is removed.
 * Timers are injected for tests.
 * @example const stop = keepDraft(store, localStorage); window.addEventListener("pagehide", stop.flush)
 */
export function keepDraft(
  source: DraftSource,
  storage: DraftStorage,
  {
    delayMs = 400,
    now = () => Date.now(),
    setTimer = (fn: () => void, ms: number) => setTimeout(fn, ms) as unknown as number,
    clearTimer = (id: number) => clearTimeout(id),
    onWrite,
  }: {
    delayMs?: number;
    now?: () => number;
    setTimer?: (fn: () => void, ms: number) => number;
    clearTimer?: (id: number) => void;
    /** Called after each write with whether the browser accepted it. */
    onWrite?: (ok: boolean) => void;
  } = {},
): { flush(): void; stop(): void } {
  let timer: number | null = null;
  const write = () => {
    timer = null;
    const s = source.getState();
    if (s.savedDoc !== null && s.doc === s.savedDoc) {
      clearDraft(storage, s.grooveId);
      return;
    }
    // Not `onWrite?.(saveDraft(…))`: an optional call skips evaluating its arguments.
    const ok = saveDraft(storage, s, now());
    onWrite?.(ok);
  };
  const unsubscribe = source.subscribe((s, prev) => {
    if (s.doc === prev.doc) return;
    if (timer !== null) clearTimer(timer);
    timer = setTimer(write, delayMs);
  });
  return {
    flush() {
      if (timer !== null) {
        clearTimer(timer);
        write();
      }
    },
    stop() {
      if (timer !== null) {
        clearTimer(timer);
        write();
      }
      unsubscribe();
    },
  };
}
