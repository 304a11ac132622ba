/**
 * Song form: name the sections of the groove, choose where each starts, how many times it plays, and
 * split, join, add or remove them. Every change is one undo step through the store; the core keeps the
 * sections following each other and covering every bar, and refuses (in the notice bar) what would not.
 */
import { useId, useState } from "react";
import { useShallow } from "zustand/react/shallow";
import { barLength, q, type GrooveDocument } from "../../lib/rhythm";
import { playedBars, SECTION_NAME_MAX, SECTION_REPEATS_MAX } from "../../lib/rhythm/sections";
import { cursorBar } from "../../stores/editor-store";
import { CommitInput, wholeNumber } from "./CommitInput";
import { useActions, useEditor } from "./context";
import { barsText } from "./SectionStrip";
import "./sections.css";

/**
 * Playing time of the whole form in seconds: bars heard × bar length in beats ÷ tempo.
 * @example formSeconds(doc) // 8 bars of 4/4 at 120 bpm → 16
 */
export function formSeconds(doc: Pick<GrooveDocument, "bars" | "sections" | "meter" | "tempo">): number {
  const beats = barLength(doc.meter).div(q(doc.tempo.beatNote)).mul(playedBars(doc));
  return beats.mul(60).div(q(doc.tempo.bpm)).valueOf();
}

/** "1:05" from seconds. */
export function clockText(seconds: number): string {
  const s = Math.round(seconds);
  return `${Math.floor(s / 60)}:${String(s % 60).padStart(2, "0")}`;
}

export function SectionsPanel() {
  const id = useId();
  const actions = useActions();
  const sections = useEditor(useShallow((s) => s.doc.sections));
  const bars = useEditor((s) => s.doc.bars);
  const heard = useEditor((s) => playedBars(s.doc));
  const seconds = useEditor((s) => formSeconds(s.doc));
  const bar = useEditor((s) => cursorBar(s));
  const selection = useEditor((s) => s.selection);
  const [newName, setNewName] = useState("");
  const [newBars, setNewBars] = useState("4");

  // Where "Split" starts the new section: the selection's first bar, or the cursor's bar.
  const splitAt = selection?.start ?? bar;
  const splitOk = splitAt > 0 && !sections.some((s) => s.startBar === splitAt);

  const addSection = (e: React.FormEvent) => {
    e.preventDefault();
    const n = wholeNumber(newBars);
    if (n === null || n < 1) return actions.notify({ tone: "error", title: "Section not added", lines: ["Bars: a whole number, at least 1."], undoable: false });
    actions.addSection({ bars: n, ...(newName.trim() ? { name: newName } : {}) });
    setNewName("");
  };

  return (
    <section className="tx-panel tx-songform" aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`} className="tx-panel-title">
        Song form
      </h2>
      {sections.length === 0 ? (
        <p className="tx-section-summary">
          No sections yet: the {bars === 1 ? "bar plays" : `${bars} bars play`} once, as one loop. Name sections to write a whole form (intro, verse,
          build) with repeats.
        </p>
      ) : (
        <p className="tx-section-summary" aria-live="polite">
          {sections.length} {sections.length === 1 ? "section" : "sections"}, {bars} written {bars === 1 ? "bar" : "bars"}; plays{" "}
          <strong className="num">{heard}</strong> {heard === 1 ? "bar" : "bars"} in all (<span className="num">{clockText(seconds)}</span>).
        </p>
      )}

      {sections.length > 0 && (
        <ol className="tx-sections" aria-label="Sections">
          {sections.map((s, i) => (
            <li key={`${i}:${s.startBar}`} className="tx-section" data-section={i}>
              <label className="tx-field is-name">
                <span>Name</span>
                <CommitInput value={s.name} maxLength={SECTION_NAME_MAX} onCommit={(t) => actions.renameSection(i, t)} aria-label={`Name of section ${i + 1}`} />
              </label>
              <label className="tx-field is-tiny">
                <span>Starts at bar</span>
                <CommitInput
                  className="num"
                  inputMode="numeric"
                  value={String(s.startBar + 1)}
                  disabled={i === 0}
                  aria-label={`Section ${s.name} starts at bar`}
                  onCommit={(t) => {
                    const n = wholeNumber(t);
                    if (n !== null) actions.moveSectionStart(i, n - 1);
                  }}
                />
              </label>
              <span className="tx-section-bars num">{barsText(s.startBar, s.bars)}</span>
              <div className="tx-field">
                <span id={`${id}-rep-${i}`}>Plays</span>
                <span className="tx-stepper" role="group" aria-labelledby={`${id}-rep-${i}`}>
                  <button
                    type="button"
                    className="tx-btn is-small"
                    disabled={s.repeats <= 1}
                    aria-label={`Play ${s.name} once less`}
                    onClick={() => actions.setSectionRepeats(i, s.repeats - 1)}
                  >
                    −
                  </button>
                  <CommitInput
                    className="num tx-repeats"
                    inputMode="numeric"
                    size={3}
                    value={String(s.repeats)}
                    aria-label={`Times section ${s.name} plays`}
                    onCommit={(t) => {
                      const n = wholeNumber(t);
                      actions.setSectionRepeats(i, n ?? Number.NaN);
                    }}
                  />
                  <button
                    type="button"
                    className="tx-btn is-small"
                    disabled={s.repeats >= SECTION_REPEATS_MAX}
                    aria-label={`Play ${s.name} once more`}
                    onClick={() => actions.setSectionRepeats(i, s.repeats + 1)}
                  >
                    +
                  </button>
                  <span aria-hidden="true">×</span>
                </span>
              </div>
              <button
                type="button"
                className="tx-btn is-small"
                disabled={i === sections.length - 1}
                onClick={() => actions.mergeSectionWithNext(i)}
                aria-label={`Join ${s.name} with the next section`}
              >
                Join with next
              </button>
              <button
                type="button"
                className="tx-btn is-small is-quiet"
                onClick={() => actions.removeSection(i)}
                aria-label={`Remove section ${s.name} (its bars stay, joining ${i === 0 ? "the next" : "the previous"} section)`}
              >
                Remove
              </button>
            </li>
          ))}
        </ol>
      )}

      <div className="tx-fields">
        {sections.length === 0 && (
          <button type="button" className="tx-btn" onClick={() => actions.startSongForm()}>
            Make the groove one section
          </button>
        )}
        <button type="button" className="tx-btn" disabled={!splitOk} onClick={() => actions.splitSection(splitAt)}>
          New section from bar {splitAt + 1}
        </button>
      </div>
      <form className="tx-fields" onSubmit={addSection} aria-label="Add a section at the end">
        <label className="tx-field is-name">
          <span>New section name</span>
          <input value={newName} maxLength={SECTION_NAME_MAX} placeholder="e.g. Build" onChange={(e) => setNewName(e.target.value)} />
        </label>
        <label className="tx-field is-tiny">
          <span>Bars</span>
          <input className="num" inputMode="numeric" value={newBars} onChange={(e) => setNewBars(e.target.value)} />
        </label>
        <button type="submit" className="tx-btn">
          Add section at end
        </button>
      </form>
    </section>
  );
}
