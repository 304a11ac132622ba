// Groove versions: append-only and immutable. Each save names the version it was based on; a save whose base is not
// the groove's latest version is refused with 409 and the latest version, so nothing is silently overwritten.
//
// Concurrency: a save is one SQL statement whose first step moves the groove's latest-version pointer only if it
// still names the base version (UPDATE … WHERE latest_version_id = base). PostgreSQL row-locks the groove for that
// update and re-checks the condition after any save that committed first, so of two saves on one base exactly one
// moves the pointer and inserts its version; the other finds nothing to update and answers 409. The version number is
// the base's + 1, and a unique index on (groove_id, number) guards the chain against gaps and duplicates even if
// this code were wrong.
import { createHash } from "node:crypto";
import canonicalize from "canonicalize";
import { and, desc, eq, lt } from "drizzle-orm";
import { nanoid } from "nanoid";
import type { VersionSummary, VersionWithDocument } from "../api-types";
import type { GrooveDocument } from "../rhythm/document";
import type { Executor } from "./audit";
import { getDb } from "./db/index";
import { grooveVersions, grooves, users } from "./db/schema";
import { authorizeGroove } from "./grooves";
import { ApiError } from "./route";
import type { SessionUser } from "./session";

/** Largest groove document a save accepts, in bytes of request body. */
export const MAX_DOCUMENT_BYTES = 2 * 1024 * 1024;

/**
 * SHA-256 (hex) of the RFC 8785 canonical JSON of a document: equal documents have equal hashes whatever the key
 * order they were sent in.
 * @example contentHash({ b: 1, a: 2 }) === contentHash({ a: 2, b: 1 }) // true
 */
export function contentHash(document: unknown): string {
  return createHash("sha256").update(canonicalize(document) ?? "").digest("hex");
}

export const newVersionId = () => nanoid(16);

export type { VersionSummary, VersionWithDocument };

const summaryColumns = {
  id: grooveVersions.id,
  grooveId: grooveVersions.grooveId,
  number: grooveVersions.number,
  contentHash: grooveVersions.contentHash,
  message: grooveVersions.message,
  authorId: grooveVersions.authorId,
  authorName: users.displayName,
  parentVersionId: grooveVersions.parentVersionId,
  createdAt: grooveVersions.createdAt,
};

type SummaryRow = { [K in keyof typeof summaryColumns]: (typeof summaryColumns)[K]["_"]["data"] | null };

function toSummary(r: SummaryRow): VersionSummary {
  return {
    id: r.id!,
    grooveId: r.grooveId!,
    number: r.number!,
    contentHash: r.contentHash!,
    message: r.message ?? "",
    author: r.authorId ? { id: r.authorId, displayName: r.authorName ?? "" } : null,
    parentVersionId: r.parentVersionId ?? null,
    createdAt: (r.createdAt as Date).toISOString(),
  };
}

/** Versions of a groove, newest first (`before`: only numbers below it, for paging). */
export async function listVersions(grooveId: string, { before, limit }: { before?: number; limit: number }): Promise<VersionSummary[]> {
  const rows = await getDb()
    .select(summaryColumns)
    .from(grooveVersions)
    .leftJoin(users, eq(users.id, grooveVersions.authorId))
    .where(before ? and(eq(grooveVersions.grooveId, grooveId), lt(grooveVersions.number, before)) : eq(grooveVersions.grooveId, grooveId))
    .orderBy(desc(grooveVersions.number))
    .limit(limit);
  return rows.map(toSummary);
}

/** One version without its document, or null. */
export async function getVersionSummary(versionId: string, db: Executor = getDb()): Promise<VersionSummary | null> {
  const [row] = await db
    .select(summaryColumns)
    .from(grooveVersions)
    .leftJoin(users, eq(users.id, grooveVersions.authorId))
    .where(eq(grooveVersions.id, versionId))
    .limit(1);
  return row ? toSummary(row) : null;
}

/** One version with its document, or null. */
export async function getVersion(grooveId: string, versionId: string, db: Executor = getDb()): Promise<VersionWithDocument | null> {
  const [row] = await db
    .select({ ...summaryColumns, document: grooveVersions.document })
    .from(grooveVersions)
    .leftJoin(users, eq(users.id, grooveVersions.authorId))
    .where(and(eq(grooveVersions.grooveId, grooveId), eq(grooveVersions.id, versionId)))
    .limit(1);
  if (!row) return null;
  return { ...toSummary(row), document: row.document as GrooveDocument };
}

export interface SaveInput {
  /** The version the editor started from; must be the groove's latest. */
  baseVersionId: string;
  /** A document already validated and normalised by the core's parseGroove. */
  document: GrooveDocument;
  message: string;
}

/**
 * One round trip, a named prepared statement: the pointer (moved only if it still names the base), the version
 * numbered after the base, and the audit row. $1 new version id, $2 time, $3 groove, $4 base version, $5 document
 * (JSON), $6 content hash, $7 author, $8 message, $9 audit action, $10 extra audit details (JSON).
 */
const SAVE_VERSION_SQL = `
  with g as (
    update grooves set latest_version_id = $1, updated_at = $2
    where id = $3 and deleted_at is null and latest_version_id = $4
    returning id
  ), v as (
    insert into groove_versions (id, groove_id, number, document, content_hash, author_id, message, parent_version_id, created_at)
    select $1, g.id, coalesce((select number from groove_versions where id = $4), 0) + 1, $5::jsonb, $6, $7, $8, $4, $2
    from g
    returning number
  ), a as (
    insert into audit_events (actor_id, action, groove_id, version_id, details)
    select $7, $9, $3, $1, jsonb_build_object('number', v.number, 'contentHash', $6::text) || $10::jsonb from v
  )
  select number from v`;

/**
 * Appends a version. Throws ApiError 409 `version_conflict` (with `latest`, the latest version and its document)
 * when another save came first, and 401/403/404 as the roles say.
 * @example const v = await saveVersion(user, grooveId, { baseVersionId, document: parsed.doc, message: "Ghost notes" });
 */
export async function saveVersion(
  actor: SessionUser,
  grooveId: string,
  input: SaveInput,
  meta: { action: "version.saved" | "version.restored"; restoredFrom?: { id: string; number: number } } = { action: "version.saved" },
): Promise<VersionWithDocument> {
  const hash = contentHash(input.document);
  // Who may edit is checked first (401/403/404); the statement below then appends only on top of the base version.
  await authorizeGroove(actor, grooveId, "edit");
  const id = newVersionId();
  const now = new Date();
  const base = input.baseVersionId;
  const extra = meta.restoredFrom ? { restoredFrom: meta.restoredFrom } : {};
  const result = await getDb().$client.query<{ number: number }>({
    name: "save_version",
    text: SAVE_VERSION_SQL,
    values: [id, now, grooveId, base, JSON.stringify(input.document), hash, actor.id, input.message, meta.action, JSON.stringify(extra)],
  });
  const row = result.rows[0];
  if (!row) throw await conflict(grooveId);
  return {
    id,
    grooveId,
    number: Number(row.number),
    contentHash: hash,
    message: input.message,
    author: { id: actor.id, displayName: actor.displayName },
    parentVersionId: base,
    createdAt: now.toISOString(),
    document: input.document,
  };
}

/** Why a save on top of a base version appended nothing: the groove is gone (404) or another save came first (409). */
async function conflict(grooveId: string): Promise<ApiError> {
  const [groove] = await getDb().select({ latestVersionId: grooves.latestVersionId, deletedAt: grooves.deletedAt }).from(grooves).where(eq(grooves.id, grooveId));
  if (!groove || groove.deletedAt) return new ApiError(404, "not_found", "No groove has this id.");
  const latest = groove.latestVersionId ? await getVersion(grooveId, groove.latestVersionId) : null;
  const message = latest
    ? `Version ${latest.number} was saved by ${latest.author?.displayName ?? "someone"} after the version you started from: compare, then save again on top of it.`
    : "The version you started from is not this groove's latest version.";
  return new ApiError(409, "version_conflict", message, { baseVersionId: ["not the latest version"] }, { latest });
}

/**
 * Restores an old version as a new one (history is never rewritten): the old document saved on top of `baseVersionId`.
 * @example await restoreVersion(user, grooveId, oldVersionId, latestVersionId);
 */
export async function restoreVersion(
  actor: SessionUser,
  grooveId: string,
  versionId: string,
  baseVersionId: string,
  message?: string,
): Promise<VersionWithDocument> {
  await authorizeGroove(actor, grooveId, "edit");
  const old = await getVersion(grooveId, versionId);
  if (!old) throw new ApiError(404, "not_found", "This groove has no version with this id.");
  return saveVersion(
    actor,
    grooveId,
    { baseVersionId, document: old.document, message: message?.trim() || `Restored version ${old.number}` },
    { action: "version.restored", restoredFrom: { id: old.id, number: old.number } },
  );
}
