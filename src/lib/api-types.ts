/**
 * The shapes the JSON API answers, shared by the server (src/lib/server) that builds them and the client
 * (src/lib/client/api.ts) that reads them. Types only: import with `import type`, so nothing runs on either side.
 */
import type { GrooveDocument } from "./rhythm/document";

export type Visibility = "private" | "link" | "public";
export type GrooveRole = "owner" | "editor" | "viewer";
export type SiteRole = "admin" | "member";

/** What the API shows of an account. */
export interface PublicUser {
  id: string;
  email: string;
  displayName: string;
  siteRole: SiteRole;
  emailVerified: boolean;
  disabled: boolean;
  createdAt: string;
}

/** A version without its document (history lists). */
export interface VersionSummary {
  id: string;
  grooveId: string;
  number: number;
  contentHash: string;
  message: string;
  author: { id: string; displayName: string } | null;
  parentVersionId: string | null;
  createdAt: string;
}

export interface VersionWithDocument extends VersionSummary {
  document: GrooveDocument;
}

/** What the API shows of a groove in lists and on its page. */
export interface GrooveSummary {
  id: string;
  title: string;
  description: string;
  tags: string[];
  visibility: Visibility;
  owner: { id: string; displayName: string };
  /** The viewer's own role, or null (a public groove seen by someone else). */
  role: GrooveRole | null;
  latestVersion: { id: string; number: number } | null;
  forkedFromId: string | null;
  createdAt: string;
  updatedAt: string;
  deletedAt: string | null;
}

export interface GrooveDetail extends Omit<GrooveSummary, "latestVersion"> {
  permissions: { edit: boolean; share: boolean; delete: boolean; fork: boolean; seeCollaborators: boolean };
  latestVersion: VersionSummary | null;
  forkedFrom: { id: string; title: string } | null;
  /** When a deleted groove stops being restorable. */
  restorableUntil: string | null;
}
