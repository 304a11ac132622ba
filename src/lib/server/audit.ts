// The audit trail: one append-only row per save, restore, role change, sharing change and account change.
// audit_events refuses UPDATE and DELETE at the database level (migration 0001).
import { and, desc, eq } from "drizzle-orm";
import { getDb, type Database } from "./db/index";
import { auditEvents } from "./db/schema";

/** A database or an open transaction: audit rows are written inside the transaction of the change they record. */
export type Executor = Pick<Database, "insert" | "select" | "update" | "delete" | "execute">;

export type AuditAction =
  | "groove.created"
  | "groove.forked"
  | "groove.updated"
  | "groove.deleted"
  | "groove.restored"
  | "version.saved"
  | "version.restored"
  | "collaborator.invited"
  | "collaborator.joined"
  | "collaborator.role_changed"
  | "collaborator.removed"
  | "invitation.revoked"
  | "user.signed_up"
  | "user.email_verified"
  | "user.password_reset"
  | "user.role_changed"
  | "user.disabled"
  | "user.enabled";

export interface AuditEntry {
  actorId: string | null;
  action: AuditAction;
  grooveId?: string | null;
  versionId?: string | null;
  details?: Record<string, unknown>;
}

/**
 * Records one event.
 * @example await audit(tx, { actorId: user.id, action: "version.saved", grooveId, versionId });
 */
export async function audit(db: Executor, entry: AuditEntry): Promise<void> {
  await db.insert(auditEvents).values({
    actorId: entry.actorId,
    action: entry.action,
    grooveId: entry.grooveId ?? null,
    versionId: entry.versionId ?? null,
    details: entry.details ?? {},
  });
}

/** The newest events of a groove (for its page and for tests). */
export function grooveAudit(grooveId: string, limit = 50, db: Database = getDb()) {
  return db.select().from(auditEvents).where(eq(auditEvents.grooveId, grooveId)).orderBy(desc(auditEvents.id)).limit(limit);
}

/** The newest events of one kind by one actor. */
export function actorAudit(actorId: string, action: AuditAction, limit = 50, db: Database = getDb()) {
  return db
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.actorId, actorId), eq(auditEvents.action, action)))
    .orderBy(desc(auditEvents.id))
    .limit(limit);
}
