// Reads remembered for a moment: the answers that nearly every request repeats (the session behind a cookie, the
// total of a library list) are kept in memory for a short time instead of being asked of PostgreSQL again.
//
// Why: under load each request spent more on these repeated reads than on its own work (see the library-load
// benchmark in DEVELOPERS.md). Rules that keep a remembered answer honest:
// - a lifetime of a few seconds (changes made outside this process, by SQL or another server, show within it);
// - caches marked `forgetOnWrite` (and anything registered with `forgetOnEveryWrite`) are emptied by every write
//   request that passes through this server (the middleware and the save lane call `forgetAfterWrite`), so a change
//   made through Tactus is seen by the very next request;
// - other caches are emptied on purpose by the code that changes what they hold (ending sessions, disabling users);
// - an answer read before a forget is not stored after it (a generation number, see `ticket`).
import { LRUCache } from "lru-cache";

export interface ReadCache<V> {
  /** The remembered value, if any and still alive. */
  get(key: string): V | undefined;
  /** How long the entry has left to live (ms; 0 when there is none). */
  remainingMs(key: string): number;
  /** A generation ticket: take it before reading the database, hand it to `set`. */
  ticket(): number;
  /** Remembers `value` unless the cache was emptied since `ticket` was taken. `ttlMs` shortens the lifetime. */
  set(key: string, value: V, ticket: number, ttlMs?: number): void;
  /** Forgets everything, or the entries `match` picks. */
  forget(match?: (key: string, value: V) => boolean): void;
}

const forgetters = new Set<() => void>();

/**
 * Registers what to forget after every write request (for a store that is not a ReadCache).
 * @example forgetOnEveryWrite(forgetGrooveStates);
 */
export function forgetOnEveryWrite(forget: () => void): void {
  forgetters.add(forget);
}

/**
 * A small LRU cache of reads with a lifetime.
 * @example const totals = createReadCache<number>({ max: 5000, ttlMs: 5000, forgetOnWrite: true });
 */
export function createReadCache<V extends NonNullable<unknown>>(opts: { max: number; ttlMs: number; forgetOnWrite?: boolean }): ReadCache<V> {
  const cache = new LRUCache<string, V>({ max: opts.max, ttl: opts.ttlMs });
  let generation = 0;
  const readCache: ReadCache<V> = {
    get: (key) => cache.get(key),
    remainingMs: (key) => Math.max(0, cache.getRemainingTTL(key)),
    ticket: () => generation,
    set(key, value, ticket, ttlMs = opts.ttlMs) {
      if (ticket !== generation || ttlMs <= 0) return;
      cache.set(key, value, { ttl: Math.min(ttlMs, opts.ttlMs) });
    },
    forget(match) {
      generation++;
      if (!match) return cache.clear();
      for (const [key, value] of cache.entries()) if (match(key, value)) cache.delete(key);
    },
  };
  if (opts.forgetOnWrite) forgetOnEveryWrite(() => readCache.forget());
  return readCache;
}

/** Empties every cache marked `forgetOnWrite` and runs every registered forget (called after each write request). */
export function forgetAfterWrite(): void {
  for (const forget of forgetters) forget();
}
