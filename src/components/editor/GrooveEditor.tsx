/**
 * The editor island: one store per editor instance, made from the server's props, provided to every part
 * through context. After mounting it restores the browser draft (if any) and keeps it up to date, and it
 * handles the keyboard shortcuts for the whole editor.
 */
import { useEffect, useMemo, useRef, useState } from "react";
import type { GrooveDocument } from "../../lib/rhythm";
import { browserStorage, clearDraft, keepDraft, loadDraft } from "../../lib/client/drafts";
import { createEditorStore } from "../../stores/editor-store";
import { BarTools } from "./BarTools";
import { EditorContext, useActions, useEditor, useHistory, useServices, type EditorServices } from "./context";
import { DraftBanner, type DraftInfo } from "./DraftBanner";
import { GridArea } from "./GridArea";
import { MeterTempoPanel } from "./MeterTempoPanel";
import { NotationPreview } from "./NotationPreview";
import { NoticeBar } from "./NoticeBar";
import { RenotatePanel } from "./RenotatePanel";
import { SaveControls } from "./SaveControls";
import { SectionsPanel } from "./SectionsPanel";
import { ShortcutSheet } from "./ShortcutSheet";
import { handleEditorKey } from "./shortcuts";
import { TapTempo, type TapHandle } from "./TapTempo";
import { Transport } from "./Transport";
import { createTransportController, type TransportHandle } from "./transport-port";
import "./editor.css";

export interface GrooveEditorProps {
  doc: GrooveDocument;
  /** Saved groove id, or null for a scratch groove. */
  grooveId: string | null;
  baseVersionId: string | null;
  title?: string;
  /** Tests: replace the audio adapter loader. */
  loadTransport?: () => Promise<TransportHandle | null>;
}

export default function GrooveEditor(props: GrooveEditorProps) {
  const services = useMemo<EditorServices>(() => {
    const store = createEditorStore({ doc: props.doc, grooveId: props.grooveId, baseVersionId: props.baseVersionId, title: props.title ?? "" });
    return { store, transport: createTransportController(store, props.loadTransport) };
    // One store for the island's lifetime: props are the initial state only.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);
  const [draft, setDraft] = useState<DraftInfo>({ restoredAt: null, scratch: props.grooveId === null, storageFailed: false, olderBase: false });

  // Restore the draft after hydration (the server cannot see browser storage), then keep it.
  useEffect(() => {
    const { store } = services;
    const storage = browserStorage();
    if (!storage) {
      setDraft((d) => ({ ...d, storageFailed: true }));
      return;
    }
    const saved = loadDraft(storage, props.grooveId);
    if (saved) {
      // A draft made on an older version keeps that version as its base, so saving it reports the conflict
      // instead of quietly writing over the newer version.
      const older = props.grooveId !== null && saved.baseVersionId !== props.baseVersionId;
      store.getState().actions.loadDocument(saved.doc, older ? { baseVersionId: saved.baseVersionId } : {});
      setDraft((d) => ({ ...d, restoredAt: saved.savedAt, olderBase: older }));
    }
    const keeper = keepDraft(store, storage, { onWrite: (ok) => setDraft((d) => (d.storageFailed === !ok ? d : { ...d, storageFailed: !ok })) });
    const flush = () => keeper.flush();
    window.addEventListener("pagehide", flush);
    return () => {
      window.removeEventListener("pagehide", flush);
      keeper.stop();
    };
  }, [services, props.grooveId, props.baseVersionId]);

  useEffect(() => () => services.transport.dispose(), [services]);

  const discardDraft = () => {
    const storage = browserStorage();
    if (storage) clearDraft(storage, props.grooveId);
    services.store.getState().actions.loadDocument(props.doc, { saved: props.grooveId !== null, baseVersionId: props.baseVersionId });
    setDraft((d) => ({ ...d, restoredAt: null, olderBase: false }));
  };

  return (
    <EditorContext.Provider value={services}>
      <EditorShell draft={draft} onDiscard={discardDraft} />
    </EditorContext.Provider>
  );
}

/**
 * The live notation reads the document and playhead itself, so an edit or a playhead step re-renders this
 * part and not the whole editor shell (panels, transport, grid frame).
 */
function EditorNotation() {
  const doc = useEditor((s) => s.doc);
  const playhead = useEditor((s) => s.playhead);
  return <NotationPreview doc={doc} playhead={playhead} label="Notation of this groove" live />;
}

function EditorShell({ draft, onDiscard }: { draft: DraftInfo; onDiscard: () => void }) {
  const actions = useActions();
  const { canUndo, canRedo } = useHistory();
  const tapRef = useRef<TapHandle | null>(null);
  const menuRef = useRef<(() => void) | null>(null);
  const rootRef = useRef<HTMLDivElement>(null);
  const services = useServices();

  // Shortcuts work with focus anywhere in the editor, or nowhere in particular (on the page body).
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      const inside = rootRef.current?.contains(e.target as Node);
      if (!inside && e.target !== document.body) return;
      const handled = handleEditorKey(e, {
        store: services.store,
        togglePlay: () => void services.transport.toggle(),
        tap: () => tapRef.current?.tap(),
        openMenu: () => menuRef.current?.(),
      });
      if (handled) e.preventDefault();
    };
    document.addEventListener("keydown", onKey);
    return () => document.removeEventListener("keydown", onKey);
  }, [services]);

  return (
    <div ref={rootRef} className="tx-editor" data-editor="">
      <div className="tx-topbar">
        <div className="tx-history" role="group" aria-label="History">
          <button type="button" className="tx-btn" disabled={!canUndo} onClick={() => actions.undo()} aria-keyshortcuts="Control+Z Meta+Z">
            Undo
          </button>
          <button type="button" className="tx-btn" disabled={!canRedo} onClick={() => actions.redo()} aria-keyshortcuts="Control+Shift+Z Meta+Shift+Z">
            Redo
          </button>
          <button type="button" className="tx-btn is-quiet" onClick={() => actions.setSheetOpen(true)} aria-keyshortcuts="Shift+?">
            Shortcuts <kbd>?</kbd>
          </button>
        </div>
        <SaveControls />
      </div>
      <DraftBanner info={draft} onDiscard={onDiscard} />
      <div className="tx-playrow">
        <Transport />
        <TapTempo handleRef={tapRef} />
      </div>
      <NoticeBar />
      <GridArea menuRef={menuRef} />
      <BarTools />
      <EditorNotation />
      <div className="tx-panels">
        <MeterTempoPanel />
        <SectionsPanel />
        <RenotatePanel />
      </div>
      <ShortcutSheet />
    </div>
  );
}
