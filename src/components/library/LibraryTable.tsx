/**
 * The library: a TanStack Table over GET /api/grooves with server-side search, filters (scope, tag, owner), sorting
 * and pagination; loading and empty states; the trash with restore. Filter state lives in the URL query, so a
 * filtered view can be bookmarked and the back button works.
 */
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import { useEffect, useMemo, useState } from "react";
import type { GrooveListParams, GrooveSummary } from "../../lib/client/api";
import { useGrooves, useRestoreGroove } from "../../lib/client/queries";
import { quietButtonClass } from "../account/fields";
import DownloadMenu from "../exchange/DownloadMenu";
import ImportMidi from "../exchange/ImportMidi";
import NewGrooveForm from "./NewGrooveForm";
import { withQuery } from "./QueryProvider";

type Scope = NonNullable<GrooveListParams["scope"]>;
const SCOPES: Array<{ id: Scope; label: string; signedIn?: boolean }> = [
  { id: "all", label: "All I can see" },
  { id: "mine", label: "Mine", signedIn: true },
  { id: "shared", label: "Shared with me", signedIn: true },
  { id: "public", label: "Public" },
  { id: "trash", label: "Trash", signedIn: true },
];
const SORTABLE = { title: "title", updatedAt: "updated", createdAt: "created" } as const;

const dateFormat = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit" });
const when = (iso: string) => dateFormat.format(new Date(iso));

/** The filters in the page's query string (passed from the server render, so server and browser agree). */
function readQuery(query: Record<string, string>): GrooveListParams {
  const p = new URLSearchParams(query);
  const num = (k: string) => (p.get(k) && Number.isInteger(Number(p.get(k))) ? Number(p.get(k)) : undefined);
  return {
    scope: (p.get("scope") as Scope) || undefined,
    q: p.get("q") || undefined,
    tag: p.get("tag") || undefined,
    owner: p.get("owner") || undefined,
    sort: (p.get("sort") as GrooveListParams["sort"]) || undefined,
    dir: (p.get("dir") as GrooveListParams["dir"]) || undefined,
    page: num("page"),
  };
}

const col = createColumnHelper<GrooveSummary>();

function LibraryTable({ signedIn, userId, query: initialQuery = {} }: { signedIn: boolean; userId: string | null; query?: Record<string, string> }) {
  const [params, setParams] = useState<GrooveListParams>(() => {
    const fromUrl = Object.fromEntries(Object.entries(readQuery(initialQuery)).filter(([, v]) => v !== undefined));
    return { scope: signedIn ? "all" : "public", sort: "updated", dir: "desc", page: 1, pageSize: 20, ...fromUrl };
  });
  const [search, setSearch] = useState(params.q ?? "");
  const [showNew, setShowNew] = useState(false);

  // Debounced search: one request per pause in typing.
  useEffect(() => {
    const t = setTimeout(() => setParams((p) => (p.q === (search.trim() || undefined) ? p : { ...p, q: search.trim() || undefined, page: 1 })), 250);
    return () => clearTimeout(t);
  }, [search]);
  useEffect(() => {
    const { pageSize: _ps, ...shown } = params;
    const qs = new URLSearchParams(Object.entries(shown).filter(([, v]) => v !== undefined && v !== "").map(([k, v]) => [k, String(v)]));
    history.replaceState(null, "", `${location.pathname}${qs.size ? `?${qs}` : ""}`);
  }, [params]);

  const query = useGrooves(params);
  const restore = useRestoreGroove();
  const trash = params.scope === "trash";
  const data = query.data?.items ?? [];
  const total = query.data?.total ?? 0;
  const capped = query.data?.totalCapped ?? false;
  const pageSize = params.pageSize ?? 20;
  // Past the counting cap, there is a next page whenever this one is full.
  const pageCount = capped ? Math.max(Math.ceil(total / pageSize), (params.page ?? 1) + (data.length === pageSize ? 1 : 0)) : Math.max(1, Math.ceil(total / pageSize));

  const sorting: SortingState = useMemo(() => {
    const id = Object.entries(SORTABLE).find(([, v]) => v === params.sort)?.[0] ?? "updatedAt";
    return [{ id, desc: params.dir !== "asc" }];
  }, [params.sort, params.dir]);

  const columns = useMemo(
    () => [
      col.accessor("title", {
        header: "Title",
        cell: (c) => (
          <div className="min-w-[12rem]">
            <a href={`/grooves/${c.row.original.id}${trash ? "?deleted=1" : ""}`} className="font-medium text-ink hover:text-brass">
              {c.getValue()}
            </a>
            {c.row.original.description && <p className="line-clamp-1 text-sm text-ink-faint">{c.row.original.description}</p>}
          </div>
        ),
      }),
      col.accessor((g) => g.owner.displayName, {
        id: "owner",
        header: "Owner",
        enableSorting: false,
        cell: (c) => (
          <button type="button" className="text-left text-ink-soft hover:text-brass" title="Show only this owner's grooves" onClick={() => setParams((p) => ({ ...p, owner: c.row.original.owner.id, page: 1 }))}>
            {c.row.original.owner.id === userId ? "You" : c.getValue()}
          </button>
        ),
      }),
      col.accessor("tags", {
        header: "Tags",
        enableSorting: false,
        cell: (c) => (
          <div className="flex flex-wrap gap-1">
            {c.getValue().map((t) => (
              <button key={t} type="button" onClick={() => setParams((p) => ({ ...p, tag: t, page: 1 }))} className="rounded-full bg-surface-sunken px-2 py-0.5 text-xs text-ink-soft hover:text-brass" title={`Show grooves tagged ${t}`}>
                {t}
              </button>
            ))}
          </div>
        ),
      }),
      col.accessor("visibility", { header: "Sharing", enableSorting: false, cell: (c) => <span className="text-sm text-ink-soft">{{ private: "Private", link: "Anyone with the link", public: "Public" }[c.getValue()]}</span> }),
      col.accessor((g) => g.latestVersion?.number ?? 0, { id: "versions", header: "Versions", enableSorting: false, cell: (c) => <span className="num text-sm">{c.getValue()}</span> }),
      col.accessor("updatedAt", { header: "Updated", cell: (c) => <span className="num whitespace-nowrap text-sm text-ink-soft">{when(c.getValue())}</span> }),
      col.accessor("createdAt", { header: "Created", cell: (c) => <span className="num whitespace-nowrap text-sm text-ink-soft">{when(c.getValue())}</span> }),
      ...(trash
        ? []
        : [col.display({ id: "download", header: () => <span className="sr-only">Download</span>, cell: (c) => (c.row.original.latestVersion ? <DownloadMenu grooveId={c.row.original.id} title={c.row.original.title} /> : null) })]),
      ...(trash
        ? [
            col.display({
              id: "restore",
              header: "",
              cell: (c) => (
                <button type="button" className={quietButtonClass} disabled={restore.isPending} onClick={() => restore.mutate(c.row.original.id)}>
                  Restore
                </button>
              ),
            }),
          ]
        : []),
    ],
    [trash, userId, restore],
  );

  const table = useReactTable({
    data,
    columns,
    state: { sorting },
    manualSorting: true,
    manualPagination: true,
    manualFiltering: true,
    pageCount,
    enableSortingRemoval: false,
    onSortingChange: (updater) => {
      const next = typeof updater === "function" ? updater(sorting) : updater;
      const first = next[0];
      if (!first) return;
      setParams((p) => ({ ...p, sort: SORTABLE[first.id as keyof typeof SORTABLE] ?? "updated", dir: first.desc ? "desc" : "asc", page: 1 }));
    },
    getCoreRowModel: getCoreRowModel(),
  });

  const filters = [
    params.tag && { label: `tag: ${params.tag}`, clear: () => setParams((p) => ({ ...p, tag: undefined, page: 1 })) },
    params.owner && { label: `owner: ${params.owner === userId || params.owner === "me" ? "you" : (data[0]?.owner.displayName ?? "one person")}`, clear: () => setParams((p) => ({ ...p, owner: undefined, page: 1 })) },
  ].filter(Boolean) as Array<{ label: string; clear: () => void }>;

  return (
    <section aria-labelledby="library-title" className="flex flex-col gap-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 id="library-title" className="text-2xl font-semibold tracking-tight">Library</h1>
          <p className="text-ink-soft">{query.isPending ? "Loading…" : `${total.toLocaleString("en-GB")}${capped ? "+" : ""} groove${total === 1 && !capped ? "" : "s"}`}</p>
        </div>
        {signedIn && (
          <div className="flex flex-wrap gap-2">
            <ImportMidi />
            <button type="button" className="rounded-lg bg-ink px-4 py-2 font-medium text-surface hover:bg-brass" onClick={() => setShowNew((v) => !v)} aria-expanded={showNew}>
              New groove
            </button>
          </div>
        )}
      </div>
      {showNew && <NewGrooveForm onCancel={() => setShowNew(false)} />}

      <div className="flex flex-wrap items-center gap-2" role="group" aria-label="Which grooves">
        {SCOPES.filter((s) => signedIn || !s.signedIn).map((s) => (
          <button
            key={s.id}
            type="button"
            aria-pressed={params.scope === s.id}
            onClick={() => setParams((p) => ({ ...p, scope: s.id, page: 1 }))}
            className="rounded-md px-3 py-1.5 text-sm font-medium text-ink-soft hover:bg-surface-sunken aria-pressed:bg-ink aria-pressed:text-surface"
          >
            {s.label}
          </button>
        ))}
        <label className="ml-auto flex items-center gap-2 text-sm">
          <span className="sr-only">Search titles and descriptions</span>
          <input type="search" value={search} onChange={(e) => setSearch(e.target.value)} placeholder="Search titles and descriptions" className="w-64 rounded-md border border-line-strong bg-surface-raised px-3 py-1.5" />
        </label>
      </div>
      {filters.length > 0 && (
        <div className="flex flex-wrap gap-2 text-sm">
          {filters.map((f) => (
            <button key={f.label} type="button" onClick={f.clear} className="rounded-full border border-line-strong px-3 py-0.5 hover:border-brass" aria-label={`Remove filter ${f.label}`}>
              {f.label} ✕
            </button>
          ))}
        </div>
      )}
      {trash && <p className="text-sm text-ink-soft">Deleted grooves stay here for 30 days; restore them before then.</p>}
      {query.isError && <p role="alert" className="text-danger">{(query.error as Error).message}</p>}

      <div className="overflow-x-auto rounded-lg border border-line bg-surface-raised">
        <table className="w-full border-collapse text-left" aria-busy={query.isFetching}>
          <thead className="border-b border-line bg-surface-sunken text-sm">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const sorted = h.column.getIsSorted();
                  return (
                    <th key={h.id} scope="col" className="px-3 py-2 font-semibold" aria-sort={sorted ? (sorted === "asc" ? "ascending" : "descending") : undefined}>
                      {h.column.getCanSort() ? (
                        <button type="button" onClick={h.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 hover:text-brass">
                          {flexRender(h.column.columnDef.header, h.getContext())}
                          <span aria-hidden className="text-ink-faint">{sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}</span>
                        </button>
                      ) : (
                        flexRender(h.column.columnDef.header, h.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {query.isPending &&
              Array.from({ length: 5 }, (_, i) => (
                <tr key={`s${i}`} className="border-b border-line last:border-0" aria-hidden>
                  <td colSpan={columns.length} className="px-3 py-3">
                    <div className="h-4 w-2/3 animate-pulse rounded bg-surface-sunken" />
                  </td>
                </tr>
              ))}
            {!query.isPending && data.length === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-3 py-10 text-center text-ink-soft" data-testid="library-empty">
                  {params.q || params.tag || params.owner
                    ? "No groove matches these filters."
                    : trash
                      ? "The trash is empty."
                      : params.scope === "mine"
                        ? "You have no grooves yet: start one with “New groove”."
                        : "Nothing here yet."}
                </td>
              </tr>
            )}
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="border-b border-line align-top last:border-0 hover:bg-surface">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2.5">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>

      <nav aria-label="Pages" className="flex items-center justify-between gap-3 text-sm">
        <span className="text-ink-soft">
          Page <span className="num">{params.page ?? 1}</span> of <span className="num">{pageCount}{capped ? "+" : ""}</span>
        </span>
        <div className="flex gap-2">
          <button type="button" className={quietButtonClass} disabled={(params.page ?? 1) <= 1} onClick={() => setParams((p) => ({ ...p, page: Math.max(1, (p.page ?? 1) - 1) }))}>
            Previous
          </button>
          <button type="button" className={quietButtonClass} disabled={(params.page ?? 1) >= pageCount} onClick={() => setParams((p) => ({ ...p, page: (p.page ?? 1) + 1 }))}>
            Next
          </button>
        </div>
      </nav>
    </section>
  );
}

export default withQuery(LibraryTable);
