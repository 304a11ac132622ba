/**
 * The listening-safety note that sits beside a volume control (its `id` is the control's aria-describedby).
 */
import type { ReactNode } from "react";
import { safeListeningText } from "./safe-listening";

export function SafeListeningNote({ id, className = "tx-safety", children }: { id: string; className?: string; children?: ReactNode }) {
  return (
    <p id={id} className={className}>
      {safeListeningText()}
      {children}
    </p>
  );
}
