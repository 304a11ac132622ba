/**
 * Saving a version: the editor's one way to the server. Posts the document on top of the version it started
 * from; a scratch groove (no id yet) is created first. Every outcome comes back as a value the UI can show,
 * never an exception: signed out → ask to sign in (the draft stays in the browser), conflict → the server's
 * message, invalid → its field messages.
 *
 * Endpoints (JSON, the app's one error shape `{ error: { code, message, fields? } }`):
 *   POST /api/grooves/:id/versions  { baseVersionId, document, message }  → 201 { id, number, … }
 *                                   409 { error, latest }: another save came first; `latest` is it, with its document
 *   POST /api/grooves               { title, document, message }          → 201 { id, latestVersion: { id } }
 */
import type { GrooveDocument } from "../rhythm";

/** The version that was saved first, sent with a 409 so the editor can show both and let the user choose. */
export interface LatestVersion {
  id: string;
  number: number;
  message: string;
  author: { id: string; displayName: string } | null;
  createdAt: string;
  contentHash: string;
  document: GrooveDocument;
}

export type SaveOutcome =
  | { ok: true; grooveId: string; versionId: string; number: number | null }
  | { ok: false; kind: "sign-in"; message: string; signInUrl: string }
  | { ok: false; kind: "conflict"; message: string; latest: LatestVersion | null; fields?: Record<string, string[]> }
  | { ok: false; kind: "invalid" | "forbidden" | "not-found" | "server" | "network"; message: string; fields?: Record<string, string[]> };

interface ErrorBody {
  error?: { code?: string; message?: string; fields?: Record<string, string[]> };
  /** On 409: the latest version with its document. */
  latest?: LatestVersion | null;
}

/** Where to send a signed-out visitor, coming back to the current page. */
export function signInUrl(returnTo: string): string {
  return `/sign-in?next=${encodeURIComponent(returnTo)}`;
}

/**
 * Save the document as a new version of `grooveId` (or as a new groove when `grooveId` is null).
 * @example const r = await saveVersion(id, baseVersionId, doc, "Ghost notes on the snare"); if (!r.ok) show(r.message)
 */
export async function saveVersion(
  grooveId: string | null,
  baseVersionId: string | null,
  doc: GrooveDocument,
  message: string,
  opts: { title?: string; fetch?: typeof fetch; returnTo?: string } = {},
): Promise<SaveOutcome> {
  const doFetch = opts.fetch ?? globalThis.fetch.bind(globalThis);
  const returnTo = opts.returnTo ?? (typeof location === "undefined" ? "/grooves/new" : location.pathname + location.search);
  const url = grooveId ? `/api/grooves/${encodeURIComponent(grooveId)}/versions` : "/api/grooves";
  const body = grooveId
    ? { baseVersionId, document: doc, message }
    : { title: opts.title?.trim() || "Untitled groove", document: doc, message };
  let res: Response;
  try {
    res = await doFetch(url, {
      method: "POST",
      headers: { "content-type": "application/json", accept: "application/json" },
      credentials: "same-origin",
      body: JSON.stringify(body),
    });
  } catch {
    return { ok: false, kind: "network", message: "Could not reach Tactus. Your work is kept in this browser; try again when you are online." };
  }
  let data: unknown = null;
  try {
    data = await res.json();
  } catch {
    data = null;
  }
  if (res.ok) {
    const d = (data ?? {}) as { id?: string; number?: number; grooveId?: string; latestVersion?: { id?: string; number?: number } | null };
    if (grooveId) {
      if (typeof d.id !== "string") return { ok: false, kind: "server", message: "The server saved but did not say which version it made." };
      return { ok: true, grooveId, versionId: d.id, number: d.number ?? null };
    }
    if (typeof d.id !== "string" || typeof d.latestVersion?.id !== "string")
      return { ok: false, kind: "server", message: "The server made the groove but did not say its id." };
    return { ok: true, grooveId: d.id, versionId: d.latestVersion.id, number: d.latestVersion.number ?? 1 };
  }
  const err = (data as ErrorBody | null)?.error;
  const msg = err?.message ?? `Saving failed (HTTP ${res.status}).`;
  switch (res.status) {
    case 401:
      return {
        ok: false,
        kind: "sign-in",
        message: "Sign in to save versions. Your work stays in this browser meanwhile.",
        signInUrl: signInUrl(returnTo),
      };
    case 403:
      return { ok: false, kind: "forbidden", message: msg };
    case 404:
      return { ok: false, kind: "not-found", message: msg };
    case 409:
      return { ok: false, kind: "conflict", message: msg, latest: (data as ErrorBody | null)?.latest ?? null };
    case 400:
    case 413:
    case 422:
      return { ok: false, kind: "invalid", message: msg, ...(err?.fields ? { fields: err.fields } : {}) };
    default:
      return { ok: false, kind: "server", message: msg };
  }
}
