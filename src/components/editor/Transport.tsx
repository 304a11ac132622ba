/**
 * Transport controls: play/stop, loop (the whole groove or the selected bars), metronome, count-in and
 * volume, with the listening-safety note. The sound itself comes from the audio adapter behind
 * `TransportController`; nothing here imports an audio library.
 */
import { VolumeControl } from "../transport/VolumeControl";
import { useActions, useEditor, useTransport } from "./context";

export function Transport() {
  const transport = useTransport();
  const actions = useActions();
  const playing = useEditor((s) => s.playing);
  const settings = useEditor((s) => s.transport);
  const playhead = useEditor((s) => s.playhead);
  const selection = useEditor((s) => s.selection);
  return (
    <section className="tx-transport" aria-label="Playback">
      <button
        type="button"
        className={`tx-btn tx-play${playing ? " is-on" : ""}`}
        aria-pressed={playing}
        aria-keyshortcuts="Space"
        onClick={() => void transport.toggle()}
      >
        {playing ? "Stop" : "Play"} <kbd>Space</kbd>
      </button>
      <label className="tx-check">
        <input type="checkbox" checked={settings.loop} onChange={(e) => actions.setTransport({ loop: e.target.checked })} />
        <span>Loop {selection ? (selection.count === 1 ? `bar ${selection.start + 1}` : `bars ${selection.start + 1}–${selection.start + selection.count}`) : "all"}</span>
      </label>
      <label className="tx-check">
        <input type="checkbox" checked={settings.metronome} onChange={(e) => actions.setTransport({ metronome: e.target.checked })} />
        <span>Click</span>
      </label>
      <label className="tx-field is-inline">
        <span>Count-in</span>
        <select value={settings.countInBars} onChange={(e) => actions.setTransport({ countInBars: Number(e.target.value) as 0 | 1 | 2 })}>
          <option value={0}>none</option>
          <option value={1}>1 bar</option>
          <option value={2}>2 bars</option>
        </select>
      </label>
      <output className="tx-position num" aria-live="off">
        {playhead ? `bar ${playhead.bar + 1} · beat ${playhead.beat + 1}` : "—"}
      </output>
      <VolumeControl
        value={settings.volumeDb}
        onChange={(db) => transport.setVolume(db)}
        note={!transport.available && <> Audio playback is not part of this build yet.</>}
      />
    </section>
  );
}
