/**
 * Renotation: write the same sound another way. Double time, half time, displacement and re-barring from
 * the core's transforms, plus the reading finder's ranked suggestions with their reasons. Every candidate
 * is previewed as notation with the core's proof (`compareGrooves`) before it is applied; applying is one
 * undoable step.
 */
import { useEffect, useId, useMemo, useRef, useState } from "react";
import {
  compareGrooves,
  displaceWithReport,
  doubleTime,
  halfTime,
  rebar,
  RhythmError,
  timeSignature,
  type DisplaceMode,
  type GrooveDocument,
  type Meter,
} from "../../lib/rhythm";
import { findReadings, rebarTwins, type Reading } from "../../lib/rhythm/readings";
import { proofText } from "./proof";
import { useActions, useEditor } from "./context";
import { NotationPreview } from "./NotationPreview";

interface Candidate {
  /** The document it was made from: a candidate is stale once the groove changes. */
  from: GrooveDocument;
  doc: GrooveDocument;
  label: string;
  reasons?: string[];
  note?: string;
}

const DISPLACE_VALUES = [
  { by: "1/16", name: "a sixteenth" },
  { by: "1/8", name: "an eighth" },
  { by: "1/4", name: "a quarter" },
] as const;

export function RenotatePanel() {
  const id = useId();
  const doc = useEditor((s) => s.doc);
  const actions = useActions();
  const loop = doc.sections.length <= 1;
  const [by, setBy] = useState<string>("1/8");
  const [direction, setDirection] = useState<"later" | "earlier">("later");
  const [mode, setMode] = useState<DisplaceMode | "auto">("auto");
  const [candidate, setCandidate] = useState<Candidate | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [readings, setReadings] = useState<{ from: GrooveDocument; list: Reading[] } | null>(null);
  const [searching, setSearching] = useState(false);

  const previewRef = useRef<HTMLDivElement>(null);
  useEffect(() => {
    if (candidate) previewRef.current?.scrollIntoView?.({ block: "nearest", behavior: "smooth" });
  }, [candidate]);

  const effectiveMode: DisplaceMode = mode === "auto" ? (loop ? "rotate" : "pad") : mode;
  const twins = useMemo(() => rebarTwins(doc.meter), [doc.meter]);

  const tryBuild = (label: string, build: () => Candidate | GrooveDocument) => {
    try {
      const r = build();
      const c = "from" in r ? r : { from: doc, doc: r, label };
      setCandidate({ ...c, label: c.label || label });
      setProblem(null);
    } catch (e) {
      if (!(e instanceof RhythmError)) throw e;
      setCandidate(null);
      setProblem(`${label}: ${e.message}`);
    }
  };

  const displaceNow = () => {
    const amount = direction === "later" ? by : `-${by}`;
    const name = DISPLACE_VALUES.find((v) => v.by === by)?.name ?? by;
    tryBuild(`Displaced ${direction} by ${name}`, () => {
      const r = displaceWithReport(doc, amount, effectiveMode);
      const lost = r.dropped.hits.length + r.dropped.notes.length;
      const notes: string[] = [];
      if (r.addedBars.before + r.addedBars.after > 0) notes.push(`${r.addedBars.before + r.addedBars.after} bar(s) added so nothing is lost`);
      if (lost > 0) notes.push(`${lost} item(s) moved outside the groove and were left out`);
      if (r.repeatsWrittenOut) notes.push("repeated sections were written out");
      return { from: doc, doc: r.doc, label: "", ...(notes.length ? { note: notes.join("; ") } : {}) };
    });
  };

  const findNow = () => {
    setSearching(true);
    // Let "Searching…" paint before the finder runs.
    setTimeout(() => {
      try {
        setReadings({ from: doc, list: findReadings(doc, { limit: 6 }) });
        setProblem(null);
      } catch (e) {
        setProblem(`Suggestions: ${e instanceof Error ? e.message : String(e)}`);
      } finally {
        setSearching(false);
      }
    }, 0);
  };

  const stale = candidate !== null && candidate.from !== doc;
  const proof = useMemo(() => (candidate && !stale ? proofText(compareGrooves(candidate.from, candidate.doc)) : null), [candidate, stale]);

  return (
    <section className="tx-panel tx-renotate" aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`} className="tx-panel-title">
        Renotate: same sound, another way to write it
      </h2>
      <div className="tx-fields">
        <button type="button" className="tx-btn" onClick={() => tryBuild("Double time", () => doubleTime(doc))}>
          Double time
        </button>
        <button type="button" className="tx-btn" onClick={() => tryBuild("Half time", () => halfTime(doc))}>
          Half time
        </button>
      </div>
      <fieldset className="tx-fields">
        <legend>Displace</legend>
        <label className="tx-field is-inline">
          <span>by</span>
          <select value={by} onChange={(e) => setBy(e.target.value)}>
            {DISPLACE_VALUES.map((v) => (
              <option key={v.by} value={v.by}>
                {v.name}
              </option>
            ))}
          </select>
        </label>
        <label className="tx-field is-inline">
          <span>direction</span>
          <select value={direction} onChange={(e) => setDirection(e.target.value as "later" | "earlier")}>
            <option value="later">later</option>
            <option value="earlier">earlier</option>
          </select>
        </label>
        <label className="tx-field is-inline">
          <span>ends</span>
          <select value={mode} onChange={(e) => setMode(e.target.value as DisplaceMode | "auto")}>
            <option value="auto">{loop ? "loop: wrap around" : "song form: add a pickup bar"}</option>
            <option value="rotate">loop: wrap around</option>
            <option value="pad">song form: add a pickup bar</option>
            <option value="trim">song form: trim what falls outside</option>
          </select>
        </label>
        <button type="button" className="tx-btn" onClick={displaceNow}>
          Preview displacement
        </button>
      </fieldset>
      {twins.length > 0 && (
        <div className="tx-fields">
          {twins.map((m: Meter) => (
            <button key={timeSignature(m)} type="button" className="tx-btn" onClick={() => tryBuild(`Re-barred in ${timeSignature(m)}`, () => rebar(doc, m))}>
              Re-bar in {timeSignature(m)}
            </button>
          ))}
        </div>
      )}
      <div className="tx-fields">
        <button type="button" className="tx-btn" onClick={findNow} disabled={searching}>
          {searching ? "Searching…" : "Suggest readings"}
        </button>
      </div>
      {readings && readings.from === doc && (
        <p className="tx-hint">Suggested readings, best first (a lower score reads better). Each one is proven to sound the same.</p>
      )}
      {readings && readings.from === doc && (
        <ol className="tx-readings" aria-label="Suggested readings, best first">
          {readings.list.map((r, i) => (
            <li key={r.id} className="tx-reading">
              <div className="tx-reading-head">
                <strong>
                  {i + 1}. {r.label}
                </strong>
                <span className="num tx-dim"> score {r.score.toFixed(2)}</span>
              </div>
              {r.reasons.length > 0 && (
                <ul className="tx-reasons">
                  {r.reasons.map((x) => (
                    <li key={x}>{x}</li>
                  ))}
                </ul>
              )}
              {r.id !== "asis" && (
                <button type="button" className="tx-btn is-small" onClick={() => setCandidate({ from: readings.from, doc: r.doc, label: r.label, reasons: r.reasons })}>
                  Preview
                </button>
              )}
            </li>
          ))}
        </ol>
      )}
      {problem && (
        <p className="tx-error" role="alert">
          {problem}
        </p>
      )}
      {candidate && (
        <div ref={previewRef} className="tx-preview" aria-label={`Preview: ${candidate.label}`}>
          <h3 className="tx-preview-title">Preview: {candidate.label}</h3>
          {candidate.note && <p className="tx-hint">{candidate.note}</p>}
          {stale ? (
            <p className="tx-hint">The groove changed since this preview: preview again.</p>
          ) : (
            proof && (
              <div className={`tx-proof${proof.same ? " is-same" : " is-diff"}`} role="status">
                <p>{proof.text}</p>
                {proof.details.length > 0 && (
                  <ul>
                    {proof.details.map((d) => (
                      <li key={d}>{d}</li>
                    ))}
                  </ul>
                )}
              </div>
            )
          )}
          <NotationPreview doc={candidate.doc} label={`Notation preview: ${candidate.label}`} />
          <div className="tx-fields">
            <button
              type="button"
              className="tx-btn is-primary"
              disabled={stale}
              onClick={() => {
                actions.applyDocument(candidate.doc, `${candidate.label}: applied (undo to go back)`);
                setCandidate(null);
                setReadings(null);
              }}
            >
              Apply
            </button>
            <button type="button" className="tx-btn is-quiet" onClick={() => setCandidate(null)}>
              Cancel
            </button>
          </div>
        </div>
      )}
    </section>
  );
}
