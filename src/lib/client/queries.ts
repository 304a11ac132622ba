/**
 * TanStack Query hooks over api.ts: one query key per resource, and mutations that refresh what they change.
 * Islands wrap themselves in <QueryProvider> (components/library/QueryProvider.tsx).
 */
import { keepPreviousData, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api, type GrooveDetail, type GrooveListParams, type SiteRole, type Visibility } from "./api";

export const keys = {
  me: ["me"] as const,
  grooves: (params: GrooveListParams) => ["grooves", params] as const,
  groove: (id: string) => ["groove", id] as const,
  versions: (id: string) => ["groove", id, "versions"] as const,
  version: (id: string, versionId: string) => ["groove", id, "version", versionId] as const,
  collaborators: (id: string) => ["groove", id, "collaborators"] as const,
  users: (params: object) => ["users", params] as const,
};

export const useMe = () => useQuery({ queryKey: keys.me, queryFn: api.me, retry: false });

/** The library list; keeps the previous page on screen while the next one loads. */
export const useGrooves = (params: GrooveListParams) =>
  useQuery({ queryKey: keys.grooves(params), queryFn: () => api.grooves(params), placeholderData: keepPreviousData });

export const useGroove = (id: string, opts: { deleted?: boolean; initialData?: GrooveDetail } = {}) =>
  useQuery({ queryKey: keys.groove(id), queryFn: () => api.groove(id, { deleted: opts.deleted }), initialData: opts.initialData });
export const useVersions = (id: string) => useQuery({ queryKey: keys.versions(id), queryFn: () => api.versions(id) });
/** Versions never change, so a loaded one is never refetched. */
export const useVersion = (id: string, versionId: string | null) =>
  useQuery({ queryKey: keys.version(id, versionId ?? ""), queryFn: () => api.version(id, versionId!), enabled: Boolean(versionId), staleTime: Infinity });
export const useCollaborators = (id: string, enabled = true) => useQuery({ queryKey: keys.collaborators(id), queryFn: () => api.collaborators(id), enabled });

function useInvalidate() {
  const qc = useQueryClient();
  return (...prefixes: readonly unknown[][]) => Promise.all(prefixes.map((queryKey) => qc.invalidateQueries({ queryKey })));
}

export function useCreateGroove() {
  const invalidate = useInvalidate();
  return useMutation({ mutationFn: api.createGroove, onSuccess: () => invalidate(["grooves"]) });
}

export function useUpdateGroove(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { title?: string; description?: string; tags?: string[]; visibility?: Visibility }) => api.updateGroove(id, body),
    onSuccess: (groove) => {
      qc.setQueryData(keys.groove(id), groove);
      return qc.invalidateQueries({ queryKey: ["grooves"] });
    },
  });
}

export function useDeleteGroove() {
  const invalidate = useInvalidate();
  return useMutation({ mutationFn: api.deleteGroove, onSuccess: () => invalidate(["grooves"]) });
}

export function useRestoreGroove() {
  const invalidate = useInvalidate();
  return useMutation({ mutationFn: api.restoreGroove, onSuccess: (g) => invalidate(["grooves"], ["groove", g.id]) });
}

export function useForkGroove(id: string) {
  const invalidate = useInvalidate();
  return useMutation({ mutationFn: (body: { title?: string; versionId?: string }) => api.forkGroove(id, body), onSuccess: () => invalidate(["grooves"]) });
}

export function useRestoreVersion(id: string) {
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: ({ versionId, baseVersionId }: { versionId: string; baseVersionId: string }) => api.restoreVersion(id, versionId, baseVersionId),
    onSettled: () => invalidate(["groove", id], ["grooves"]),
  });
}

export function useInvite(id: string) {
  const invalidate = useInvalidate();
  return useMutation({ mutationFn: (body: { email: string; role: "editor" | "viewer" }) => api.invite(id, body), onSuccess: () => invalidate(keys.collaborators(id) as unknown as unknown[]) });
}

export function useCollaboratorActions(id: string) {
  const invalidate = useInvalidate();
  const refresh = () => invalidate(keys.collaborators(id) as unknown as unknown[]);
  return {
    changeRole: useMutation({ mutationFn: ({ userId, role }: { userId: string; role: "editor" | "viewer" }) => api.changeRole(id, userId, role), onSuccess: refresh }),
    remove: useMutation({ mutationFn: (userId: string) => api.removeCollaborator(id, userId), onSuccess: refresh }),
    revoke: useMutation({ mutationFn: (invitationId: string) => api.revokeInvitation(id, invitationId), onSuccess: refresh }),
  };
}

export const useUsers = (params: { q?: string; role?: SiteRole; status?: "active" | "disabled"; page?: number; pageSize?: number }) =>
  useQuery({ queryKey: keys.users(params), queryFn: () => api.users(params), placeholderData: keepPreviousData });

export function useUpdateUser() {
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: ({ id, ...body }: { id: string; siteRole?: SiteRole; disabled?: boolean }) => api.updateUser(id, body),
    onSuccess: () => invalidate(["users"]),
  });
}
