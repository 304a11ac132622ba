/**
 * Meter, grid, tempo and swing. Changes that can lose hits (meter, grid) go through the core's edit
 * functions, which keep what fits and report the rest in the notice bar (with undo).
 */
import { useEffect, useId, useState } from "react";
import { q } from "../../lib/rhythm";
import { BEAT_NOTE_CHOICES, GRID_CHOICES, meterText } from "../../stores/selectors";
import { useActions, useEditor } from "./context";

const UNITS = [2, 4, 8, 16] as const;

/** Swing presets: share of the pair given to the first note (2/3 is triplet swing, common practice). */
const SWING_PRESETS = [
  { ratio: 0.5, name: "Straight" },
  { ratio: 0.55, name: "Light (55%)" },
  { ratio: 0.6, name: "Medium (60%)" },
  { ratio: 2 / 3, name: "Triplet (67%)" },
  { ratio: 0.72, name: "Hard (72%)" },
] as const;

function parseGrouping(text: string): number[] | undefined | null {
  const t = text.trim();
  if (t === "") return undefined;
  const parts = t.split(/[+\s,]+/).filter(Boolean).map(Number);
  return parts.every((n) => Number.isInteger(n) && n > 0) ? parts : null;
}

export function MeterTempoPanel() {
  const id = useId();
  const actions = useActions();
  const meter = useEditor((s) => s.doc.meter);
  const grid = useEditor((s) => s.doc.grid.step);
  const tempo = useEditor((s) => s.doc.tempo);
  const swing = useEditor((s) => s.doc.swing);

  const [beats, setBeats] = useState(String(meter.beatsPerBar));
  const [unit, setUnit] = useState(String(meter.beatUnit));
  const [grouping, setGrouping] = useState(meter.grouping?.join("+") ?? "");
  const [bpm, setBpm] = useState(String(Math.round(q(tempo.bpm).valueOf() * 100) / 100));
  const [meterError, setMeterError] = useState<string | null>(null);
  useEffect(() => {
    setBeats(String(meter.beatsPerBar));
    setUnit(String(meter.beatUnit));
    setGrouping(meter.grouping?.join("+") ?? "");
  }, [meter]);
  useEffect(() => setBpm(String(Math.round(q(tempo.bpm).valueOf() * 100) / 100)), [tempo.bpm]);

  const applyMeter = (e: React.FormEvent) => {
    e.preventDefault();
    const b = Number(beats);
    const g = parseGrouping(grouping);
    if (!Number.isInteger(b) || b < 1 || b > 32) return setMeterError("Beats per bar: a whole number from 1 to 32.");
    if (g === null) return setMeterError("Grouping: numbers joined by +, such as 2+2+3.");
    if (g && g.reduce((x, y) => x + y, 0) !== b) return setMeterError(`The grouping adds up to ${g.reduce((x, y) => x + y, 0)}, not ${b}.`);
    setMeterError(null);
    actions.changeMeter({ beatsPerBar: b, beatUnit: Number(unit) as 2 | 4 | 8 | 16, ...(g ? { grouping: g } : {}) });
  };

  const applyBpm = () => {
    const v = Number(bpm);
    if (!Number.isFinite(v) || v <= 0) return setBpm(String(q(tempo.bpm).valueOf()));
    if (Math.abs(v - q(tempo.bpm).valueOf()) > 1e-9) actions.changeTempo({ bpm: v });
  };

  const preset = SWING_PRESETS.find((p) => Math.abs(p.ratio - swing.ratio) < 1e-9);
  return (
    <section className="tx-panel" aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`} className="tx-panel-title">
        Meter, grid and tempo
      </h2>
      <form className="tx-fields" onSubmit={applyMeter} aria-describedby={meterError ? `${id}-merr` : undefined}>
        <label className="tx-field is-narrow">
          <span>Beats per bar</span>
          <input className="num" inputMode="numeric" value={beats} onChange={(e) => setBeats(e.target.value)} aria-invalid={!!meterError} />
        </label>
        <label className="tx-field is-narrow">
          <span>Beat unit</span>
          <select value={unit} onChange={(e) => setUnit(e.target.value)}>
            {UNITS.map((u) => (
              <option key={u} value={u}>
                {u}
              </option>
            ))}
          </select>
        </label>
        <label className="tx-field">
          <span>Grouping (optional)</span>
          <input className="num" placeholder="e.g. 2+2+3" value={grouping} onChange={(e) => setGrouping(e.target.value)} />
        </label>
        <button type="submit" className="tx-btn">
          Change meter
        </button>
        <p className="tx-hint">
          Now <span className="num">{meterText({ meter })}</span>. Each bar keeps what fits; anything past the new bar end is listed for you.
        </p>
        {meterError && (
          <p id={`${id}-merr`} className="tx-error" role="alert">
            {meterError}
          </p>
        )}
      </form>
      <div className="tx-fields">
        <label className="tx-field">
          <span>Grid</span>
          <select value={grid} onChange={(e) => actions.changeGrid(e.target.value)}>
            {GRID_CHOICES.map((g) => (
              <option key={g.step} value={g.step}>
                {g.name}
              </option>
            ))}
            {!GRID_CHOICES.some((g) => g.step === grid) && <option value={grid}>{grid} of a whole note</option>}
          </select>
        </label>
        <label className="tx-field is-narrow">
          <span>Tempo (bpm)</span>
          <input
            className="num"
            inputMode="decimal"
            value={bpm}
            onChange={(e) => setBpm(e.target.value)}
            onBlur={applyBpm}
            onKeyDown={(e) => {
              if (e.key === "Enter") applyBpm();
            }}
          />
        </label>
        <label className="tx-field">
          <span>Beat note</span>
          <select value={tempo.beatNote} onChange={(e) => actions.changeTempo({ beatNote: e.target.value })}>
            {BEAT_NOTE_CHOICES.map((b) => (
              <option key={b.note} value={b.note}>
                {b.name}
              </option>
            ))}
            {!BEAT_NOTE_CHOICES.some((b) => b.note === tempo.beatNote) && <option value={tempo.beatNote}>{tempo.beatNote}</option>}
          </select>
        </label>
        <label className="tx-field">
          <span>Swing</span>
          <select value={preset ? String(preset.ratio) : "custom"} onChange={(e) => e.target.value !== "custom" && actions.changeSwing({ ratio: Number(e.target.value) })}>
            {SWING_PRESETS.map((p) => (
              <option key={p.name} value={String(p.ratio)}>
                {p.name}
              </option>
            ))}
            {!preset && <option value="custom">{Math.round(swing.ratio * 100)}%</option>}
          </select>
        </label>
        <label className="tx-field is-narrow">
          <span>Swung value</span>
          <select value={swing.unit} onChange={(e) => actions.changeSwing({ unit: e.target.value })}>
            <option value="1/8">Eighths</option>
            <option value="1/16">Sixteenths</option>
          </select>
        </label>
      </div>
    </section>
  );
}
