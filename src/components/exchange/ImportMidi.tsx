/**
 * MIDI import: a button that opens a dialog where a .mid file becomes a new groove. The file goes to
 * POST /api/import/midi, which answers with a preview and a report (what was moved to the grid and by how much,
 * triplet beats, percussion keys the kit has no piece for, tempo or meter the file does not give); the dialog
 * asks for what is missing, lets each unknown key become a kit piece, then creates the groove and opens it.
 */
import { useEffect, useId, useRef, useState } from "react";
import { api, ApiClientError } from "../../lib/client/api";
import type { ImportGrid, MidiImportResult } from "../../lib/exchange/midi-import";
import { KIT_PIECES, KIT_ROW_ORDER, type KitPieceId } from "../../lib/rhythm/kit";
import { buttonClass, FormMessage, inputClass, quietButtonClass } from "../account/fields";

const GRIDS: { value: ImportGrid; label: string }[] = [
  { value: "1/8", label: "Eighth notes" },
  { value: "1/16", label: "Sixteenth notes" },
  { value: "1/32", label: "Thirty-second notes" },
  { value: "1/12", label: "Eighth-note triplets" },
  { value: "1/24", label: "Sixteenth-note triplets" },
];
const STRAIGHT = new Set<ImportGrid>(["1/4", "1/8", "1/16", "1/32"]);

interface Options {
  grid: ImportGrid;
  triplets: boolean;
  bpm: string;
  meter: string;
  map: Record<number, KitPieceId | "none">;
}

async function preview(file: File, o: Options): Promise<MidiImportResult> {
  const q = new URLSearchParams({ grid: o.grid, triplets: o.triplets ? "1" : "0", name: file.name });
  if (o.bpm.trim()) q.set("bpm", o.bpm.trim());
  if (o.meter.trim()) q.set("meter", o.meter.trim());
  const map = Object.entries(o.map).map(([k, v]) => `${k}:${v}`);
  if (map.length) q.set("map", map.join(","));
  let res: Response;
  try {
    res = await fetch(`/api/import/midi?${q}`, { method: "POST", credentials: "same-origin", headers: { accept: "application/json", "content-type": "audio/midi" }, body: file });
  } catch {
    throw new ApiClientError(0, "network", "Could not reach Tactus: check the connection and try again.");
  }
  const data = await res.json().catch(() => null);
  if (!res.ok) {
    const e = data?.error;
    throw new ApiClientError(res.status, e?.code ?? "http_error", e?.message ?? `The server answered ${res.status}.`, e?.fields ?? {});
  }
  return data as MidiImportResult;
}

const ms = (x: number) => `${Math.abs(x).toLocaleString("en-GB", { maximumFractionDigits: 1 })} ms ${x < 0 ? "earlier" : "later"}`;
const pitchName = (p: number) => `${["C", "C♯", "D", "E♭", "E", "F", "F♯", "G", "A♭", "A", "B♭", "B"][p % 12]}${Math.floor(p / 12) - 1}`;

export default function ImportMidi() {
  const dialog = useRef<HTMLDialogElement>(null);
  const uid = useId();
  const [file, setFile] = useState<File | null>(null);
  const [options, setOptions] = useState<Options>({ grid: "1/16", triplets: true, bpm: "", meter: "", map: {} });
  const [result, setResult] = useState<MidiImportResult | null>(null);
  const [title, setTitle] = useState("");
  const [error, setError] = useState("");
  const [busy, setBusy] = useState(false);
  const [answers, setAnswers] = useState({ bpm: "", meter: "" });

  // Every change of file or options asks the server for a fresh preview.
  useEffect(() => {
    if (!file) return;
    let current = true;
    setBusy(true);
    setError("");
    preview(file, options)
      .then((r) => {
        if (!current) return;
        setResult(r);
        setTitle((t) => t || r.title || "Imported groove");
      })
      .catch((e: unknown) => {
        if (!current) return;
        setResult(null);
        setError(e instanceof ApiClientError ? e.message : "The file could not be read.");
      })
      .finally(() => current && setBusy(false));
    return () => {
      current = false;
    };
  }, [file, options]);

  const set = (patch: Partial<Options>) => setOptions((o) => ({ ...o, ...patch }));
  const open = () => dialog.current?.showModal();
  const close = () => {
    dialog.current?.close();
    setFile(null);
    setResult(null);
    setError("");
    setTitle("");
    setAnswers({ bpm: "", meter: "" });
    setOptions({ grid: "1/16", triplets: true, bpm: "", meter: "", map: {} });
  };
  const create = async () => {
    if (!result || !file) return;
    setBusy(true);
    setError("");
    try {
      const g = await api.createGroove({ title: title.trim() || "Imported groove", document: result.document, message: `Imported from ${file.name}` });
      location.assign(`/grooves/${g.id}/edit`);
    } catch (e) {
      setError(e instanceof ApiClientError ? e.message : "The groove could not be created.");
      setBusy(false);
    }
  };

  const r = result?.report;
  return (
    <>
      <button type="button" className="rounded-lg border border-line-strong px-4 py-2 font-medium text-ink hover:border-brass hover:text-brass" onClick={open}>
        Import MIDI
      </button>
      <dialog ref={dialog} aria-labelledby={`${uid}-title`} className="m-auto w-[min(44rem,calc(100vw-2rem))] rounded-xl border border-line bg-surface-raised p-0 text-ink backdrop:bg-black/40" onClose={close}>
        <div className="flex max-h-[85vh] flex-col gap-4 overflow-y-auto p-5">
          <header className="flex items-start justify-between gap-3">
            <div>
              <h2 id={`${uid}-title`} className="text-xl font-semibold">Import a MIDI file</h2>
              <p className="text-sm text-ink-soft">Drums on channel 10 become the kit, other channels the keys. Nothing is saved until you create the groove.</p>
            </div>
            <button type="button" className={quietButtonClass} onClick={close}>Close</button>
          </header>
          <p className="rounded-md border-l-4 border-brass bg-surface-sunken px-3 py-2 text-sm" data-testid="import-rights">
            Import only files you may use: your own playing or programming, or files whose licence lets you transcribe and share them.
          </p>

          <div className="grid gap-3 sm:grid-cols-3">
            <label className="flex flex-col gap-1 text-sm font-medium sm:col-span-3">
              MIDI file (.mid, smaller than 20 MB)
              <input type="file" accept=".mid,.midi,audio/midi,audio/x-midi" className="text-sm font-normal" onChange={(e) => { setResult(null); setTitle(""); setOptions((o) => ({ ...o, map: {} })); setFile(e.target.files?.[0] ?? null); }} />
            </label>
            <label className="flex flex-col gap-1 text-sm font-medium">
              Grid
              <select className={inputClass} value={options.grid} onChange={(e) => set({ grid: e.target.value as ImportGrid })}>
                {GRIDS.map((g) => <option key={g.value} value={g.value}>{g.label}</option>)}
              </select>
            </label>
            <label className="flex items-center gap-2 self-end pb-2 text-sm">
              <input type="checkbox" checked={options.triplets && STRAIGHT.has(options.grid)} disabled={!STRAIGHT.has(options.grid)} onChange={(e) => set({ triplets: e.target.checked })} />
              Find triplets beat by beat
            </label>
          </div>

          {busy && <p role="status" className="text-sm text-ink-soft">Reading the file…</p>}
          {error && <FormMessage>{error}</FormMessage>}

          {result && r && (
            <section className="flex flex-col gap-3" aria-label="What the import found" data-testid="import-report">
              {(result.missing.tempo || result.missing.meter) && (
                <div className="rounded-md border border-brass p-3 text-sm" role="group" aria-label="Missing from the file">
                  <p className="mb-2 font-medium">
                    The file does not say its {[result.missing.tempo && "tempo", result.missing.meter && "meter"].filter(Boolean).join(" or ")}: the preview uses {result.missing.tempo ? `${result.document.tempo.bpm} bpm` : ""}{result.missing.tempo && result.missing.meter ? " and " : ""}{result.missing.meter ? `${result.document.meter.beatsPerBar}/${result.document.meter.beatUnit}` : ""}. Enter what the music is:
                  </p>
                  <form
                    className="flex flex-wrap items-end gap-3"
                    onSubmit={(e) => {
                      e.preventDefault();
                      set({ bpm: answers.bpm, meter: answers.meter });
                    }}
                  >
                    {result.missing.tempo && (
                      <label className="flex flex-col gap-1">Tempo (bpm)
                        <input className={inputClass} inputMode="decimal" value={answers.bpm} placeholder="e.g. 96" onChange={(e) => setAnswers((a) => ({ ...a, bpm: e.target.value }))} />
                      </label>
                    )}
                    {result.missing.meter && (
                      <label className="flex flex-col gap-1">Meter
                        <input className={inputClass} value={answers.meter} placeholder="e.g. 4/4 or 6/8" onChange={(e) => setAnswers((a) => ({ ...a, meter: e.target.value }))} />
                      </label>
                    )}
                    <button type="submit" className={quietButtonClass}>Use {result.missing.tempo && result.missing.meter ? "these" : "it"}</button>
                  </form>
                </div>
              )}

              <dl className="grid grid-cols-2 gap-x-4 gap-y-1 text-sm sm:grid-cols-4">
                <div><dt className="text-ink-faint">Tempo</dt><dd>{Math.round(Number(eval_(result.document.tempo.bpm)) * 100) / 100} bpm</dd></div>
                <div><dt className="text-ink-faint">Meter</dt><dd>{result.document.meter.beatsPerBar}/{result.document.meter.beatUnit}</dd></div>
                <div><dt className="text-ink-faint">Bars</dt><dd>{result.document.bars}</dd></div>
                <div><dt className="text-ink-faint">Notes</dt><dd>{r.notes.written} of {r.notes.total}</dd></div>
              </dl>

              <div className="text-sm" data-testid="import-moves">
                <h3 className="font-semibold">Moved to the grid</h3>
                {r.moved.count === 0 ? (
                  <p className="text-ink-soft">Every note was already on the grid.</p>
                ) : (
                  <>
                    <p className="text-ink-soft">
                      {r.moved.count} note{r.moved.count === 1 ? "" : "s"} moved, by {r.moved.meanMs} ms on average and at most {r.moved.maxMs} ms.
                      {r.tripletBeats.length > 0 && ` ${r.tripletBeats.length} beat${r.tripletBeats.length === 1 ? " was" : "s were"} written as triplets.`}
                    </p>
                    <ul className="mt-1 max-h-32 overflow-y-auto text-ink-soft">
                      {r.moves.slice(0, 12).map((m, i) => (
                        <li key={i}>Bar {m.bar}: {m.piece ? KIT_PIECES[m.piece].name : pitchName(m.pitch ?? 0)} moved {ms(m.shiftMs)}</li>
                      ))}
                    </ul>
                  </>
                )}
                {r.merged > 0 && <p className="text-ink-soft">{r.merged} note{r.merged === 1 ? "" : "s"} landed on a note of the same sound and {r.merged === 1 ? "was" : "were"} merged into it.</p>}
                {r.flams > 0 && <p className="text-ink-soft">{r.flams} stroke{r.flams === 1 ? " was" : "s were"} read as a flam.</p>}
              </div>

              {r.substituted.length > 0 && (
                <p className="text-sm text-ink-soft">Read as the nearest kit piece: {r.substituted.map((s) => `${s.label} → ${KIT_PIECES[s.piece].name} (${s.count})`).join(", ")}.</p>
              )}

              {r.unknownPercussion.length > 0 && (
                <div className="text-sm" role="group" aria-label="Percussion the kit has no piece for" data-testid="import-unknown">
                  <h3 className="font-semibold">Percussion the kit has no piece for</h3>
                  <p className="text-ink-soft">Left out unless you choose a piece for them:</p>
                  <ul className="mt-1 flex flex-col gap-1">
                    {r.unknownPercussion.map((u) => (
                      <li key={u.note} className="flex flex-wrap items-center gap-2">
                        <span>{u.label}, {u.count} stroke{u.count === 1 ? "" : "s"} (first in bar {u.where[0]?.bar ?? 1})</span>
                        <select
                          aria-label={`Kit piece for ${u.label}`}
                          className="rounded-md border border-line-strong bg-surface-raised px-2 py-1"
                          value={options.map[u.note] ?? "none"}
                          onChange={(e) => set({ map: { ...options.map, [u.note]: e.target.value as KitPieceId | "none" } })}
                        >
                          <option value="none">Leave out</option>
                          {KIT_ROW_ORDER.map((p) => <option key={p} value={p}>{KIT_PIECES[p].name}</option>)}
                        </select>
                      </li>
                    ))}
                  </ul>
                </div>
              )}

              {r.warnings.filter((w) => !/has no piece in the kit/.test(w)).map((w) => <p key={w} className="text-sm text-ink-soft">{w}</p>)}

              <label className="flex flex-col gap-1 text-sm font-medium">
                Title of the new groove
                <input className={inputClass} value={title} maxLength={120} onChange={(e) => setTitle(e.target.value)} />
              </label>
              <div className="flex gap-2">
                <button type="button" className={buttonClass} disabled={busy || !title.trim()} onClick={create}>Create the groove and open it</button>
                <button type="button" className={quietButtonClass} onClick={close}>Cancel</button>
              </div>
            </section>
          )}
        </div>
      </dialog>
    </>
  );
}

/** A rational string's value ("151/2" → 75.5). */
function eval_(r: string): number {
  const [n, d = "1"] = r.split("/");
  return Number(n) / Number(d);
}
