// The groove library: list, create, read, update details, soft delete and restore (30 days), fork.
// Every access goes through `authorizeGroove`, which applies the rules of roles.ts.
import { and, asc, desc, eq, ilike, isNotNull, isNull, lt, or, sql, type Placeholder, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { nanoid } from "nanoid";
import { z } from "zod";
import type { GrooveDetail, GrooveSummary } from "../api-types";
import type { GrooveDocument } from "../rhythm/document";
import { audit, type Executor } from "./audit";
import { getDb } from "./db/index";
import { collaborators, grooveVersions, grooves, users, type Groove } from "./db/schema";
import { can, grooveRole, refusalStatus, type Actor, type CollaboratorRole, type GrooveAction, type GrooveRole, type Visibility } from "./roles";
import { createReadCache, forgetAfterWrite } from "./read-cache";
import { ApiError } from "./route";
import type { SessionUser } from "./session";
import { likePattern } from "./user";
import { contentHash, getVersionSummary, newVersionId } from "./versions";

export type { GrooveDetail, GrooveSummary };

/** How long a deleted groove can be restored. */
export const RESTORE_WINDOW_MS = 30 * 24 * 3600_000;

export const newGrooveId = () => nanoid(12);

/** Ids in URLs: nanoid's alphabet. Anything else is a 404 without a query. */
export const idSchema = z.string().regex(/^[A-Za-z0-9_-]{1,64}$/);

export const titleSchema = z.string({ message: "Enter a title." }).trim().min(1, "Enter a title.").max(120, "Use at most 120 characters.");
export const descriptionSchema = z.string().trim().max(2000, "Use at most 2,000 characters.");
export const tagsSchema = z
  .array(
    z
      .string()
      .trim()
      .toLowerCase()
      .min(1, "A tag cannot be empty.")
      .max(32, "A tag has at most 32 characters.")
      .regex(/^[\p{L}\p{N}][\p{L}\p{N} ._-]*$/u, "Tags use letters, digits, spaces, dots, dashes and underscores."),
  )
  .max(16, "Use at most 16 tags.")
  .transform((tags) => [...new Set(tags)]);
export const visibilitySchema = z.enum(["private", "link", "public"], { message: "Visibility is private, link or public." });

export interface LoadedGroove {
  groove: Groove;
  collaboratorRole: CollaboratorRole | null;
  role: GrooveRole | null;
}

/** The groove and the actor's collaborator role on it. */
function grooveWithRole(db: Executor, actorId: string | Placeholder, grooveId: string | Placeholder) {
  return db
    .select({ groove: grooves, collaboratorRole: collaborators.role })
    .from(grooves)
    .leftJoin(collaborators, and(eq(collaborators.grooveId, grooves.id), eq(collaborators.userId, actorId)))
    .where(eq(grooves.id, grooveId))
    .limit(1);
}

const prepareGrooveWithRole = () => grooveWithRole(getDb(), sql.placeholder("actor"), sql.placeholder("groove")).prepare("groove_with_role");
let grooveWithRoleStatement: { db: unknown; statement: ReturnType<typeof prepareGrooveWithRole> } | undefined;
/** The same read as a named prepared statement: built once per client, not per request (most groove requests start with it). */
function preparedGrooveWithRole() {
  if (grooveWithRoleStatement?.db !== getDb()) grooveWithRoleStatement = { db: getDb(), statement: prepareGrooveWithRole() };
  return grooveWithRoleStatement.statement;
}

/**
 * Loads a groove and checks that the actor may do `action`. Throws 404 when it is missing (or deleted, or not
 * readable by the actor), 401 for anonymous visitors, 403 when readable but not allowed. Deleted grooves are
 * visible only with `allowDeleted` (restore, trash) to those allowed to delete them, within the restore window.
 */
export async function authorizeGroove(
  actor: SessionUser | null,
  grooveId: string,
  action: GrooveAction,
  db: Executor = getDb(),
  opts: { lock?: boolean; allowDeleted?: boolean } = {},
): Promise<LoadedGroove> {
  if (!idSchema.safeParse(grooveId).success) throw new ApiError(404, "not_found", "No groove has this id.");
  const actorId = actor?.id ?? "";
  const [row] = opts.lock
    ? await grooveWithRole(db, actorId, grooveId).for("update", { of: grooves })
    : db === getDb()
      ? await preparedGrooveWithRole().execute({ actor: actorId, groove: grooveId })
      : await grooveWithRole(db, actorId, grooveId);
  if (!row) throw new ApiError(404, "not_found", "No groove has this id.");
  const facts = { ownerId: row.groove.ownerId, visibility: row.groove.visibility, collaboratorRole: row.collaboratorRole };
  const who: Actor | null = actor ? { id: actor.id, siteRole: actor.siteRole } : null;
  if (row.groove.deletedAt) {
    const restorable = Date.now() - row.groove.deletedAt.getTime() < RESTORE_WINDOW_MS;
    if (!opts.allowDeleted || !restorable || !can(who, "delete", facts)) throw new ApiError(404, "not_found", "No groove has this id.");
  }
  if (!can(who, action, facts)) {
    const status = refusalStatus(who, action, facts);
    if (status === 404) throw new ApiError(404, "not_found", "No groove has this id.");
    if (status === 401) throw new ApiError(401, "unauthenticated", "Sign in first.");
    throw new ApiError(403, "forbidden", forbiddenMessage(action));
  }
  return { groove: row.groove, collaboratorRole: row.collaboratorRole, role: grooveRole(who, facts) };
}

function forbiddenMessage(action: GrooveAction): string {
  switch (action) {
    case "edit":
      return "Only the owner and editors of this groove may change it.";
    case "share":
      return "Only the owner of this groove may change who can see and edit it.";
    case "delete":
      return "Only the owner of this groove may delete or restore it.";
    default:
      return "You may not do this with this groove.";
  }
}

export interface ListQuery {
  /** mine: owned; shared: where I collaborate; public: public grooves; all: everything I may see; trash: my deleted grooves. */
  scope: "all" | "mine" | "shared" | "public" | "trash";
  q?: string;
  tag?: string;
  /** An owner's user id ("me" for the viewer). */
  owner?: string;
  sort: "updated" | "created" | "title";
  dir: "asc" | "desc";
  page: number;
  pageSize: number;
}

/** The list counts matches up to this many; beyond, `totalCapped` is true and `total` is this number. */
export const COUNT_CAP = 1000;

export interface ListResult {
  items: GrooveSummary[];
  /** Matches in all pages, at most COUNT_CAP. */
  total: number;
  /** True when there are more than COUNT_CAP matches. */
  totalCapped: boolean;
  page: number;
  pageSize: number;
}

const owner = alias(users, "owner");

/** What decides the SQL text of a list query (values travel as parameters). */
interface ListShape {
  scope: ListQuery["scope"];
  who: "anonymous" | "member" | "admin";
  q: boolean;
  tag: boolean;
  owner: boolean;
  sort: ListQuery["sort"];
  dir: ListQuery["dir"];
}

/**
 * Builds the list query of one shape with placeholders ($me, $q, $tag, $owner, $limit, $offset). With `withTotal`,
 * the page and its total come back in one round trip: the total is an uncorrelated sub-select (computed once),
 * counting at most COUNT_CAP + 1 matches; without it, the page alone (the total is remembered, see `totals`).
 */
function buildListStatement(shape: ListShape, withTotal: boolean) {
  const me = sql.placeholder("me");
  const where: SQL[] = [];
  const mine = eq(grooves.ownerId, me);
  // A hashed semi-join: cheaper than joining collaborators to every groove when only the visible ones count.
  const shared = sql`${grooves.id} in (select ${collaborators.grooveId} from ${collaborators} where ${collaborators.userId} = ${me})`;
  const isPublic = eq(grooves.visibility, "public");
  if (shape.scope === "trash") {
    where.push(isNotNull(grooves.deletedAt), sql`${grooves.deletedAt} > now() - interval '30 days'`);
    if (shape.who !== "admin") where.push(mine);
  } else {
    where.push(isNull(grooves.deletedAt));
    if (shape.scope === "mine") where.push(mine);
    else if (shape.scope === "shared") where.push(shared);
    else if (shape.scope === "public") where.push(isPublic);
    else if (shape.who === "member") where.push(or(mine, shared, isPublic)!);
    else if (shape.who === "anonymous") where.push(isPublic);
  }
  if (shape.q) where.push(or(ilike(grooves.title, sql.placeholder("q")), ilike(grooves.description, sql.placeholder("q")))!);
  if (shape.tag) where.push(sql`${grooves.tags} @> array[${sql.placeholder("tag")}]::text[]`);
  if (shape.owner) where.push(eq(grooves.ownerId, sql.placeholder("owner")));
  const condition = and(...where);
  // Title sorting uses the (lower(title), id) index; times use their own indexes, so a page stops after its rows.
  const order = shape.dir === "asc" ? asc : desc;
  const orderBy =
    shape.sort === "title"
      ? [order(sql`lower(${grooves.title})`), order(grooves.id)]
      : shape.sort === "created"
        ? [order(grooves.createdAt), order(grooves.id)]
        : [order(grooves.updatedAt), order(grooves.id)];
  const name = `grooves_list_${shape.scope}_${shape.who}_${shape.q ? "q" : ""}${shape.tag ? "t" : ""}${shape.owner ? "o" : ""}_${shape.sort}_${shape.dir}${withTotal ? "_total" : ""}`;
  // Inside the sub-select "grooves" and "collaborators" name its own FROM items (the nearest scope).
  const total = withTotal
    ? sql<number>`(select count(*)::int from (select 1 from ${grooves} where ${condition} limit ${COUNT_CAP + 1}) as matching)`.mapWith(Number)
    : sql<null>`null::int`;
  return getDb()
    .select({
      groove: {
        id: grooves.id,
        title: grooves.title,
        description: grooves.description,
        tags: grooves.tags,
        visibility: grooves.visibility,
        ownerId: grooves.ownerId,
        latestVersionId: grooves.latestVersionId,
        forkedFromId: grooves.forkedFromId,
        createdAt: grooves.createdAt,
        updatedAt: grooves.updatedAt,
        deletedAt: grooves.deletedAt,
      },
      ownerName: owner.displayName,
      collaboratorRole: collaborators.role,
      latestNumber: grooveVersions.number,
      total,
    })
    .from(grooves)
    .innerJoin(owner, eq(owner.id, grooves.ownerId))
    .leftJoin(collaborators, and(eq(collaborators.grooveId, grooves.id), eq(collaborators.userId, me)))
    .leftJoin(grooveVersions, eq(grooveVersions.id, grooves.latestVersionId))
    .where(condition)
    .orderBy(...orderBy)
    .limit(sql.placeholder("limit"))
    .offset(sql.placeholder("offset"))
    .prepare(name);
}

type ListStatement = ReturnType<typeof buildListStatement>;
const listStatements = new Map<string, ListStatement>();

/** The prepared statement of a shape (`shapeKey` is JSON.stringify(shape), computed once per request). */
function listStatement(shape: ListShape, shapeKey: string, withTotal: boolean): ListStatement {
  const key = `${shapeKey}|${withTotal}`;
  let statement = listStatements.get(key);
  if (!statement) {
    statement = buildListStatement(shape, withTotal);
    listStatements.set(key, statement);
  }
  return statement;
}

/**
 * How long the total of a list is remembered (ms): paging through a list, or many viewers opening the same one,
 * counts its matches once. Every write request through Tactus forgets all totals (see read-cache.ts); changes made
 * outside it show within this time.
 */
export const LIST_TOTAL_REMEMBER_MS = 5000;

/** Totals of lists by shape and parameters (the page itself is always read). */
const totals = createReadCache<number>({ max: 5000, ttlMs: LIST_TOTAL_REMEMBER_MS, forgetOnWrite: true });

/**
 * The library list: what the actor may see, filtered, sorted and paged.
 * Each shape of query is a named prepared statement (built and planned once per connection, not per request).
 * @example await listGrooves(user, { scope: "all", sort: "updated", dir: "desc", page: 1, pageSize: 25 })
 */
export async function listGrooves(actor: SessionUser | null, query: ListQuery): Promise<ListResult> {
  const me = actor?.id ?? "";
  if (query.scope === "trash") {
    if (!actor) throw new ApiError(401, "unauthenticated", "Sign in first.");
    // Housekeeping where it is visible: grooves past their 30 days leave for good before the trash is shown.
    await purgeExpiredGrooves();
  }
  const shape: ListShape = {
    scope: query.scope,
    who: !actor ? "anonymous" : actor.siteRole === "admin" ? "admin" : "member",
    q: Boolean(query.q),
    tag: Boolean(query.tag),
    owner: Boolean(query.owner),
    sort: query.sort,
    dir: query.dir,
  };
  const params = {
    me,
    q: query.q ? likePattern(query.q) : "",
    tag: query.tag?.trim().toLowerCase() ?? "",
    owner: query.owner === "me" ? me : (query.owner ?? ""),
  };
  const shapeKey = JSON.stringify(shape);
  const totalKey = shapeKey + JSON.stringify(params);
  const page = { limit: query.pageSize, offset: (query.page - 1) * query.pageSize };
  let counted = totals.get(totalKey);
  let rows;
  if (counted !== undefined) {
    rows = await listStatement(shape, shapeKey, false).execute({ ...params, ...page });
  } else {
    const ticket = totals.ticket();
    const statement = listStatement(shape, shapeKey, true);
    rows = await statement.execute({ ...params, ...page });
    // An empty page (past the end) carries no total: ask for the total alone.
    counted = rows[0]?.total ?? (await statement.execute({ ...params, limit: 1, offset: 0 }))[0]?.total ?? 0;
    totals.set(totalKey, counted, ticket);
  }
  const totalCapped = counted > COUNT_CAP;
  const total = Math.min(counted, COUNT_CAP);
  const who: Actor | null = actor ? { id: actor.id, siteRole: actor.siteRole } : null;
  return {
    items: rows.map((r) => ({
      id: r.groove.id,
      title: r.groove.title,
      description: r.groove.description,
      tags: r.groove.tags,
      visibility: r.groove.visibility,
      owner: { id: r.groove.ownerId, displayName: r.ownerName },
      role: grooveRole(who, { ownerId: r.groove.ownerId, visibility: r.groove.visibility, collaboratorRole: r.collaboratorRole }),
      latestVersion: r.groove.latestVersionId && r.latestNumber ? { id: r.groove.latestVersionId, number: r.latestNumber } : null,
      forkedFromId: r.groove.forkedFromId,
      createdAt: r.groove.createdAt.toISOString(),
      updatedAt: r.groove.updatedAt.toISOString(),
      deletedAt: r.groove.deletedAt?.toISOString() ?? null,
    })),
    total,
    totalCapped,
    page: query.page,
    pageSize: query.pageSize,
  };
}

/** The groove page's data: details, the viewer's role and permissions, the latest version (without document). */
export async function getGrooveDetail(actor: SessionUser | null, grooveId: string, opts: { allowDeleted?: boolean } = {}): Promise<GrooveDetail> {
  const loaded = await authorizeGroove(actor, grooveId, "read", getDb(), { allowDeleted: opts.allowDeleted });
  return describeGroove(actor, loaded);
}

async function describeGroove(actor: SessionUser | null, { groove, collaboratorRole, role }: LoadedGroove): Promise<GrooveDetail> {
  const db = getDb();
  const [ownerRow] = await db.select({ displayName: users.displayName }).from(users).where(eq(users.id, groove.ownerId));
  const latest = groove.latestVersionId ? await getVersionSummary(groove.latestVersionId, db) : null;
  let forkedFrom: GrooveDetail["forkedFrom"] = null;
  if (groove.forkedFromId) {
    const [f] = await db
      .select({ id: grooves.id, title: grooves.title, ownerId: grooves.ownerId, visibility: grooves.visibility, deletedAt: grooves.deletedAt })
      .from(grooves)
      .where(eq(grooves.id, groove.forkedFromId));
    // Name the source only when the viewer could open it.
    const who: Actor | null = actor ? { id: actor.id, siteRole: actor.siteRole } : null;
    if (f && !f.deletedAt && can(who, "read", { ownerId: f.ownerId, visibility: f.visibility })) forkedFrom = { id: f.id, title: f.title };
  }
  const who: Actor | null = actor ? { id: actor.id, siteRole: actor.siteRole } : null;
  const facts = { ownerId: groove.ownerId, visibility: groove.visibility, collaboratorRole };
  return {
    id: groove.id,
    title: groove.title,
    description: groove.description,
    tags: groove.tags,
    visibility: groove.visibility,
    owner: { id: groove.ownerId, displayName: ownerRow?.displayName ?? "" },
    role,
    permissions: {
      edit: can(who, "edit", facts),
      share: can(who, "share", facts),
      delete: can(who, "delete", facts),
      fork: can(who, "fork", facts),
      seeCollaborators: can(who, "seeCollaborators", facts),
    },
    latestVersion: latest,
    forkedFromId: groove.forkedFromId,
    forkedFrom,
    createdAt: groove.createdAt.toISOString(),
    updatedAt: groove.updatedAt.toISOString(),
    deletedAt: groove.deletedAt?.toISOString() ?? null,
    restorableUntil: groove.deletedAt ? new Date(groove.deletedAt.getTime() + RESTORE_WINDOW_MS).toISOString() : null,
  };
}

export interface CreateInput {
  title: string;
  description: string;
  tags: string[];
  visibility: Visibility;
  /** Validated and normalised by parseGroove. */
  document: GrooveDocument;
  message: string;
}

/**
 * Inserts a new groove, its version 1 and the groove's pointer to it, all stamped with one time. Runs inside the
 * caller's transaction (create, fork), which also writes the audit row.
 */
async function insertWithFirstVersion(
  tx: Executor,
  groove: Omit<typeof grooves.$inferInsert, "createdAt" | "updatedAt" | "latestVersionId">,
  version: Pick<typeof grooveVersions.$inferInsert, "id" | "document" | "contentHash" | "authorId" | "message">,
): Promise<void> {
  const now = new Date();
  await tx.insert(grooves).values({ ...groove, createdAt: now, updatedAt: now });
  await tx.insert(grooveVersions).values({ ...version, grooveId: groove.id, number: 1, createdAt: now });
  await tx.update(grooves).set({ latestVersionId: version.id }).where(eq(grooves.id, groove.id));
}

/** Creates a groove with its first version, owned by the actor. */
export async function createGroove(actor: SessionUser, input: CreateInput): Promise<GrooveDetail> {
  const id = newGrooveId();
  const versionId = newVersionId();
  await getDb().transaction(async (tx) => {
    await insertWithFirstVersion(
      tx,
      { id, ownerId: actor.id, title: input.title, description: input.description, tags: input.tags, visibility: input.visibility },
      { id: versionId, document: input.document, contentHash: contentHash(input.document), authorId: actor.id, message: input.message },
    );
    await audit(tx, { actorId: actor.id, action: "groove.created", grooveId: id, versionId });
  });
  return getGrooveDetail(actor, id);
}

export interface DetailsInput {
  title?: string;
  description?: string;
  tags?: string[];
  visibility?: Visibility;
}

/** Changes title, description, tags (owner, editor) and visibility (owner only). */
export async function updateGrooveDetails(actor: SessionUser, grooveId: string, change: DetailsInput): Promise<GrooveDetail> {
  await getDb().transaction(async (tx) => {
    const { groove } = await authorizeGroove(actor, grooveId, change.visibility !== undefined ? "share" : "edit", tx, { lock: true });
    const set: Partial<Groove> = {};
    if (change.title !== undefined) set.title = change.title;
    if (change.description !== undefined) set.description = change.description;
    if (change.tags !== undefined) set.tags = change.tags;
    if (change.visibility !== undefined) set.visibility = change.visibility;
    if (Object.keys(set).length === 0) return;
    await tx.update(grooves).set({ ...set, updatedAt: new Date() }).where(eq(grooves.id, grooveId));
    const before: Record<string, unknown> = {};
    for (const key of Object.keys(set) as (keyof typeof set)[]) before[key] = groove[key];
    await audit(tx, { actorId: actor.id, action: "groove.updated", grooveId, details: { before, after: set } });
  });
  return getGrooveDetail(actor, grooveId);
}

/** Moves a groove to the trash (restorable for 30 days by its owner or an admin). */
export async function deleteGroove(actor: SessionUser, grooveId: string): Promise<void> {
  await getDb().transaction(async (tx) => {
    await authorizeGroove(actor, grooveId, "delete", tx, { lock: true });
    await tx.update(grooves).set({ deletedAt: new Date() }).where(eq(grooves.id, grooveId));
    await audit(tx, { actorId: actor.id, action: "groove.deleted", grooveId });
  });
}

/** Takes a groove out of the trash. 404 once the 30 days have passed. */
export async function restoreGroove(actor: SessionUser, grooveId: string): Promise<GrooveDetail> {
  await getDb().transaction(async (tx) => {
    const { groove } = await authorizeGroove(actor, grooveId, "delete", tx, { lock: true, allowDeleted: true });
    if (!groove.deletedAt) throw new ApiError(409, "not_deleted", "This groove is not in the trash.");
    await tx.update(grooves).set({ deletedAt: null, updatedAt: new Date() }).where(eq(grooves.id, grooveId));
    await audit(tx, { actorId: actor.id, action: "groove.restored", grooveId });
  });
  return getGrooveDetail(actor, grooveId);
}

/** Deletes for good the grooves whose 30 days in the trash are over (their audit rows stay). */
export async function purgeExpiredGrooves(): Promise<number> {
  const gone = await getDb()
    .delete(grooves)
    .where(and(isNotNull(grooves.deletedAt), lt(grooves.deletedAt, sql`now() - interval '30 days'`)))
    .returning({ id: grooves.id });
  if (gone.length > 0) forgetAfterWrite(); // a write inside a read request: the middleware does not see it
  return gone.length;
}

/**
 * Copies a groove the actor may read into a new private groove they own, starting from the latest version
 * (or `versionId`).
 */
export async function forkGroove(actor: SessionUser, grooveId: string, opts: { title?: string; versionId?: string } = {}): Promise<GrooveDetail> {
  const { groove } = await authorizeGroove(actor, grooveId, "fork");
  const sourceVersionId = opts.versionId ?? groove.latestVersionId;
  const [source] = sourceVersionId
    ? await getDb()
        .select({ id: grooveVersions.id, number: grooveVersions.number, document: grooveVersions.document, contentHash: grooveVersions.contentHash })
        .from(grooveVersions)
        .where(and(eq(grooveVersions.id, sourceVersionId), eq(grooveVersions.grooveId, grooveId)))
    : [];
  if (!source) throw new ApiError(404, "not_found", "This groove has no version with this id.");
  const id = newGrooveId();
  const versionId = newVersionId();
  await getDb().transaction(async (tx) => {
    await insertWithFirstVersion(
      tx,
      {
        id,
        ownerId: actor.id,
        title: opts.title ?? `${groove.title} (fork)`.slice(0, 120),
        description: groove.description,
        tags: groove.tags,
        visibility: "private",
        forkedFromId: groove.id,
        forkedFromVersionId: source.id,
      },
      {
        id: versionId,
        document: source.document,
        contentHash: source.contentHash,
        authorId: actor.id,
        message: `Forked from "${groove.title}", version ${source.number}`,
      },
    );
    await audit(tx, { actorId: actor.id, action: "groove.forked", grooveId: id, versionId, details: { from: groove.id, fromVersion: source.id } });
  });
  return getGrooveDetail(actor, id);
}
