/**
 * Spelling for a drawing that is being edited: after an edit, spell again only the bars whose kit hits
 * changed and keep the other bars' objects from the last score. The renderer keys its measurements and
 * drawings by bar object, so a kept bar costs nothing downstream either.
 *
 * Documents are immutable and edits share what they do not change, so a lane, hit or note that is the same
 * object is the same content; anything else that differs (meter, grid, bars, tempo, swing, sections, keys,
 * the lane list) spells the whole groove again, exactly as `spellGroove` does.
 */
import { barLength, type GrooveDocument, type KitHit } from "../../lib/rhythm/document";
import type { NotationBar, NotationScore } from "../../lib/rhythm/notation/model";
import { spellBars, spellGroove } from "../../lib/rhythm/notation/spell";
import { q } from "../../lib/rhythm/rational";

export interface Spelled {
  readonly doc: GrooveDocument;
  readonly score: NotationScore;
}

const same = (a: unknown, b: unknown) => a === b || JSON.stringify(a) === JSON.stringify(b);

/**
 * The bars (0-based, sorted) whose kit content differs between two documents, or null when something other
 * than kit hits differs and the whole groove must be spelled.
 * @example changedKitBars(doc, toggleHit(doc, "snare", "5/4")) // [1]
 */
export function changedKitBars(prev: GrooveDocument, doc: GrooveDocument): number[] | null {
  if (prev === doc) return [];
  if (prev.bars !== doc.bars || prev.keys !== doc.keys || !same(prev.meter, doc.meter) || !same(prev.grid, doc.grid)) return null;
  if (!same(prev.tempo, doc.tempo) || !same(prev.swing, doc.swing) || !same(prev.sections, doc.sections)) return null;
  const a = prev.kit.lanes;
  const b = doc.kit.lanes;
  if (a.length !== b.length || a.some((l, i) => l.piece !== b[i]!.piece)) return null;
  const bar = barLength(doc.meter);
  const bars = new Set<number>();
  const mark = (at: string) => bars.add(Number(q(at).div(bar).floor().valueOf()));
  a.forEach((lane, i) => {
    const next = b[i]!;
    if (lane === next || lane.hits === next.hits) return;
    const before = new Map<string, KitHit>(lane.hits.map((h) => [h.at, h]));
    for (const h of next.hits) {
      if (before.get(h.at) !== h) mark(h.at);
      before.delete(h.at);
    }
    for (const at of before.keys()) mark(at);
  });
  return [...bars].filter((n) => n >= 0 && n < doc.bars).sort((x, y) => x - y);
}

/**
 * Spell `doc`, reusing the bars of `prev` that did not change. The result equals `spellGroove(doc)`.
 * @example const s1 = respell(null, doc); const s2 = respell({ doc, score: s1 }, edited)
 */
export function respell(prev: Spelled | null, doc: GrooveDocument): NotationScore {
  const changed = prev ? changedKitBars(prev.doc, doc) : null;
  if (!prev || !changed) return spellGroove(doc);
  if (changed.length === 0) return prev.score;
  const bars: NotationBar[] = prev.score.bars.slice();
  for (let i = 0; i < changed.length; ) {
    // Spell each run of neighbouring bars in one call.
    let j = i + 1;
    while (j < changed.length && changed[j] === changed[j - 1]! + 1) j++;
    const from = changed[i]!;
    spellBars(doc, from, changed[j - 1]! + 1).forEach((b, k) => (bars[from + k] = b));
    i = j;
  }
  return { ...prev.score, bars };
}
