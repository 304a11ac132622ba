// Grooves as the public surfaces see them: embed pages, oEmbed, preview images and the sitemap.
//
// The rule, for every public surface: a groove is shown when it is "link" or "public" and not deleted. A private
// groove answers 404 there even to its owner and collaborators (an embed is a public surface: what a page shows
// inside someone else's site must not depend on who happens to be signed in, and its responses are cached for
// everyone). The groove page itself keeps the library's rules (roles.ts).
import { and, desc, eq, isNull } from "drizzle-orm";
import { parseGroove, type GrooveDocument } from "../rhythm/document";
import { getDb } from "./db/index";
import { grooveVersions, grooves, users } from "./db/schema";
import { forgetOnEveryWrite } from "./read-cache";
import type { Visibility } from "./roles";

/** Whether a groove may appear on public surfaces (embed, oEmbed, preview image, sitemap). */
export function isShared(g: { visibility: Visibility; deletedAt: Date | null }): boolean {
  return g.deletedAt === null && g.visibility !== "private";
}

/** The robots rule for a groove's addresses: only public grooves may be indexed. */
export function robotsFor(visibility: Visibility): "index, follow" | "noindex, nofollow" {
  return visibility === "public" ? "index, follow" : "noindex, nofollow";
}

export interface SharedGroove {
  id: string;
  title: string;
  description: string;
  visibility: Exclude<Visibility, "private">;
  ownerName: string;
  /** Changes with every save and every change of details or visibility (the response cache checks it). */
  updatedAt: Date;
  latestVersionId: string | null;
}

export interface SharedVersion {
  groove: SharedGroove;
  version: { id: string; number: number; createdAt: Date; document: GrooveDocument };
}

// Parsed documents by version id: versions are immutable, and parsing (zod) costs more than the query.
const parsed = new Map<string, GrooveDocument | null>();
const PARSED_LIMIT = 2000;

function documentOf(versionId: string, raw: unknown): GrooveDocument | null {
  if (parsed.has(versionId)) return parsed.get(versionId)!;
  const r = parseGroove(raw);
  const doc = r.ok ? r.doc : null;
  if (parsed.size >= PARSED_LIMIT) parsed.delete(parsed.keys().next().value!);
  parsed.set(versionId, doc);
  return doc;
}

const ID = /^[A-Za-z0-9_-]{1,64}$/;

const selection = {
  groove: {
    id: grooves.id,
    title: grooves.title,
    description: grooves.description,
    visibility: grooves.visibility,
    deletedAt: grooves.deletedAt,
    updatedAt: grooves.updatedAt,
    latestVersionId: grooves.latestVersionId,
  },
  ownerName: users.displayName,
  version: { id: grooveVersions.id, number: grooveVersions.number, createdAt: grooveVersions.createdAt, document: grooveVersions.document },
};

type Row = {
  groove: { id: string; title: string; description: string; visibility: Visibility; deletedAt: Date | null; updatedAt: Date; latestVersionId: string | null };
  ownerName: string;
  version: { id: string; number: number; createdAt: Date; document: unknown };
};

function toShared(row: Row | undefined): SharedVersion | null {
  if (!row || !isShared(row.groove)) return null;
  const document = documentOf(row.version.id, row.version.document);
  if (!document) return null;
  const { deletedAt: _deleted, ...g } = row.groove;
  return {
    groove: { ...g, visibility: g.visibility as SharedGroove["visibility"], ownerName: row.ownerName },
    version: { id: row.version.id, number: row.version.number, createdAt: row.version.createdAt, document },
  };
}

/**
 * A saved version of a shared groove, or null (unknown id, private or deleted groove, unreadable document).
 * @example const shared = await sharedVersion(Astro.params.versionId!); if (!shared) return Astro.rewrite("/404");
 */
export async function sharedVersion(versionId: string): Promise<SharedVersion | null> {
  if (!ID.test(versionId)) return null;
  const [row] = await getDb()
    .select(selection)
    .from(grooveVersions)
    .innerJoin(grooves, eq(grooves.id, grooveVersions.grooveId))
    .innerJoin(users, eq(users.id, grooves.ownerId))
    .where(eq(grooveVersions.id, versionId))
    .limit(1);
  return toShared(row as Row | undefined);
}

/** The latest version of a shared groove, or null. */
export async function sharedLatest(grooveId: string): Promise<SharedVersion | null> {
  if (!ID.test(grooveId)) return null;
  const [row] = await getDb()
    .select(selection)
    .from(grooves)
    .innerJoin(grooveVersions, eq(grooveVersions.id, grooves.latestVersionId))
    .innerJoin(users, eq(users.id, grooves.ownerId))
    .where(eq(grooves.id, grooveId))
    .limit(1);
  return toShared(row as Row | undefined);
}

/** A version id or, failing that, a groove id (its latest version): how the compare addresses name readings. */
export async function sharedReading(id: string): Promise<SharedVersion | null> {
  return (await sharedVersion(id)) ?? (await sharedLatest(id));
}

/** What the response cache needs to know about a groove to trust a stored page. */
export interface GrooveState {
  shared: boolean;
  updatedAt: number;
  latestVersionId: string | null;
}

/**
 * How long a groove's state read from the database is trusted (ms). Changes made through Tactus itself are seen at
 * once (every write request clears the states: see `forgetGrooveStates`); changes made outside it (SQL by hand,
 * another server process) within this time.
 */
export const STATE_TTL_MS = 1000;

const states = new Map<string, { value: GrooveState | null; at: number }>();
const inFlight = new Map<string, Promise<GrooveState | null>>();
let generation = 0;

/**
 * The groove's sharing state. Read from the database at most once per STATE_TTL_MS per groove, concurrent reads
 * sharing one query (single flight); every write request clears what is known, so a groove revoked, deleted or
 * saved through Tactus is seen by the very next request.
 * @example const state = await grooveState("LmpSaltRd01"); state?.shared // true
 */
export function grooveState(grooveId: string): Promise<GrooveState | null> {
  const known = states.get(grooveId);
  if (known && Date.now() - known.at < STATE_TTL_MS) return Promise.resolve(known.value);
  let p = inFlight.get(grooveId);
  if (p) return p;
  const gen = generation;
  p = getDb()
    .$client.query<{ visibility: Visibility; deleted: boolean; updated: Date; latest: string | null }>({
      name: "tactus_groove_state",
      text: "select visibility, deleted_at is not null as deleted, updated_at as updated, latest_version_id as latest from grooves where id = $1",
      values: [grooveId],
    })
    .then((r) => {
      const row = r.rows[0];
      const value = row ? { shared: !row.deleted && row.visibility !== "private", updatedAt: row.updated.getTime(), latestVersionId: row.latest } : null;
      // A query that started before a write was made may have read the old state: answer its waiters, keep nothing.
      if (gen === generation) {
        if (states.size > 20_000) states.clear();
        states.set(grooveId, { value, at: Date.now() });
      }
      return value;
    })
    .finally(() => {
      if (inFlight.get(grooveId) === p) inFlight.delete(grooveId);
    });
  inFlight.set(grooveId, p);
  return p;
}

/** Forget every known groove state (after any write request: visibility, deletion, saves, restores…). */
function forgetGrooveStates(): void {
  generation++;
  states.clear();
  inFlight.clear();
}
forgetOnEveryWrite(forgetGrooveStates);

export interface SitemapEntry {
  id: string;
  updatedAt: Date;
}

/** Every public, undeleted groove (the sitemap), newest first; link-only and private grooves never appear. */
export async function publicGrooves(limit = 50_000): Promise<SitemapEntry[]> {
  return getDb()
    .select({ id: grooves.id, updatedAt: grooves.updatedAt })
    .from(grooves)
    .where(and(eq(grooves.visibility, "public"), isNull(grooves.deletedAt)))
    .orderBy(desc(grooves.updatedAt))
    .limit(limit);
}
