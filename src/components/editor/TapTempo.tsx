/** Tap tempo: tap the button (or T) along with the music; shows the running bpm and how steady the taps are. */
import { useEffect, useMemo, useState } from "react";
import { createTapTempo, roundBpm, type TapAnalysis } from "../../lib/rhythm/tap-tempo";
import { useActions } from "./context";

export interface TapHandle {
  tap(): void;
}

export function TapTempo({ handleRef }: { handleRef?: React.MutableRefObject<TapHandle | null> }) {
  const actions = useActions();
  const counter = useMemo(() => createTapTempo({ now: () => performance.now() }), []);
  const [r, setR] = useState<TapAnalysis>(() => counter.current());
  const tap = () => setR(counter.tap());
  useEffect(() => {
    if (handleRef) handleRef.current = { tap };
  });
  const bpm = r.bpm === null ? null : roundBpm(r.bpm);
  return (
    <section className="tx-tap" aria-label="Tap tempo">
      <button type="button" className="tx-btn tx-tapbtn" onClick={tap} aria-keyshortcuts="T">
        Tap <kbd>T</kbd>
      </button>
      <output className="tx-tapout" aria-live="polite">
        {r.bpm === null ? (
          <span className="tx-dim">{r.taps === 1 ? "keep tapping…" : "tap along with the beat"}</span>
        ) : (
          <>
            <strong className="num">{r.bpm.toFixed(1)}</strong> bpm
            <span className="tx-dim">
              {" "}
              · {r.taps} taps
              {r.steadiness && (
                <>
                  {" "}
                  · ±<span className="num">{r.sdMs!.toFixed(0)}</span> ms, {r.steadiness}
                </>
              )}
            </span>
          </>
        )}
      </output>
      {bpm !== null && (
        <button type="button" className="tx-btn is-small" onClick={() => actions.changeTempo({ bpm })}>
          Use {bpm} bpm
        </button>
      )}
      {r.taps > 0 && (
        <button
          type="button"
          className="tx-btn is-small is-quiet"
          onClick={() => {
            counter.reset();
            setR(counter.current());
          }}
        >
          Reset
        </button>
      )}
    </section>
  );
}
