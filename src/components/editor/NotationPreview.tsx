/**
 * Live notation: the editor's frame around the notation island (src/components/notation/NotationView),
 * which spells the document with the core (`spellGroove`), draws it with the VexFlow adapter, redraws only
 * the bars that changed, and marks "tactus:notation-updated" / "tactus:painted" for the toggle-to-paint
 * benchmark (tests/bench/toggle-to-paint.mjs).
 */
import type { GrooveDocument } from "../../lib/rhythm";
import type { PlayPosition } from "../../stores/editor-store";
import { NotationView } from "../notation/NotationView";

export interface NotationPreviewProps {
  doc: GrooveDocument;
  playhead?: PlayPosition | null;
  label?: string;
  /** The notation of the groove being edited (see NotationView's warmUp). */
  live?: boolean;
}

export function NotationPreview({ doc, playhead = null, label = "Notation", live = false }: NotationPreviewProps) {
  return (
    <figure className="tx-notation" aria-label={label}>
      <NotationView doc={doc} playhead={playhead} className="tx-notation-host" warmUp={live} />
    </figure>
  );
}
