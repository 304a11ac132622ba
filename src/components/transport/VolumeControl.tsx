/**
 * The volume slider (dB before the master limiter, in the audio adapter's range) with the listening-safety note
 * right beside it. No audio library here: the caller passes the level on to the player.
 */
import { useId, type ReactNode } from "react";
import { VOLUME_RANGE_DB } from "../../adapters/tone/config";
import { SafeListeningNote } from "./SafeListeningNote";

export interface VolumeControlProps {
  /** Output level in dB (0 = full scale before the limiter). */
  value: number;
  onChange(db: number): void;
  /** Extra words for the end of the note (e.g. that audio is unavailable). */
  note?: ReactNode;
}

export function VolumeControl({ value, onChange, note }: VolumeControlProps) {
  const id = useId();
  return (
    <>
      <label className="tx-field is-inline tx-volume">
        <span>Volume</span>
        <input
          type="range"
          min={VOLUME_RANGE_DB.min}
          max={VOLUME_RANGE_DB.max}
          step={1}
          value={value}
          aria-valuetext={`${value} dB`}
          aria-describedby={`${id}-safe`}
          onChange={(e) => onChange(Number(e.target.value))}
        />
        <span className="num tx-dim">{value} dB</span>
      </label>
      <SafeListeningNote id={`${id}-safe`}>{note}</SafeListeningNote>
    </>
  );
}
