/**
 * Typed fetch for the app's own API. Every call sends and expects JSON; a refusal becomes an ApiClientError that
 * carries the server's one error shape ({ error: { code, message, fields? } }) plus any extra members (e.g. `latest`).
 * The answer types live in src/lib/api-types.ts, shared with the server that builds them.
 */
import type { GrooveDetail, GrooveRole, GrooveSummary, PublicUser, SiteRole, VersionSummary, VersionWithDocument, Visibility } from "../api-types";
import type { GrooveDocument } from "../rhythm/document";

export type { GrooveDetail, GrooveRole, GrooveSummary, SiteRole, VersionSummary, Visibility } from "../api-types";
export type User = PublicUser;

export interface Page<T> {
  items: T[];
  total: number;
  /** The library list stops counting at 1,000: then `total` is 1000 and this is true. */
  totalCapped?: boolean;
  page: number;
  pageSize: number;
}

export interface GrooveListParams {
  scope?: "all" | "mine" | "shared" | "public" | "trash";
  q?: string;
  tag?: string;
  owner?: string;
  sort?: "updated" | "created" | "title";
  dir?: "asc" | "desc";
  page?: number;
  pageSize?: number;
}

export interface Collaborators {
  people: Array<{ userId: string; displayName: string; email: string; role: GrooveRole; addedAt: string | null }>;
  invitations: Array<{ id: string; email: string; role: "editor" | "viewer"; createdAt: string; expiresAt: string }> | null;
}

export class ApiClientError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields: Record<string, string[]> = {},
    readonly body: unknown = null,
  ) {
    super(message);
    this.name = "ApiClientError";
  }
}

/**
 * One request to the API. Resolves with the JSON answer (undefined for 204); rejects with ApiClientError.
 * @example const me = await apiFetch<{ user: User }>("GET", "/api/auth/me");
 */
export async function apiFetch<T>(method: string, path: string, body?: unknown): Promise<T> {
  let res: Response;
  try {
    res = await fetch(path, {
      method,
      credentials: "same-origin",
      headers: { accept: "application/json", ...(method === "GET" ? {} : { "content-type": "application/json" }) },
      body: method === "GET" ? undefined : JSON.stringify(body ?? {}),
    });
  } catch {
    throw new ApiClientError(0, "network", "Could not reach Tactus: check the connection and try again.");
  }
  if (res.status === 204) return undefined as T;
  let data: unknown = null;
  try {
    data = await res.json();
  } catch {
    data = null;
  }
  if (!res.ok) {
    const e = (data as { error?: { code?: string; message?: string; fields?: Record<string, string[]> } } | null)?.error;
    throw new ApiClientError(res.status, e?.code ?? "http_error", e?.message ?? `The server answered ${res.status}.`, e?.fields ?? {}, data);
  }
  return data as T;
}

/** Query string from defined, non-empty values. */
export function queryString(params: object): string {
  const entries = Object.entries(params).filter(([, v]) => v !== undefined && v !== null && v !== "");
  return entries.length ? `?${new URLSearchParams(entries.map(([k, v]) => [k, String(v)])).toString()}` : "";
}

export const api = {
  me: () => apiFetch<{ user: User }>("GET", "/api/auth/me"),
  signIn: (body: { email: string; password: string }) => apiFetch<{ user: User }>("POST", "/api/auth/sign-in", body),
  signUp: (body: { email: string; password: string; displayName: string }) => apiFetch<{ user: User }>("POST", "/api/auth/sign-up", body),
  signOut: () => apiFetch<void>("POST", "/api/auth/sign-out"),
  verifyEmail: (token: string) => apiFetch<{ verified: boolean }>("POST", "/api/auth/verify-email", { token }),
  resendVerification: () => apiFetch<{ sent: boolean }>("POST", "/api/auth/resend-verification"),
  requestReset: (email: string) => apiFetch<{ message: string }>("POST", "/api/auth/reset-request", { email }),
  resetPassword: (token: string, password: string) => apiFetch<{ reset: boolean; user: User | null }>("POST", "/api/auth/reset-password", { token, password }),

  grooves: (params: GrooveListParams) => apiFetch<Page<GrooveSummary>>("GET", `/api/grooves${queryString(params)}`),
  groove: (id: string, opts: { deleted?: boolean } = {}) => apiFetch<GrooveDetail>("GET", `/api/grooves/${encodeURIComponent(id)}${opts.deleted ? "?deleted=1" : ""}`),
  createGroove: (body: { title: string; description?: string; tags?: string[]; visibility?: Visibility; document?: GrooveDocument; message?: string }) =>
    apiFetch<GrooveDetail>("POST", "/api/grooves", body),
  updateGroove: (id: string, body: { title?: string; description?: string; tags?: string[]; visibility?: Visibility }) =>
    apiFetch<GrooveDetail>("PATCH", `/api/grooves/${encodeURIComponent(id)}`, body),
  deleteGroove: (id: string) => apiFetch<void>("DELETE", `/api/grooves/${encodeURIComponent(id)}`),
  restoreGroove: (id: string) => apiFetch<GrooveDetail>("POST", `/api/grooves/${encodeURIComponent(id)}/restore`),
  forkGroove: (id: string, body: { title?: string; versionId?: string } = {}) => apiFetch<GrooveDetail>("POST", `/api/grooves/${encodeURIComponent(id)}/fork`, body),
  versions: (id: string) => apiFetch<{ items: VersionSummary[] }>("GET", `/api/grooves/${encodeURIComponent(id)}/versions?limit=500`),
  version: (id: string, versionId: string) => apiFetch<VersionWithDocument>("GET", `/api/grooves/${encodeURIComponent(id)}/versions/${encodeURIComponent(versionId)}`),
  restoreVersion: (id: string, versionId: string, baseVersionId: string) =>
    apiFetch<VersionWithDocument>("POST", `/api/grooves/${encodeURIComponent(id)}/versions/${encodeURIComponent(versionId)}/restore`, { baseVersionId }),
  collaborators: (id: string) => apiFetch<Collaborators>("GET", `/api/grooves/${encodeURIComponent(id)}/collaborators`),
  invite: (id: string, body: { email: string; role: "editor" | "viewer" }) => apiFetch<unknown>("POST", `/api/grooves/${encodeURIComponent(id)}/invitations`, body),
  revokeInvitation: (id: string, invitationId: string) => apiFetch<void>("DELETE", `/api/grooves/${encodeURIComponent(id)}/invitations/${encodeURIComponent(invitationId)}`),
  changeRole: (id: string, userId: string, role: "editor" | "viewer") =>
    apiFetch<void>("PATCH", `/api/grooves/${encodeURIComponent(id)}/collaborators/${encodeURIComponent(userId)}`, { role }),
  removeCollaborator: (id: string, userId: string) => apiFetch<void>("DELETE", `/api/grooves/${encodeURIComponent(id)}/collaborators/${encodeURIComponent(userId)}`),
  acceptInvitation: (token: string) => apiFetch<{ grooveId: string; role: string }>("POST", "/api/grooves/invitations/accept", { token }),

  users: (params: { q?: string; role?: SiteRole; status?: "active" | "disabled"; page?: number; pageSize?: number }) =>
    apiFetch<Page<User>>("GET", `/api/admin/users${queryString(params)}`),
  updateUser: (id: string, body: { siteRole?: SiteRole; disabled?: boolean }) => apiFetch<User>("PATCH", `/api/admin/users/${encodeURIComponent(id)}`, body),
};
