// Every authorisation rule of Tactus, in one place. Routes ask `can(...)` / `grooveAccess(...)` and never compare
// roles themselves. Pure functions: no database, so the rules are unit-tested directly.
//
// Site roles: admin, member. Per-groove roles: owner (grooves.owner_id), editor and viewer (collaborators).
// Who may do what with a groove:
//   read details and versions, fork    anyone when the groove is "link" or "public" (fork needs an account);
//                                      otherwise its owner, editors, viewers and site admins
//   save or restore a version,
//   change title/description/tags      owner, editor
//   change visibility, delete, restore,
//   invite, change or revoke roles     owner (delete and restore also site admins, for moderation)
//   see collaborators                  owner, editor, viewer, site admin; pending invitations: owner, site admin
//   leave a groove                     the collaborator themself
// A groove someone may not read answers 404 (its existence is not revealed); one they may read but not change
// answers 403; write routes answer 401 to anonymous visitors before looking anything up.

export const SITE_ROLES = ["admin", "member"] as const;
export type SiteRole = (typeof SITE_ROLES)[number];

export const GROOVE_ROLES = ["owner", "editor", "viewer"] as const;
export type GrooveRole = (typeof GROOVE_ROLES)[number];

/** Roles that can be given to a collaborator (ownership is not transferable by invitation). */
export const COLLABORATOR_ROLES = ["editor", "viewer"] as const;
export type CollaboratorRole = (typeof COLLABORATOR_ROLES)[number];

export type Visibility = "private" | "link" | "public";

/** The part of a user the rules look at. */
export interface Actor {
  id: string;
  siteRole: SiteRole;
}

/** The part of a groove the rules look at, with the actor's collaborator role when they have one. */
export interface GrooveFacts {
  ownerId: string;
  visibility: Visibility;
  /** The actor's role from the collaborators table, if any. */
  collaboratorRole?: CollaboratorRole | null;
}

export type GrooveAction =
  | "read"
  | "fork"
  | "edit" // save a version, restore a version, change title/description/tags
  | "share" // change visibility, invite, change or revoke roles, see pending invitations
  | "delete" // soft delete and restore
  | "seeCollaborators";

/**
 * The actor's role on a groove (owner / editor / viewer), or null when they have none.
 * @example grooveRole({ id: "u1", siteRole: "member" }, { ownerId: "u1", visibility: "private" }) // "owner"
 */
export function grooveRole(actor: Actor | null, groove: GrooveFacts): GrooveRole | null {
  if (!actor) return null;
  if (groove.ownerId === actor.id) return "owner";
  return groove.collaboratorRole ?? null;
}

/**
 * Whether the actor may do `action` with the groove.
 * @example can(null, "read", { ownerId: "u1", visibility: "public" }) // true
 */
export function can(actor: Actor | null, action: GrooveAction, groove: GrooveFacts): boolean {
  const role = grooveRole(actor, groove);
  const admin = actor?.siteRole === "admin";
  const openToAll = groove.visibility !== "private";
  switch (action) {
    case "read":
      return openToAll || role !== null || admin;
    case "fork":
      return actor !== null && (openToAll || role !== null || admin);
    case "edit":
      return role === "owner" || role === "editor";
    case "share":
      return role === "owner";
    case "delete":
      return role === "owner" || admin;
    case "seeCollaborators":
      return role !== null || admin;
  }
}

/** Whether the actor may manage user accounts (admin page). */
export function canManageUsers(actor: Actor | null): boolean {
  return actor?.siteRole === "admin";
}

/**
 * The HTTP answer for a refused action: 401 for anonymous visitors on actions that need an account,
 * 404 when the groove is not even readable, else 403.
 * @example refusalStatus(member, "edit", publicGroove) // 403
 */
export function refusalStatus(actor: Actor | null, action: GrooveAction, groove: GrooveFacts): 401 | 403 | 404 {
  if (!can(actor, "read", groove)) return 404;
  if (!actor) return 401;
  void action;
  return 403;
}
