/**
 * Saving a version: explicit, through the one client module `save.ts`. Signed-out visitors are asked to
 * sign in (their draft stays in the browser); conflicts and refusals are shown as the server words them.
 */
import { useId, useState } from "react";
import { browserStorage, clearDraft } from "../../lib/client/drafts";
import { saveVersion, type SaveOutcome } from "../../lib/client/save";
import { hasUnsavedChanges } from "../../stores/editor-store";
import { useActions, useEditor, useEditorStore } from "./context";

export function SaveControls() {
  const id = useId();
  const store = useEditorStore();
  const actions = useActions();
  const grooveId = useEditor((s) => s.grooveId);
  const dirty = useEditor((s) => hasUnsavedChanges(s));
  const [title, setTitle] = useState(() => store.getState().title);
  const [message, setMessage] = useState("");
  const [busy, setBusy] = useState(false);
  const [outcome, setOutcome] = useState<SaveOutcome | null>(null);

  const save = async (e?: React.FormEvent, onTopOf?: string) => {
    e?.preventDefault();
    const s = store.getState();
    setBusy(true);
    const r = await saveVersion(s.grooveId, onTopOf ?? s.baseVersionId, s.doc, message.trim(), { title });
    setBusy(false);
    setOutcome(r);
    if (!r.ok) return;
    const storage = browserStorage();
    if (storage) clearDraft(storage, s.grooveId);
    actions.markSaved(r.grooveId, r.versionId);
    setMessage("");
    // A scratch groove now has an address of its own.
    if (s.grooveId === null && typeof location !== "undefined") location.assign(`/grooves/${encodeURIComponent(r.grooveId)}/edit`);
  };

  return (
    <form className="tx-save" onSubmit={save} aria-describedby={`${id}-status`}>
      {grooveId === null && (
        <label className="tx-field">
          <span>Title</span>
          <input value={title} maxLength={120} placeholder="Untitled groove" onChange={(e) => setTitle(e.target.value)} />
        </label>
      )}
      <label className="tx-field">
        <span>What changed (optional)</span>
        <input value={message} maxLength={200} placeholder="e.g. ghost notes before the backbeat" onChange={(e) => setMessage(e.target.value)} />
      </label>
      <button type="submit" className="tx-btn is-primary" disabled={busy}>
        {busy ? "Saving…" : "Save version"}
      </button>
      <p id={`${id}-status`} className="tx-savestate" role="status">
        {outcome?.ok === false ? (
          outcome.kind === "sign-in" ? (
            <>
              {outcome.message} <a href={outcome.signInUrl}>Sign in</a>
            </>
          ) : outcome.kind === "conflict" && outcome.latest ? (
            <>
              <span className="tx-error">{outcome.message}</span>{" "}
              <button type="button" className="tx-btn is-small" disabled={busy} onClick={() => void save(undefined, outcome.latest!.id)}>
                Save mine on top of version {outcome.latest.number}
              </button>{" "}
              <span className="tx-dim">(version {outcome.latest.number} stays in the history)</span>
            </>
          ) : (
            <span className="tx-error">{outcome.message}</span>
          )
        ) : outcome?.ok && !dirty ? (
          <>Saved{outcome.number ? ` as version ${outcome.number}` : ""}.</>
        ) : dirty ? (
          <span className="tx-dim">Unsaved changes (kept in this browser)</span>
        ) : (
          <span className="tx-dim">No unsaved changes</span>
        )}
      </p>
    </form>
  );
}
