// The editor's and viewer's way to load a groove on the server (Astro pages call it in their frontmatter).
// Same rules as the API: roles.ts decides, a groove the user may not read is simply not found.
import { getGrooveDetail, type GrooveDetail } from "./grooves";
import { ApiError } from "./route";
import type { SessionUser } from "./session";
import { getVersion, type VersionWithDocument } from "./versions";

export interface GrooveForEditing {
  groove: GrooveDetail;
  /** The requested version, or the latest one. */
  version: VersionWithDocument;
  /** Whether `version` is the latest (saving is offered only on top of the latest). */
  isLatest: boolean;
  /** Whether the user may save versions (owner, editor). */
  canEdit: boolean;
}

/**
 * Loads a groove and one of its versions (the latest unless `versionId`) for a page, or null when it does not exist
 * or the user may not read it (the page then answers 404).
 * @example const data = await getGrooveForEditing(Astro.params.id!, Astro.locals.user); if (!data) return Astro.rewrite("/404");
 */
export async function getGrooveForEditing(grooveId: string, user: SessionUser | null, versionId?: string): Promise<GrooveForEditing | null> {
  let groove: GrooveDetail;
  try {
    groove = await getGrooveDetail(user, grooveId);
  } catch (e) {
    if (e instanceof ApiError && e.status < 500) return null;
    throw e;
  }
  const wanted = versionId ?? groove.latestVersion?.id;
  if (!wanted) return null;
  const version = await getVersion(grooveId, wanted);
  if (!version) return null;
  return { groove, version, isLatest: version.id === groove.latestVersion?.id, canEdit: groove.permissions.edit };
}
