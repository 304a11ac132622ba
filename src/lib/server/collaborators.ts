// Sharing a groove: collaborators (editor, viewer) and invitations by e-mail. The owner invites, changes and revokes;
// the invitee accepts with the link from the e-mail while signed in with the invited address.
import { and, asc, eq, gt, isNull, sql } from "drizzle-orm";
import { nanoid } from "nanoid";
import { audit } from "./audit";
import { getDb } from "./db/index";
import { collaborators, grooves, invitations, users } from "./db/schema";
import { authorizeGroove } from "./grooves";
import { invitationMail, sendMail } from "./mail";
import type { CollaboratorRole, GrooveRole } from "./roles";
import { ApiError } from "./route";
import { hashToken, newToken, type SessionUser } from "./session";

/** How long an invitation link works. */
export const INVITATION_DAYS = 14;

export interface CollaboratorView {
  userId: string;
  displayName: string;
  email: string;
  role: GrooveRole;
  addedAt: string | null;
}

export interface InvitationView {
  id: string;
  email: string;
  role: CollaboratorRole;
  invitedBy: string | null;
  createdAt: string;
  expiresAt: string;
}

/**
 * Who works on a groove (owner first), and for the owner (and admins) the pending invitations.
 * E-mail addresses are shown only to the owner and admins.
 */
export async function listCollaborators(actor: SessionUser, grooveId: string): Promise<{ people: CollaboratorView[]; invitations: InvitationView[] | null }> {
  const { groove, role } = await authorizeGroove(actor, grooveId, "seeCollaborators");
  const db = getDb();
  const mayManage = role === "owner" || actor.siteRole === "admin";
  const [ownerRow] = await db.select({ displayName: users.displayName, email: users.email }).from(users).where(eq(users.id, groove.ownerId));
  const rows = await db
    .select({ userId: collaborators.userId, role: collaborators.role, createdAt: collaborators.createdAt, displayName: users.displayName, email: users.email })
    .from(collaborators)
    .innerJoin(users, eq(users.id, collaborators.userId))
    .where(eq(collaborators.grooveId, grooveId))
    .orderBy(asc(collaborators.createdAt));
  const people: CollaboratorView[] = [
    { userId: groove.ownerId, displayName: ownerRow?.displayName ?? "", email: mayManage ? (ownerRow?.email ?? "") : "", role: "owner", addedAt: null },
    ...rows.map((r) => ({ userId: r.userId, displayName: r.displayName, email: mayManage ? r.email : "", role: r.role, addedAt: r.createdAt.toISOString() })),
  ];
  let pending: InvitationView[] | null = null;
  if (mayManage) {
    const inv = await db
      .select()
      .from(invitations)
      .where(and(eq(invitations.grooveId, grooveId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, sql`now()`)))
      .orderBy(asc(invitations.createdAt));
    pending = inv.map((i) => ({ id: i.id, email: i.email, role: i.role, invitedBy: i.invitedBy, createdAt: i.createdAt.toISOString(), expiresAt: i.expiresAt.toISOString() }));
  }
  return { people, invitations: pending };
}

/**
 * The owner invites an address with a role; an e-mail carries the link. Inviting the same address again replaces the
 * earlier pending invitation. Returns the invitation (never the token, which only the e-mail holds).
 */
export async function invite(actor: SessionUser, grooveId: string, email: string, role: CollaboratorRole, origin: string): Promise<InvitationView> {
  const { groove } = await authorizeGroove(actor, grooveId, "share");
  const db = getDb();
  const [existing] = await db
    .select({ id: users.id, isOwner: sql<boolean>`${users.id} = ${groove.ownerId}`, role: collaborators.role })
    .from(users)
    .leftJoin(collaborators, and(eq(collaborators.userId, users.id), eq(collaborators.grooveId, grooveId)))
    .where(eq(users.email, email));
  if (existing?.isOwner) throw new ApiError(409, "already_owner", "This address belongs to the groove's owner.", { email: ["This is the owner."] });
  if (existing?.role) {
    throw new ApiError(409, "already_collaborator", `This person already works on the groove as ${existing.role}: change their role instead.`, {
      email: ["Already a collaborator."],
    });
  }
  const token = newToken();
  const now = new Date();
  const row = {
    id: nanoid(16),
    tokenHash: hashToken(token),
    grooveId,
    email,
    role,
    invitedBy: actor.id,
    createdAt: now,
    expiresAt: new Date(now.getTime() + INVITATION_DAYS * 24 * 3600_000),
  };
  await db.transaction(async (tx) => {
    await tx
      .update(invitations)
      .set({ revokedAt: now })
      .where(and(eq(invitations.grooveId, grooveId), eq(invitations.email, email), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)));
    await tx.insert(invitations).values(row);
    await audit(tx, { actorId: actor.id, action: "collaborator.invited", grooveId, details: { invitationId: row.id, role } });
  });
  await sendMail(invitationMail(email, actor.displayName, groove.title, role, `${origin}/invitations/accept?token=${encodeURIComponent(token)}`, INVITATION_DAYS));
  return { id: row.id, email, role, invitedBy: actor.id, createdAt: now.toISOString(), expiresAt: row.expiresAt.toISOString() };
}

/** The owner withdraws a pending invitation. */
export async function revokeInvitation(actor: SessionUser, grooveId: string, invitationId: string): Promise<void> {
  await authorizeGroove(actor, grooveId, "share");
  await getDb().transaction(async (tx) => {
    const done = await tx
      .update(invitations)
      .set({ revokedAt: new Date() })
      .where(and(eq(invitations.id, invitationId), eq(invitations.grooveId, grooveId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
      .returning({ id: invitations.id });
    if (done.length === 0) throw new ApiError(404, "not_found", "No pending invitation has this id.");
    await audit(tx, { actorId: actor.id, action: "invitation.revoked", grooveId, details: { invitationId } });
  });
}

/**
 * Accepts an invitation with the token from its e-mail. The signed-in account must have the invited address.
 * Returns the groove id and the role now held.
 */
export async function acceptInvitation(actor: SessionUser, token: string): Promise<{ grooveId: string; role: CollaboratorRole }> {
  return getDb().transaction(async (tx) => {
    const [inv] = await tx.select().from(invitations).where(eq(invitations.tokenHash, hashToken(token))).for("update").limit(1);
    const invalid = () => new ApiError(400, "invalid_token", "This invitation link is not valid: it may have expired, been withdrawn or been used.");
    if (!inv || inv.acceptedAt || inv.revokedAt || inv.expiresAt.getTime() <= Date.now()) throw invalid();
    if (inv.email !== actor.email) {
      throw new ApiError(403, "wrong_account", `This invitation was sent to another address: sign in with that address to accept it.`);
    }
    const [g] = await tx.select({ ownerId: grooves.ownerId, deletedAt: grooves.deletedAt }).from(grooves).where(eq(grooves.id, inv.grooveId));
    if (!g || g.deletedAt) throw invalid();
    await tx.update(invitations).set({ acceptedAt: new Date(), acceptedBy: actor.id }).where(eq(invitations.id, inv.id));
    if (g.ownerId !== actor.id) {
      await tx
        .insert(collaborators)
        .values({ grooveId: inv.grooveId, userId: actor.id, role: inv.role, addedBy: inv.invitedBy })
        .onConflictDoUpdate({ target: [collaborators.grooveId, collaborators.userId], set: { role: inv.role } });
    }
    await audit(tx, { actorId: actor.id, action: "collaborator.joined", grooveId: inv.grooveId, details: { invitationId: inv.id, role: inv.role } });
    return { grooveId: inv.grooveId, role: inv.role };
  });
}

/** The owner changes a collaborator's role. */
export async function changeRole(actor: SessionUser, grooveId: string, userId: string, role: CollaboratorRole): Promise<void> {
  await getDb().transaction(async (tx) => {
    await authorizeGroove(actor, grooveId, "share", tx, { lock: true });
    const [before] = await tx
      .select({ role: collaborators.role })
      .from(collaborators)
      .where(and(eq(collaborators.grooveId, grooveId), eq(collaborators.userId, userId)));
    if (!before) throw new ApiError(404, "not_found", "This person is not a collaborator on this groove.");
    if (before.role === role) return;
    await tx.update(collaborators).set({ role }).where(and(eq(collaborators.grooveId, grooveId), eq(collaborators.userId, userId)));
    await audit(tx, { actorId: actor.id, action: "collaborator.role_changed", grooveId, details: { userId, from: before.role, to: role } });
  });
}

/** The owner removes a collaborator, or a collaborator leaves. */
export async function removeCollaborator(actor: SessionUser, grooveId: string, userId: string): Promise<void> {
  await getDb().transaction(async (tx) => {
    // Leaving needs only to be a collaborator; removing someone else needs the owner.
    await authorizeGroove(actor, grooveId, userId === actor.id ? "seeCollaborators" : "share", tx, { lock: true });
    const gone = await tx
      .delete(collaborators)
      .where(and(eq(collaborators.grooveId, grooveId), eq(collaborators.userId, userId)))
      .returning({ role: collaborators.role });
    if (gone.length === 0) throw new ApiError(404, "not_found", "This person is not a collaborator on this groove.");
    await audit(tx, { actorId: actor.id, action: "collaborator.removed", grooveId, details: { userId, role: gone[0]!.role } });
  });
}
