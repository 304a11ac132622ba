/**
 * The interactive parts of a groove's page: details form (owner, editors; sharing: owner), version history with
 * links to open any version read-only and "restore as new version", fork, trash/restore, and the people panel.
 * Initial data comes from the server render; TanStack Query keeps it fresh after changes.
 */
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { ApiClientError, type GrooveDetail } from "../../lib/client/api";
import {
  useCollaboratorActions,
  useCollaborators,
  useDeleteGroove,
  useForkGroove,
  useGroove,
  useInvite,
  useRestoreGroove,
  useRestoreVersion,
  useUpdateGroove,
  useVersions,
} from "../../lib/client/queries";
import { Field, FormMessage, applyServerErrors, buttonClass, inputClass, quietButtonClass } from "../account/fields";
import { detailsSchema, splitTags, type DetailsValues } from "./NewGrooveForm";
import { withQuery } from "./QueryProvider";

const dateFormat = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit" });
const when = (iso: string) => dateFormat.format(new Date(iso));
const errorText = (e: unknown) => (e instanceof ApiClientError ? e.message : "Something went wrong: try again.");

function DetailsForm({ groove }: { groove: GrooveDetail }) {
  const update = useUpdateGroove(groove.id);
  const form = useForm<DetailsValues>({
    resolver: zodResolver(detailsSchema),
    defaultValues: { title: groove.title, description: groove.description, tags: groove.tags.join(", "), visibility: groove.visibility },
  });
  const [message, setMessage] = useState<{ tone: "ok" | "error"; text: string } | null>(null);
  const { errors, isSubmitting, isDirty } = form.formState;
  const onSubmit = form.handleSubmit(async (v) => {
    setMessage(null);
    const body: Parameters<typeof update.mutateAsync>[0] = { title: v.title, description: v.description, tags: splitTags(v.tags) };
    if (groove.permissions.share && v.visibility !== groove.visibility) body.visibility = v.visibility;
    try {
      const g = await update.mutateAsync(body);
      form.reset({ title: g.title, description: g.description, tags: g.tags.join(", "), visibility: g.visibility });
      setMessage({ tone: "ok", text: "Saved." });
    } catch (e) {
      const text = applyServerErrors(form, e, ["title", "description", "tags", "visibility"]);
      if (text) setMessage({ tone: "error", text });
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3" aria-label="Groove details">
      {message && <FormMessage tone={message.tone}>{message.text}</FormMessage>}
      <Field id="d-title" label="Title" error={errors.title?.message}>
        <input id="d-title" className={inputClass} aria-invalid={Boolean(errors.title)} {...form.register("title")} />
      </Field>
      <Field id="d-description" label="Description" error={errors.description?.message}>
        <textarea id="d-description" rows={3} className={inputClass} {...form.register("description")} />
      </Field>
      <Field id="d-tags" label="Tags" error={errors.tags?.message} hint="Separated by commas">
        <input id="d-tags" className={inputClass} {...form.register("tags")} />
      </Field>
      <Field id="d-visibility" label="Who can see it" hint={groove.permissions.share ? undefined : "Only the owner changes this."}>
        <select id="d-visibility" className={inputClass} disabled={!groove.permissions.share} {...form.register("visibility")}>
          <option value="private">Only the owner and invited people</option>
          <option value="link">Anyone with the link</option>
          <option value="public">Everyone (listed in the library)</option>
        </select>
      </Field>
      <div>
        <button type="submit" className={buttonClass} disabled={isSubmitting || !isDirty}>Save details</button>
      </div>
    </form>
  );
}

function History({ groove, viewing }: { groove: GrooveDetail; viewing: string | null }) {
  const versions = useVersions(groove.id);
  const restore = useRestoreVersion(groove.id);
  const [message, setMessage] = useState<{ tone: "ok" | "error"; text: string } | null>(null);
  const latestId = versions.data?.items[0]?.id ?? groove.latestVersion?.id ?? null;
  return (
    <section aria-labelledby="history-title" className="flex flex-col gap-3">
      <h2 id="history-title" className="text-lg font-semibold">Version history</h2>
      {message && <FormMessage tone={message.tone}>{message.text}</FormMessage>}
      {versions.isPending && <p className="text-ink-soft">Loading versions…</p>}
      {versions.isError && <p role="alert" className="text-danger">{errorText(versions.error)}</p>}
      <ol className="flex flex-col divide-y divide-line rounded-lg border border-line bg-surface-raised" data-testid="version-history">
        {versions.data?.items.map((v) => {
          const isLatest = v.id === latestId;
          const isViewing = viewing ? v.id === viewing : isLatest;
          return (
            <li key={v.id} className={`flex flex-wrap items-baseline gap-x-3 gap-y-1 px-3 py-2.5 ${isViewing ? "bg-surface-sunken" : ""}`}>
              <span className="num font-semibold">v{v.number}</span>
              <span className="min-w-0 flex-1">
                <span className="block text-ink">{v.message || <em className="text-ink-faint">no message</em>}</span>
                <span className="block text-sm text-ink-faint">
                  {v.author?.displayName ?? "a former member"} · <time dateTime={v.createdAt}>{when(v.createdAt)}</time> · <code className="text-xs" title="SHA-256 of the document">{v.contentHash.slice(0, 10)}</code>
                </span>
              </span>
              {isLatest && <span className="rounded-full bg-teal-soft px-2 py-0.5 text-xs text-ink">latest</span>}
              {!isViewing && (
                <a className="text-sm font-medium text-brass" href={isLatest ? `/grooves/${groove.id}` : `/grooves/${groove.id}?version=${v.id}`}>
                  Open
                </a>
              )}
              {groove.permissions.edit && !isLatest && latestId && (
                <button
                  type="button"
                  className={quietButtonClass}
                  disabled={restore.isPending}
                  onClick={async () => {
                    setMessage(null);
                    try {
                      const r = await restore.mutateAsync({ versionId: v.id, baseVersionId: latestId });
                      setMessage({ tone: "ok", text: `Version ${v.number} is now version ${r.number}, the latest.` });
                    } catch (e) {
                      setMessage({ tone: "error", text: errorText(e) });
                    }
                  }}
                >
                  Restore as new version
                </button>
              )}
            </li>
          );
        })}
      </ol>
    </section>
  );
}

function People({ groove }: { groove: GrooveDetail }) {
  const people = useCollaborators(groove.id);
  const invite = useInvite(groove.id);
  const actions = useCollaboratorActions(groove.id);
  const form = useForm<{ email: string; role: "editor" | "viewer" }>({
    resolver: zodResolver(z.object({ email: z.string().trim().pipe(z.email({ message: "Enter a valid e-mail address." })), role: z.enum(["editor", "viewer"]) })),
    defaultValues: { email: "", role: "viewer" },
  });
  const [message, setMessage] = useState<{ tone: "ok" | "error"; text: string } | null>(null);
  const run = async (fn: () => Promise<unknown>) => {
    setMessage(null);
    try {
      await fn();
    } catch (e) {
      setMessage({ tone: "error", text: errorText(e) });
    }
  };
  const onInvite = form.handleSubmit(async (v) => {
    setMessage(null);
    try {
      await invite.mutateAsync(v);
      form.reset({ email: "", role: v.role });
      setMessage({ tone: "ok", text: `Invitation sent to ${v.email}.` });
    } catch (e) {
      const text = applyServerErrors(form, e, ["email", "role"]);
      if (text) setMessage({ tone: "error", text });
    }
  });
  const { errors } = form.formState;
  return (
    <section aria-labelledby="people-title" className="flex flex-col gap-3">
      <h2 id="people-title" className="text-lg font-semibold">People</h2>
      {message && <FormMessage tone={message.tone}>{message.text}</FormMessage>}
      {people.isPending && <p className="text-ink-soft">Loading…</p>}
      <ul className="flex flex-col divide-y divide-line rounded-lg border border-line bg-surface-raised" data-testid="people">
        {people.data?.people.map((p) => (
          <li key={p.userId} className="flex flex-wrap items-center gap-2 px-3 py-2">
            <span className="min-w-0 flex-1">
              <span className="block">{p.displayName}</span>
              {p.email && <span className="block text-sm text-ink-faint">{p.email}</span>}
            </span>
            {groove.permissions.share && p.role !== "owner" ? (
              <>
                <label className="sr-only" htmlFor={`role-${p.userId}`}>Role of {p.displayName}</label>
                <select id={`role-${p.userId}`} className="rounded-md border border-line-strong bg-surface px-2 py-1 text-sm" value={p.role} onChange={(e) => run(() => actions.changeRole.mutateAsync({ userId: p.userId, role: e.target.value as "editor" | "viewer" }))}>
                  <option value="editor">editor</option>
                  <option value="viewer">viewer</option>
                </select>
                <button type="button" className={quietButtonClass} onClick={() => run(() => actions.remove.mutateAsync(p.userId))}>Remove</button>
              </>
            ) : (
              <span className="text-sm text-ink-soft">{p.role}</span>
            )}
          </li>
        ))}
      </ul>
      {groove.permissions.share && (
        <>
          {people.data?.invitations && people.data.invitations.length > 0 && (
            <div>
              <h3 className="text-sm font-semibold text-ink-soft">Waiting for an answer</h3>
              <ul className="mt-1 flex flex-col gap-1 text-sm">
                {people.data.invitations.map((i) => (
                  <li key={i.id} className="flex items-center gap-2">
                    <span className="flex-1">{i.email} · {i.role} · until {when(i.expiresAt)}</span>
                    <button type="button" className={quietButtonClass} onClick={() => run(() => actions.revoke.mutateAsync(i.id))}>Withdraw</button>
                  </li>
                ))}
              </ul>
            </div>
          )}
          <form onSubmit={onInvite} noValidate className="flex flex-wrap items-end gap-2" aria-label="Invite someone">
            <div className="min-w-[14rem] flex-1">
              <Field id="invite-email" label="Invite by e-mail" error={errors.email?.message}>
                <input id="invite-email" type="email" className={inputClass} aria-invalid={Boolean(errors.email)} {...form.register("email")} />
              </Field>
            </div>
            <div>
              <label htmlFor="invite-role" className="sr-only">Role</label>
              <select id="invite-role" className="rounded-md border border-line-strong bg-surface-raised px-2 py-2" {...form.register("role")}>
                <option value="viewer">as viewer</option>
                <option value="editor">as editor</option>
              </select>
            </div>
            <button type="submit" className={buttonClass} disabled={form.formState.isSubmitting}>Invite</button>
          </form>
        </>
      )}
    </section>
  );
}

function Actions({ groove, signedIn }: { groove: GrooveDetail; signedIn: boolean }) {
  const fork = useForkGroove(groove.id);
  const del = useDeleteGroove();
  const restore = useRestoreGroove();
  const [error, setError] = useState("");
  const act = async (fn: () => Promise<void>) => {
    setError("");
    try {
      await fn();
    } catch (e) {
      setError(errorText(e));
    }
  };
  return (
    <div className="flex flex-wrap items-center gap-2">
      {error && <FormMessage>{error}</FormMessage>}
      {groove.deletedAt ? (
        groove.permissions.delete && (
          <button type="button" className={buttonClass} onClick={() => act(async () => { await restore.mutateAsync(groove.id); location.assign(`/grooves/${groove.id}`); })}>
            Restore from the trash
          </button>
        )
      ) : (
        <>
          {groove.permissions.fork && (
            <button type="button" className={quietButtonClass} onClick={() => act(async () => { const g = await fork.mutateAsync({}); location.assign(`/grooves/${g.id}`); })}>
              Fork
            </button>
          )}
          {!signedIn && <a href={`/sign-in?next=/grooves/${groove.id}`} className="text-sm text-brass">Sign in to fork</a>}
          {groove.permissions.delete && (
            <button
              type="button"
              className={quietButtonClass}
              onClick={() => act(async () => {
                if (!confirm(`Move "${groove.title}" to the trash? You can restore it for 30 days.`)) return;
                await del.mutateAsync(groove.id);
                location.assign("/library?scope=trash");
              })}
            >
              Move to trash
            </button>
          )}
        </>
      )}
    </div>
  );
}

function GroovePanel({ initial, viewing, signedIn }: { initial: GrooveDetail; viewing: string | null; signedIn: boolean }) {
  const groove = useGroove(initial.id, { deleted: Boolean(initial.deletedAt), initialData: initial });
  const g = groove.data ?? initial;
  return (
    <div className="grid gap-8 lg:grid-cols-[minmax(0,1fr)_minmax(0,22rem)]">
      <div className="flex flex-col gap-8">
        <Actions groove={g} signedIn={signedIn} />
        {!g.deletedAt && <History groove={g} viewing={viewing} />}
      </div>
      <div className="flex flex-col gap-8">
        {g.permissions.edit && !g.deletedAt && (
          <section aria-labelledby="details-title" className="flex flex-col gap-3">
            <h2 id="details-title" className="text-lg font-semibold">Details</h2>
            <DetailsForm groove={g} />
          </section>
        )}
        {g.permissions.seeCollaborators && !g.deletedAt && <People groove={g} />}
      </div>
    </div>
  );
}

export default withQuery(GroovePanel);
