/**
 * A text or number field that edits a document value in ONE undo step: typing changes only the field;
 * Enter or leaving the field commits; Escape puts the current value back (with nothing typed, it is left to the
 * surrounding menu). A value the core refuses is reported by the store's notice, and the field shows the
 * document's value again.
 */
import { useEffect, useState, type InputHTMLAttributes } from "react";

export interface CommitInputProps extends Omit<InputHTMLAttributes<HTMLInputElement>, "value" | "onChange" | "defaultValue"> {
  value: string;
  /** Called with the typed text when it differs from `value`. */
  onCommit: (text: string) => void;
}

export function CommitInput({ value, onCommit, onKeyDown, onBlur, ...rest }: CommitInputProps) {
  const [text, setText] = useState(value);
  useEffect(() => setText(value), [value]);
  const commit = () => {
    if (text !== value) onCommit(text);
    // If the store refused the value, `value` does not change: show it again.
    setText(value);
  };
  return (
    <input
      {...rest}
      value={text}
      onChange={(e) => setText(e.target.value)}
      onKeyDown={(e) => {
        if (e.key === "Enter") {
          e.preventDefault();
          commit();
        } else if (e.key === "Escape" && text !== value) {
          // The first Escape takes back the typing; with nothing typed it goes on (closing a menu).
          e.stopPropagation();
          setText(value);
        }
        onKeyDown?.(e);
      }}
      onBlur={(e) => {
        commit();
        onBlur?.(e);
      }}
    />
  );
}

/** A whole number typed by a person, or null. */
export function wholeNumber(text: string): number | null {
  const t = text.trim();
  return /^\d+$/.test(t) ? Number(t) : null;
}
