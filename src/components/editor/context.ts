/**
 * The editor's store reaches every component of one editor through React context (one store per editor
 * instance, never a module-level singleton, so two editors on a page stay independent).
 */
import { createContext, useContext } from "react";
import { useStore } from "zustand";
import type { EditorActions, EditorState, EditorStore } from "../../stores/editor-store";
import type { TransportController } from "./transport-port";

export interface EditorServices {
  store: EditorStore;
  transport: TransportController;
}

export const EditorContext = createContext<EditorServices | null>(null);

/** The store and transport of the surrounding editor. */
export function useServices(): EditorServices {
  const s = useContext(EditorContext);
  if (!s) throw new Error("editor components must be inside <EditorProvider>");
  return s;
}

/** Select one value from this editor's store (use `useShallow` when the selector builds an array or object). */
export function useEditor<T>(selector: (s: EditorState) => T): T {
  return useStore(useServices().store, selector);
}

export function useEditorStore(): EditorStore {
  return useServices().store;
}

/** The actions object (stable for the store's lifetime). */
export function useActions(): EditorActions {
  return useStore(useServices().store, (s) => s.actions);
}

export function useTransport(): TransportController {
  return useServices().transport;
}

/** Undo / redo availability, from zundo's history store. */
export function useHistory(): { canUndo: boolean; canRedo: boolean } {
  const { store } = useServices();
  const canUndo = useStore(store.temporal, (t) => t.pastStates.length > 0);
  const canRedo = useStore(store.temporal, (t) => t.futureStates.length > 0);
  return { canUndo, canRedo };
}
