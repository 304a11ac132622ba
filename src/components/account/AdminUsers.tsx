/**
 * The admin's user table (TanStack Table over GET /api/admin/users): search by name or e-mail, filter by role and
 * state, pages; change a site role, disable or enable an account (disabling ends its sessions at once).
 */
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable } from "@tanstack/react-table";
import { useEffect, useMemo, useState } from "react";
import { ApiClientError, type SiteRole, type User } from "../../lib/client/api";
import { useUpdateUser, useUsers } from "../../lib/client/queries";
import { withQuery } from "../library/QueryProvider";
import { FormMessage, quietButtonClass } from "./fields";

const col = createColumnHelper<User>();
const dateFormat = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric" });

function AdminUsers({ selfId }: { selfId: string }) {
  const [search, setSearch] = useState("");
  const [params, setParams] = useState<{ q?: string; role?: SiteRole; status?: "active" | "disabled"; page: number; pageSize: number }>({ page: 1, pageSize: 25 });
  useEffect(() => {
    const t = setTimeout(() => setParams((p) => ({ ...p, q: search.trim() || undefined, page: 1 })), 250);
    return () => clearTimeout(t);
  }, [search]);
  const users = useUsers(params);
  const update = useUpdateUser();
  const [message, setMessage] = useState<{ tone: "ok" | "error"; text: string } | null>(null);
  const change = async (u: User, body: { siteRole?: SiteRole; disabled?: boolean }, done: string) => {
    setMessage(null);
    try {
      await update.mutateAsync({ id: u.id, ...body });
      setMessage({ tone: "ok", text: done });
    } catch (e) {
      setMessage({ tone: "error", text: e instanceof ApiClientError ? e.message : "Something went wrong." });
    }
  };
  const columns = useMemo(
    () => [
      col.accessor("displayName", { header: "Name", cell: (c) => <span className="font-medium">{c.getValue()}</span> }),
      col.accessor("email", { header: "E-mail", cell: (c) => <span className="text-sm">{c.getValue()} {c.row.original.emailVerified ? "" : <em className="text-ink-faint">(not confirmed)</em>}</span> }),
      col.accessor("siteRole", {
        header: "Site role",
        cell: (c) => (
          <select
            aria-label={`Site role of ${c.row.original.displayName}`}
            className="rounded-md border border-line-strong bg-surface px-2 py-1 text-sm"
            value={c.getValue()}
            disabled={c.row.original.id === selfId}
            onChange={(e) => change(c.row.original, { siteRole: e.target.value as SiteRole }, `${c.row.original.displayName} is now ${e.target.value}.`)}
          >
            <option value="member">member</option>
            <option value="admin">admin</option>
          </select>
        ),
      }),
      col.accessor("disabled", {
        header: "State",
        cell: (c) =>
          c.row.original.id === selfId ? (
            <span className="text-sm text-ink-faint">you</span>
          ) : (
            <button
              type="button"
              className={quietButtonClass}
              onClick={() => change(c.row.original, { disabled: !c.getValue() }, c.getValue() ? `${c.row.original.displayName} can sign in again.` : `${c.row.original.displayName} is disabled and signed out everywhere.`)}
            >
              {c.getValue() ? "Enable" : "Disable"}
            </button>
          ),
      }),
      col.accessor("createdAt", { header: "Joined", cell: (c) => <span className="num text-sm text-ink-soft">{c.getValue() ? dateFormat.format(new Date(c.getValue()!)) : ""}</span> }),
    ],
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [selfId],
  );
  const table = useReactTable({ data: users.data?.items ?? [], columns, getCoreRowModel: getCoreRowModel(), manualPagination: true });
  const total = users.data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / params.pageSize));
  return (
    <section className="flex flex-col gap-4" aria-labelledby="users-title">
      <h2 id="users-title" className="text-xl font-semibold">Users <span className="num text-base font-normal text-ink-faint">({total})</span></h2>
      {message && <FormMessage tone={message.tone}>{message.text}</FormMessage>}
      <div className="flex flex-wrap gap-2">
        <input type="search" aria-label="Search by name or e-mail" placeholder="Search by name or e-mail" value={search} onChange={(e) => setSearch(e.target.value)} className="w-72 rounded-md border border-line-strong bg-surface-raised px-3 py-1.5" />
        <select aria-label="Role" className="rounded-md border border-line-strong bg-surface-raised px-2" value={params.role ?? ""} onChange={(e) => setParams((p) => ({ ...p, role: (e.target.value || undefined) as SiteRole | undefined, page: 1 }))}>
          <option value="">all roles</option>
          <option value="admin">admins</option>
          <option value="member">members</option>
        </select>
        <select aria-label="State" className="rounded-md border border-line-strong bg-surface-raised px-2" value={params.status ?? ""} onChange={(e) => setParams((p) => ({ ...p, status: (e.target.value || undefined) as "active" | "disabled" | undefined, page: 1 }))}>
          <option value="">active and disabled</option>
          <option value="active">active</option>
          <option value="disabled">disabled</option>
        </select>
      </div>
      <div className="overflow-x-auto rounded-lg border border-line bg-surface-raised">
        <table className="w-full text-left" aria-busy={users.isFetching}>
          <thead className="border-b border-line bg-surface-sunken text-sm">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>{hg.headers.map((h) => <th key={h.id} scope="col" className="px-3 py-2">{flexRender(h.column.columnDef.header, h.getContext())}</th>)}</tr>
            ))}
          </thead>
          <tbody>
            {users.isPending && <tr><td colSpan={columns.length} className="px-3 py-6 text-ink-soft">Loading…</td></tr>}
            {!users.isPending && total === 0 && <tr><td colSpan={columns.length} className="px-3 py-6 text-center text-ink-soft">No user matches.</td></tr>}
            {table.getRowModel().rows.map((r) => (
              <tr key={r.id} className="border-b border-line last:border-0" data-user-email={r.original.email}>
                {r.getVisibleCells().map((c) => <td key={c.id} className="px-3 py-2">{flexRender(c.column.columnDef.cell, c.getContext())}</td>)}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div className="flex items-center justify-between text-sm">
        <span className="text-ink-soft">Page <span className="num">{params.page}</span> of <span className="num">{pages}</span></span>
        <div className="flex gap-2">
          <button type="button" className={quietButtonClass} disabled={params.page <= 1} onClick={() => setParams((p) => ({ ...p, page: p.page - 1 }))}>Previous</button>
          <button type="button" className={quietButtonClass} disabled={params.page >= pages} onClick={() => setParams((p) => ({ ...p, page: p.page + 1 }))}>Next</button>
        </div>
      </div>
    </section>
  );
}

export default withQuery(AdminUsers);
