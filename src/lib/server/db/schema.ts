// The whole database schema, one table per export. drizzle-kit reads this file to generate migrations into drizzle/.
// Never edit an applied migration: change this file and run `npm run db:generate` for a new one.
import { sql } from "drizzle-orm";
import {
  bigint,
  bigserial,
  check,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  varchar,
  type AnyPgColumn,
} from "drizzle-orm/pg-core";

export const siteRole = pgEnum("site_role", ["admin", "member"]);
export const visibility = pgEnum("groove_visibility", ["private", "link", "public"]);
/** Roles given to collaborators; the owner is grooves.owner_id. */
export const collaboratorRole = pgEnum("collaborator_role", ["editor", "viewer"]);
export const emailTokenPurpose = pgEnum("email_token_purpose", ["verify_email", "reset_password"]);

/** People with an account. E-mail addresses are stored lower-cased (a check keeps it so). */
export const users = pgTable(
  "users",
  {
    id: text("id").primaryKey(),
    email: text("email").notNull(),
    displayName: text("display_name").notNull(),
    passwordHash: text("password_hash").notNull(),
    siteRole: siteRole("site_role").notNull().default("member"),
    emailVerifiedAt: timestamp("email_verified_at", { withTimezone: true }),
    disabledAt: timestamp("disabled_at", { withTimezone: true }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("users_email_unique").on(t.email), check("users_email_lower", sql`${t.email} = lower(${t.email})`)],
);

/** Sessions in the shape lucia 3's DrizzlePostgreSQLAdapter expects (id, user_id, expires_at), plus created_at. */
export const sessions = pgTable(
  "sessions",
  {
    id: text("id").primaryKey(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    expiresAt: timestamp("expires_at", { withTimezone: true, mode: "date" }).notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("sessions_user_idx").on(t.userId)],
);

/** A groove: its identity, ownership and sharing. The music itself lives in groove_versions. */
export const grooves = pgTable(
  "grooves",
  {
    id: text("id").primaryKey(),
    ownerId: text("owner_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    title: text("title").notNull(),
    description: text("description").notNull().default(""),
    tags: text("tags").array().notNull().default(sql`'{}'::text[]`),
    visibility: visibility("visibility").notNull().default("private"),
    latestVersionId: text("latest_version_id").references((): AnyPgColumn => grooveVersions.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
    deletedAt: timestamp("deleted_at", { withTimezone: true }),
    /** The groove this one was forked from, and the version it started from. */
    forkedFromId: text("forked_from_id").references((): AnyPgColumn => grooves.id, { onDelete: "set null" }),
    forkedFromVersionId: text("forked_from_version_id").references((): AnyPgColumn => grooveVersions.id, { onDelete: "set null" }),
  },
  (t) => [
    index("grooves_owner_idx").on(t.ownerId, t.updatedAt),
    index("grooves_visibility_idx").on(t.visibility),
    index("grooves_tags_idx").using("gin", t.tags),
    index("grooves_updated_idx").on(t.updatedAt),
    // Library sorting: by title (case-insensitive) and by creation time, with the id as tie-break.
    index("grooves_title_idx").on(sql`lower(${t.title})`, t.id),
    index("grooves_created_idx").on(t.createdAt, t.id),
    // Library search (ILIKE '%words%' on title or description): trigram indexes (pg_trgm, created by the migration).
    index("grooves_title_trgm_idx").using("gin", sql`${t.title} gin_trgm_ops`),
    index("grooves_description_trgm_idx").using("gin", sql`${t.description} gin_trgm_ops`),
  ],
);

/** Every saved state of a groove, numbered 1, 2, 3… per groove. Rows are never updated. */
export const grooveVersions = pgTable(
  "groove_versions",
  {
    id: text("id").primaryKey(),
    grooveId: text("groove_id")
      .notNull()
      .references(() => grooves.id, { onDelete: "cascade" }),
    number: integer("number").notNull(),
    document: jsonb("document").notNull(),
    contentHash: text("content_hash").notNull(),
    authorId: text("author_id").references(() => users.id, { onDelete: "set null" }),
    message: text("message").notNull().default(""),
    parentVersionId: text("parent_version_id").references((): AnyPgColumn => grooveVersions.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("groove_versions_groove_number_unique").on(t.grooveId, t.number), check("groove_versions_number_positive", sql`${t.number} >= 1`)],
);

/**
 * Append-only record of what happened (saves, renotations, sharing changes). A trigger (migration 0001) rejects
 * UPDATE and DELETE. The ids are plain text without foreign keys on purpose: the record outlives the rows it names.
 */
export const auditEvents = pgTable(
  "audit_events",
  {
    id: bigserial("id", { mode: "number" }).primaryKey(),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
    actorId: text("actor_id"),
    action: text("action").notNull(),
    grooveId: text("groove_id"),
    versionId: text("version_id"),
    details: jsonb("details").notNull().default(sql`'{}'::jsonb`),
  },
  (t) => [index("audit_events_groove_idx").on(t.grooveId, t.at)],
);

/** People who may work on a groove besides its owner. */
export const collaborators = pgTable(
  "collaborators",
  {
    grooveId: text("groove_id")
      .notNull()
      .references(() => grooves.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: collaboratorRole("role").notNull(),
    addedBy: text("added_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.grooveId, t.userId] }), index("collaborators_user_idx").on(t.userId)],
);

/** Invitations to a groove sent by e-mail. The token is stored only as its SHA-256. */
export const invitations = pgTable(
  "invitations",
  {
    id: text("id").primaryKey(),
    tokenHash: text("token_hash").notNull(),
    grooveId: text("groove_id")
      .notNull()
      .references(() => grooves.id, { onDelete: "cascade" }),
    email: text("email").notNull(),
    role: collaboratorRole("role").notNull(),
    invitedBy: text("invited_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    acceptedAt: timestamp("accepted_at", { withTimezone: true }),
    acceptedBy: text("accepted_by").references(() => users.id, { onDelete: "set null" }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
  },
  (t) => [
    uniqueIndex("invitations_token_unique").on(t.tokenHash),
    index("invitations_groove_idx").on(t.grooveId),
    check("invitations_email_lower", sql`${t.email} = lower(${t.email})`),
  ],
);

/** Single-use e-mail tokens (address confirmation, password reset), stored only as their SHA-256. */
export const emailTokens = pgTable(
  "email_tokens",
  {
    tokenHash: text("token_hash").primaryKey(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    purpose: emailTokenPurpose("purpose").notNull(),
    email: text("email").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    usedAt: timestamp("used_at", { withTimezone: true }),
  },
  (t) => [index("email_tokens_user_idx").on(t.userId, t.purpose)],
);

/** rate-limiter-flexible's PostgreSQL store, in exactly the shape that library creates (key, points, expire in ms). */
export const rateLimits = pgTable("rate_limits", {
  key: varchar("key", { length: 255 }).primaryKey(),
  points: integer("points").notNull().default(0),
  expire: bigint("expire", { mode: "number" }),
});

export type User = typeof users.$inferSelect;
export type NewUser = typeof users.$inferInsert;
export type Session = typeof sessions.$inferSelect;
export type Groove = typeof grooves.$inferSelect;
export type NewGroove = typeof grooves.$inferInsert;
export type GrooveVersion = typeof grooveVersions.$inferSelect;
export type NewGrooveVersion = typeof grooveVersions.$inferInsert;
export type AuditEvent = typeof auditEvents.$inferSelect;
export type Collaborator = typeof collaborators.$inferSelect;
export type Invitation = typeof invitations.$inferSelect;
export type EmailToken = typeof emailTokens.$inferSelect;
