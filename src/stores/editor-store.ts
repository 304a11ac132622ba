/**
 * The editor store: one zustand vanilla store per editor instance. The groove document IS the state; every
 * edit calls a pure function from the core (`src/lib/rhythm/editing.ts`) and replaces `doc`. Undo and redo
 * come from zundo's `temporal`, which tracks the document only (cursor, selection, playhead and notices are
 * not history). A drag (painting a run, stretching a note) is recorded as one history entry.
 */
import { createStore, type StoreApi } from "zustand/vanilla";
import { temporal, type TemporalState } from "zundo";
import {
  KIT_PIECES,
  RhythmError,
  type Articulation,
  type GrooveDocument,
  type KitPieceId,
  type Meter,
  type Swing,
} from "../lib/rhythm";
import {
  addKeyNote,
  addLane,
  atOfStep,
  changeGrid,
  changeMeter,
  changeSwing,
  changeTempo,
  copyBars,
  cycleDynamic,
  deleteBar,
  describeDropped,
  duplicateBar,
  hitAt,
  insertBar,
  keyNoteAt,
  paintRun,
  pasteBars,
  removeKeyNote,
  removeLane,
  resizeKeyNote,
  setArticulation,
  setDynamic,
  setKeyNoteVelocity,
  stepCount,
  toggleHit,
  PASTED_OVER,
  type BarClip,
  type DroppedItem,
  type EditResult,
} from "../lib/rhythm/editing";
import type { Dynamic, RationalInput } from "../lib/rhythm";
import { q, fmt } from "../lib/rhythm";
import {
  addSection,
  formSections,
  mergeWithNext,
  moveSectionStart,
  removeSection,
  renameSection,
  setRepeats,
  splitSectionAt,
} from "../lib/rhythm/sections";
import { DEFAULT_KEYS_RANGE, keysRows, pitchName } from "./selectors";

export type Cursor = { area: "kit"; row: number; col: number } | { area: "keys"; pitch: number; col: number };

/** A range of bars, 0-based start. */
export interface BarRange {
  start: number;
  count: number;
}

export interface Notice {
  id: number;
  /** "loss": something was not kept (with undo); "info": plain news; "error": an edit was refused. */
  tone: "loss" | "info" | "error";
  title: string;
  lines: string[];
  /** Offer Undo: the notice describes the last history step. */
  undoable: boolean;
}

export interface PlayPosition {
  /** 0-based bar and beat being played. */
  bar: number;
  beat: number;
}

export interface TransportSettings {
  loop: boolean;
  metronome: boolean;
  countInBars: 0 | 1 | 2;
  /** Output level in dB (0 = full scale before the limiter); a moderate default. */
  volumeDb: number;
}

export interface EditorInit {
  doc: GrooveDocument;
  /** Saved groove id, or null for a scratch groove kept in this browser. */
  grooveId: string | null;
  /** Version the document was loaded from (for saving on top of it). */
  baseVersionId: string | null;
  title?: string;
}

export interface EditorActions {
  // kit
  toggleHit(piece: KitPieceId, col: number): void;
  cycleDynamic(piece: KitPieceId, col: number): void;
  setDynamic(piece: KitPieceId, col: number, dynamic: Dynamic): void;
  setArticulation(piece: KitPieceId, col: number, articulation: Articulation | null): void;
  addLane(piece: KitPieceId): void;
  removeLane(piece: KitPieceId): void;
  /** Start painting from a cell: fills when the cell is empty, erases when it holds a hit. */
  beginPaint(piece: KitPieceId, col: number): void;
  paintTo(col: number): void;
  // keys
  /** Press on a keys cell: starts a new note there, or grabs the note held there to stretch it. */
  beginNote(pitch: number, col: number): void;
  /** Stretch the grabbed note to end after `col`. */
  noteTo(col: number): void;
  toggleNote(pitch: number, col: number): void;
  resizeNoteBy(pitch: number, col: number, steps: number): void;
  /** Set the velocity (1–127) of the note sounding at this cell. */
  setNoteVelocity(pitch: number, col: number, velocity: number): void;
  /** Finish a drag (paint or stretch): one history entry. A press on a note without moving removes it. */
  endGesture(): void;
  // bars
  insertBars(index: number, count?: number): void;
  deleteBars(range?: BarRange): void;
  duplicateBars(range?: BarRange): void;
  copyBars(range?: BarRange): void;
  pasteBars(atBar?: number): void;
  selectBar(bar: number, extend?: boolean): void;
  clearSelection(): void;
  // song form (sections); each is one undo step
  /** Make the whole groove one section, the start of a song form. */
  startSongForm(name?: string): void;
  addSection(opts?: { name?: string; bars?: number; repeats?: number }): void;
  /** A new section starts at this bar (0-based). */
  splitSection(bar: number, name?: string): void;
  renameSection(index: number, name: string): void;
  setSectionRepeats(index: number, repeats: number): void;
  moveSectionStart(index: number, bar: number): void;
  mergeSectionWithNext(index: number): void;
  /** Remove a section's name and repeats; its bars join a neighbour. */
  removeSection(index: number): void;
  // settings
  changeMeter(meter: Meter): void;
  changeGrid(step: string): void;
  changeTempo(tempo: { bpm?: RationalInput; beatNote?: RationalInput }): void;
  changeSwing(swing: Partial<Swing>): void;
  /** Replace the whole document as one undoable step (renotation, reading suggestions). */
  applyDocument(doc: GrooveDocument, message: string): void;
  /** Load a document without history (a restored draft, a freshly saved version). */
  loadDocument(doc: GrooveDocument, opts?: { baseVersionId?: string | null; grooveId?: string | null; saved?: boolean }): void;
  markSaved(grooveId: string, versionId: string): void;
  // history
  undo(): void;
  redo(): void;
  // cursor and ui
  moveCursor(dRow: number, dCol: number): void;
  setCursor(cursor: Cursor): void;
  cursorToBarEdge(which: "prev" | "next" | "home" | "end"): void;
  toggleAtCursor(): void;
  cycleAtCursor(): void;
  clearAtCursor(): void;
  setKeysRange(range: { low: number; high: number }): void;
  setKeysOpen(open: boolean): void;
  notify(n: Omit<Notice, "id">): void;
  dismissNotice(): void;
  setSheetOpen(open: boolean): void;
  setPlaying(playing: boolean): void;
  setPlayhead(pos: PlayPosition | null): void;
  setTransport(patch: Partial<TransportSettings>): void;
}

export interface EditorState {
  doc: GrooveDocument;
  grooveId: string | null;
  baseVersionId: string | null;
  title: string;
  /** The document as last saved or loaded from the server (by identity), to tell unsaved changes. */
  savedDoc: GrooveDocument | null;
  cursor: Cursor;
  selection: BarRange | null;
  clipboard: BarClip | null;
  keysRange: { low: number; high: number };
  /** Whether the keys lane is shown (the cursor does not go into a hidden lane). */
  keysOpen: boolean;
  notice: Notice | null;
  sheetOpen: boolean;
  playing: boolean;
  playhead: PlayPosition | null;
  transport: TransportSettings;
  actions: EditorActions;
}

type HistoryState = Pick<EditorState, "doc">;
export type EditorStore = StoreApi<EditorState> & { temporal: StoreApi<TemporalState<HistoryState>> };

/** Undo depth: generous, since a document is shared structurally between steps. */
export const HISTORY_LIMIT = 500;

type Gesture =
  | { kind: "paint"; pre: GrooveDocument; piece: KitPieceId; from: string; to: string; mode: "on" | "off" }
  | { kind: "note"; pre: GrooveDocument; base: GrooveDocument; pitch: number; start: string; startCol: number; created: boolean; moved: boolean };

/**
 * Make an editor store.
 * @example const store = createEditorStore({ doc: emptyGroove(), grooveId: null, baseVersionId: null });
 */
export function createEditorStore(init: EditorInit): EditorStore {
  let gesture: Gesture | null = null;
  let noticeId = 0;

  const store = createStore<EditorState>()(
    temporal(
      (set, get) => {
        const doc = () => get().doc;
        const notice = (n: Omit<Notice, "id">): Notice => ({ ...n, id: ++noticeId });

        /** Run an edit; a refused edit becomes an error notice and leaves the document as it was. */
        const edit = (fn: (d: GrooveDocument) => GrooveDocument, extra?: Partial<EditorState>) => {
          try {
            const next = fn(doc());
            if (next !== doc()) set({ doc: next, ...extra });
            else if (extra) set(extra);
          } catch (e) {
            if (!(e instanceof RhythmError)) throw e;
            set({ notice: notice({ tone: "error", title: "That edit was not made", lines: [e.message], undoable: false }) });
          }
        };

        /**
         * Run an edit that may lose material and report it. Items the user removed on purpose (`intended`,
         * such as the contents of a deleted bar) are counted; items that did not fit are listed one by one.
         */
        const editReporting = (
          fn: (d: GrooveDocument) => EditResult,
          what: string,
          extra?: Partial<EditorState>,
          intended: (d: DroppedItem) => boolean = () => false,
        ) => {
          try {
            const r = fn(doc());
            const misfits = r.dropped.filter((d) => !intended(d));
            const removed = r.dropped.length - misfits.length;
            const lines = [
              ...misfits.map((d) => describeDropped(d, pitchName)),
              ...r.adjusted.map((a) => `Keys ${pitchName(a.pitch)} shortened from ${a.from} to ${a.to}: ${a.reason}`),
            ];
            const parts: string[] = [];
            if (removed > 0) parts.push(`${removed} ${removed === 1 ? "item" : "items"} removed`);
            if (misfits.length > 0)
              parts.push(`${misfits.length} ${misfits.length === 1 ? "item" : "items"} did not fit and ${misfits.length === 1 ? "was" : "were"} taken out`);
            if (r.adjusted.length > 0) parts.push(`${r.adjusted.length} ${r.adjusted.length === 1 ? "note" : "notes"} shortened`);
            const n =
              parts.length === 0
                ? null
                : notice({ tone: misfits.length > 0 ? "loss" : "info", title: `${what}: ${parts.join(", ")}`, lines, undoable: true });
            set({ doc: r.doc, notice: n, ...extra });
          } catch (e) {
            if (!(e instanceof RhythmError)) throw e;
            set({ notice: notice({ tone: "error", title: `${what}: not changed`, lines: [e.message], undoable: false }) });
          }
        };

        const at = (col: number) => atOfStep(doc(), col);
        const history = () => (store as unknown as EditorStore).temporal;

        /** The bars an action applies to: the given range, the selection, or the cursor's bar. */
        const rangeOr = (range?: BarRange): BarRange => {
          if (range) return range;
          const s = get().selection;
          if (s) return s;
          return { start: cursorBar(get()), count: 1 };
        };

        const actions: EditorActions = {
          toggleHit: (piece, col) => edit((d) => toggleHit(d, piece, at(col))),
          cycleDynamic: (piece, col) => edit((d) => cycleDynamic(d, piece, at(col))),
          setDynamic: (piece, col, dynamic) => edit((d) => setDynamic(d, piece, at(col), dynamic)),
          setArticulation: (piece, col, art) => edit((d) => setArticulation(d, piece, at(col), art)),
          addLane: (piece) => edit((d) => addLane(d, piece)),
          removeLane: (piece) => editReporting((d) => removeLane(d, piece), `${KIT_PIECES[piece].name} row removed`, undefined, () => true),

          beginPaint(piece, col) {
            if (gesture) actions.endGesture();
            const pre = doc();
            const from = at(col);
            const mode = hitAt(pre, piece, from) ? "off" : "on";
            history().getState().pause();
            gesture = { kind: "paint", pre, piece, from, to: from, mode };
            edit((d) => paintRun(d, piece, from, from, mode));
          },
          paintTo(col) {
            const g = gesture;
            if (g?.kind !== "paint") return;
            const to = at(Math.max(0, Math.min(col, stepCount(g.pre) - 1)));
            // The pointer passing over the hit just drawn (or back and forth in one cell) changes nothing:
            // keep the document object, so the notation is not spelled and drawn again.
            if (to === g.to) return;
            g.to = to;
            set({ doc: paintRun(g.pre, g.piece, g.from, to, g.mode) });
          },

          beginNote(pitch, col) {
            if (gesture) actions.endGesture();
            const pre = doc();
            const pos = at(col);
            const held = keyNoteAt(pre, pitch, pos);
            history().getState().pause();
            if (held) {
              gesture = { kind: "note", pre, base: pre, pitch, start: held.at, startCol: col, created: false, moved: false };
            } else {
              try {
                const base = addKeyNote(pre, { at: pos, pitch });
                gesture = { kind: "note", pre, base, pitch, start: pos, startCol: col, created: true, moved: false };
                set({ doc: base });
              } catch (e) {
                history().getState().resume();
                if (!(e instanceof RhythmError)) throw e;
                set({ notice: notice({ tone: "error", title: "That note was not added", lines: [e.message], undoable: false }) });
              }
            }
          },
          noteTo(col) {
            const g = gesture;
            if (g?.kind !== "note") return;
            if (col !== g.startCol) g.moved = true;
            if (!g.moved) return;
            const step = q(g.base.grid.step);
            const end = q(atOfStep(g.base, col)).add(step);
            const length = end.sub(q(g.start));
            // Dragging left of the start keeps one step.
            const duration = length.compare(step) < 0 ? step : length;
            set({ doc: resizeKeyNote(g.base, g.start, g.pitch, fmt(duration)) });
          },
          toggleNote(pitch, col) {
            const held = keyNoteAt(doc(), pitch, at(col));
            if (held) edit((d) => removeKeyNote(d, held.at, pitch));
            else edit((d) => addKeyNote(d, { at: at(col), pitch }));
          },
          resizeNoteBy(pitch, col, steps) {
            const held = keyNoteAt(doc(), pitch, at(col));
            if (!held) return;
            const step = q(doc().grid.step);
            const next = q(held.duration).add(step.mul(steps));
            if (next.compare(step) < 0) return;
            edit((d) => resizeKeyNote(d, held.at, pitch, fmt(next)));
          },
          setNoteVelocity(pitch, col, velocity) {
            const held = keyNoteAt(doc(), pitch, at(col));
            if (held) edit((d) => setKeyNoteVelocity(d, held.at, pitch, velocity));
          },

          endGesture() {
            const g = gesture;
            if (!g) return;
            gesture = null;
            if (g.kind === "note" && !g.created && !g.moved) set({ doc: removeKeyNote(g.pre, g.start, g.pitch) });
            const t = history();
            t.getState().resume();
            if (get().doc !== g.pre) {
              const past = t.getState().pastStates.slice(-(HISTORY_LIMIT - 1));
              t.setState({ pastStates: [...past, { doc: g.pre }], futureStates: [] });
            }
          },

          insertBars(index, count = 1) {
            edit((d) => insertBar(d, index, count));
          },
          deleteBars(range) {
            const r = rangeOr(range);
            if (doc().bars - r.count < 1) {
              set({ notice: notice({ tone: "error", title: "Bars not deleted", lines: ["A groove keeps at least one bar."], undoable: false }) });
              return;
            }
            editReporting(
              (d) => deleteBar(d, r.start, r.count),
              r.count === 1 ? `Bar ${r.start + 1} deleted` : `Bars ${r.start + 1}–${r.start + r.count} deleted`,
              { selection: null },
              () => true,
            );
          },
          duplicateBars(range) {
            const r = rangeOr(range);
            edit((d) => duplicateBar(d, r.start, r.count), { selection: { start: r.start + r.count, count: r.count } });
          },
          copyBars(range) {
            const r = rangeOr(range);
            try {
              const clip = copyBars(doc(), r.start, r.count);
              const label = r.count === 1 ? `bar ${r.start + 1}` : `bars ${r.start + 1}–${r.start + r.count}`;
              set({ clipboard: clip, notice: notice({ tone: "info", title: `Copied ${label}`, lines: [], undoable: false }) });
            } catch (e) {
              if (!(e instanceof RhythmError)) throw e;
              set({ notice: notice({ tone: "error", title: "Nothing copied", lines: [e.message], undoable: false }) });
            }
          },
          pasteBars(atBar) {
            const clip = get().clipboard;
            if (!clip) {
              set({ notice: notice({ tone: "info", title: "Nothing to paste yet: copy a bar or a range of bars first", lines: [], undoable: false }) });
              return;
            }
            const target = atBar ?? get().selection?.start ?? cursorBar(get());
            editReporting(
              (d) => pasteBars(d, clip, target),
              `Pasted ${clip.bars === 1 ? "1 bar" : `${clip.bars} bars`} at bar ${target + 1}`,
              { selection: { start: target, count: clip.bars } },
              (d) => d.reason === PASTED_OVER,
            );
          },
          selectBar(bar, extend = false) {
            const s = get().selection;
            if (extend && s) {
              const start = Math.min(s.start, bar);
              const end = Math.max(s.start + s.count - 1, bar);
              set({ selection: { start, count: end - start + 1 } });
            } else if (s && s.start === bar && s.count === 1 && !extend) set({ selection: null });
            else set({ selection: { start: bar, count: 1 } });
          },
          clearSelection: () => set({ selection: null }),

          startSongForm: (name) => edit((d) => formSections(d, name)),
          addSection: (opts) => edit((d) => addSection(d, opts)),
          splitSection: (bar, name) => edit((d) => splitSectionAt(d, bar, name)),
          renameSection: (index, name) => edit((d) => renameSection(d, index, name)),
          setSectionRepeats: (index, repeats) => edit((d) => setRepeats(d, index, repeats)),
          moveSectionStart: (index, bar) => edit((d) => moveSectionStart(d, index, bar)),
          mergeSectionWithNext: (index) => edit((d) => mergeWithNext(d, index)),
          removeSection: (index) => edit((d) => removeSection(d, index)),

          changeMeter: (meter) => editReporting((d) => changeMeter(d, meter), `Meter changed to ${meter.beatsPerBar}/${meter.beatUnit}`),
          changeGrid: (step) => editReporting((d) => changeGrid(d, step), `Grid changed to ${step}`),
          changeTempo: (tempo) => editReporting((d) => changeTempo(d, tempo), "Tempo changed"),
          changeSwing: (swing) => editReporting((d) => changeSwing(d, swing), "Swing changed"),
          applyDocument(next, message) {
            set({ doc: next, notice: notice({ tone: "info", title: message, lines: [], undoable: true }) });
          },
          loadDocument(next, opts = {}) {
            const t = history();
            t.getState().pause();
            set({
              doc: next,
              ...(opts.baseVersionId !== undefined ? { baseVersionId: opts.baseVersionId } : {}),
              ...(opts.grooveId !== undefined ? { grooveId: opts.grooveId } : {}),
              ...(opts.saved ? { savedDoc: next } : {}),
            });
            t.getState().resume();
            t.getState().clear();
          },
          markSaved(grooveId, versionId) {
            set({ grooveId, baseVersionId: versionId, savedDoc: get().doc });
          },

          undo() {
            if (gesture) actions.endGesture();
            history().getState().undo();
          },
          redo() {
            if (gesture) actions.endGesture();
            history().getState().redo();
          },

          moveCursor(dRow, dCol) {
            const s = get();
            const cols = stepCount(s.doc);
            const rows = keysRows(s.doc, s.keysRange);
            const lanes = s.doc.kit.lanes.length;
            const c = s.cursor;
            const col = Math.max(0, Math.min(cols - 1, c.col + dCol));
            if (c.area === "kit") {
              const row = c.row + dRow;
              if (row >= lanes && rows.length > 0 && s.keysOpen) set({ cursor: { area: "keys", pitch: rows[0]!, col } });
              else set({ cursor: { area: "kit", row: Math.max(0, Math.min(lanes - 1, row)), col } });
            } else {
              const i = rows.indexOf(c.pitch) + dRow;
              if (i < 0 && lanes > 0) set({ cursor: { area: "kit", row: lanes - 1, col } });
              else set({ cursor: { area: "keys", pitch: rows[Math.max(0, Math.min(rows.length - 1, i))]!, col } });
            }
          },
          setCursor(cursor) {
            const c = get().cursor;
            const same = c.area === cursor.area && c.col === cursor.col && (c.area === "kit" ? c.row === (cursor as typeof c).row : c.pitch === (cursor as typeof c).pitch);
            if (!same) set({ cursor });
          },
          cursorToBarEdge(which) {
            const s = get();
            const cols = stepCount(s.doc);
            const perBar = cols / s.doc.bars;
            const bar = Math.floor(s.cursor.col / perBar);
            let col = s.cursor.col;
            if (which === "home") col = 0;
            else if (which === "end") col = cols - 1;
            else if (which === "prev") col = (s.cursor.col % perBar === 0 ? Math.max(0, bar - 1) : bar) * perBar;
            else col = Math.min(cols - 1, (bar + 1) * perBar);
            set({ cursor: { ...s.cursor, col } });
          },
          toggleAtCursor() {
            const c = get().cursor;
            if (c.area === "keys") return actions.toggleNote(c.pitch, c.col);
            const lane = doc().kit.lanes[c.row];
            if (lane) actions.toggleHit(lane.piece, c.col);
          },
          cycleAtCursor() {
            const c = get().cursor;
            const lane = c.area === "kit" ? doc().kit.lanes[c.row] : undefined;
            if (lane) actions.cycleDynamic(lane.piece, c.col);
          },
          clearAtCursor() {
            const c = get().cursor;
            if (c.area === "keys") {
              const held = keyNoteAt(doc(), c.pitch, at(c.col));
              if (held) edit((d) => removeKeyNote(d, held.at, c.pitch));
              return;
            }
            const lane = doc().kit.lanes[c.row];
            if (lane && hitAt(doc(), lane.piece, at(c.col))) actions.toggleHit(lane.piece, c.col);
          },
          setKeysRange: (keysRange) => set({ keysRange }),
          setKeysOpen(keysOpen) {
            const c = get().cursor;
            set(!keysOpen && c.area === "keys" ? { keysOpen, cursor: { area: "kit", row: Math.max(0, get().doc.kit.lanes.length - 1), col: c.col } } : { keysOpen });
          },
          notify: (n) => set({ notice: notice(n) }),
          dismissNotice: () => set({ notice: null }),
          setSheetOpen: (sheetOpen) => set({ sheetOpen }),
          setPlaying: (playing) => set(playing ? { playing } : { playing, playhead: null }),
          setPlayhead: (playhead) => set({ playhead }),
          setTransport: (patch) => set({ transport: { ...get().transport, ...patch } }),
        };

        return {
          doc: init.doc,
          grooveId: init.grooveId,
          baseVersionId: init.baseVersionId,
          title: init.title ?? "",
          savedDoc: init.grooveId ? init.doc : null,
          cursor: { area: "kit", row: 0, col: 0 },
          selection: null,
          clipboard: null,
          keysRange: { ...DEFAULT_KEYS_RANGE },
          keysOpen: true,
          notice: null,
          sheetOpen: false,
          playing: false,
          playhead: null,
          transport: { loop: true, metronome: false, countInBars: 0, volumeDb: -12 },
          actions,
        };
      },
      {
        partialize: (s): HistoryState => ({ doc: s.doc }),
        // Only document changes make history; cursor moves and notices do not.
        equality: (a, b) => a.doc === b.doc,
        limit: HISTORY_LIMIT,
      },
    ),
  ) as EditorStore;

  // Keep the cursor and selection inside the groove whenever the document changes (edits, undo, redo).
  store.subscribe((s, prev) => {
    if (s.doc === prev.doc) return;
    const cols = stepCount(s.doc);
    const c = s.cursor;
    let cursor: Cursor = c;
    if (c.col >= cols) cursor = { ...c, col: cols - 1 };
    if (cursor.area === "kit" && cursor.row >= s.doc.kit.lanes.length)
      cursor = { ...cursor, row: Math.max(0, s.doc.kit.lanes.length - 1) };
    let selection = s.selection;
    if (selection && selection.start + selection.count > s.doc.bars) {
      const start = Math.min(selection.start, s.doc.bars - 1);
      selection = { start, count: Math.min(selection.count, s.doc.bars - start) };
    }
    if (cursor !== c || selection !== s.selection) store.setState({ cursor, selection });
  });

  return store;
}

/** 0-based bar of the cursor. */
export function cursorBar(s: Pick<EditorState, "doc" | "cursor">): number {
  return Math.floor(s.cursor.col / (stepCount(s.doc) / s.doc.bars));
}

/** True when the document differs from the last saved one (always true for a scratch groove with content). */
export function hasUnsavedChanges(s: Pick<EditorState, "doc" | "savedDoc">): boolean {
  return s.doc !== s.savedDoc;
}
