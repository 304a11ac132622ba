/**
 * Song form: pure operations on a groove's named sections (intro, verse, build…), each with a repeat count.
 *
 * The document's rule (see `document.ts`): sections follow each other without gaps and cover every bar, or
 * there are none (the whole groove is one loop played once). Every function here takes a valid document and
 * returns a valid one; what it cannot do it refuses with a RhythmError in words, never by bending the tiling.
 * Sections are addressed by their index in `doc.sections`; bars are 0-based (labels for people are 1-based).
 *
 * Bar edits that move sections (insert, delete, duplicate, paste) live in `editing.ts` and keep the tiling too.
 */
import { LIMITS, RhythmError, sectionSchema, type GrooveDocument, type Section } from "./document";
import { insertBar } from "./editing";

/** Longest section name the document accepts. */
export const SECTION_NAME_MAX = LIMITS.maxSectionName;
/** Most repeats of one section the document accepts. */
export const SECTION_REPEATS_MAX = LIMITS.maxRepeats;

/**
 * Form letters for new sections: A, B, C… (the usual way to label the parts of a form), then A2, B2…
 * @example defaultSectionName([{ name: "A" }, { name: "B" }]) // "C"
 */
export function defaultSectionName(sections: readonly Pick<Section, "name">[]): string {
  const taken = new Set(sections.map((s) => s.name));
  for (let round = 1; ; round++)
    for (let i = 0; i < 26; i++) {
      const name = String.fromCharCode(65 + i) + (round === 1 ? "" : String(round));
      if (!taken.has(name)) return name;
    }
}

/**
 * The index of the section holding bar `bar` (0-based), or -1 when there are no sections.
 * @example sectionIndexAt(doc, 4) // 1 when the first section has 4 bars
 */
export function sectionIndexAt(doc: Pick<GrooveDocument, "sections">, bar: number): number {
  return doc.sections.findIndex((s) => bar >= s.startBar && bar < s.startBar + s.bars);
}

/**
 * Bars heard in all, repeats counted (the length of `playOrder`).
 * @example playedBars({ bars: 4, sections: [{ name: "A", startBar: 0, bars: 4, repeats: 2 }] }) // 8
 */
export function playedBars(doc: Pick<GrooveDocument, "bars" | "sections">): number {
  return doc.sections.length === 0 ? doc.bars : doc.sections.reduce((n, s) => n + s.bars * s.repeats, 0);
}

function cleanName(name: string): string {
  const r = sectionSchema.shape.name.safeParse(name);
  if (!r.success) {
    const t = name.trim();
    throw new RhythmError(t === "" ? "a section needs a name" : `a section name has at most ${SECTION_NAME_MAX} characters`);
  }
  return r.data;
}

function cleanRepeats(repeats: number): number {
  if (!Number.isInteger(repeats) || repeats < 1 || repeats > SECTION_REPEATS_MAX)
    throw new RhythmError(`a section plays from 1 to ${SECTION_REPEATS_MAX} times`);
  return repeats;
}

function requireSection(doc: GrooveDocument, index: number): Section {
  const s = doc.sections[index];
  if (!Number.isInteger(index) || !s) throw new RhythmError(`there is no section ${index + 1}`);
  return s;
}

function requireRoom(doc: GrooveDocument, extra = 1): void {
  if (doc.sections.length + extra > LIMITS.maxSections) throw new RhythmError(`a groove has at most ${LIMITS.maxSections} sections`);
}

/** Give back sections renumbered from bar 0, in order (the one place that computes start bars). */
function tile(parts: readonly Omit<Section, "startBar">[]): Section[] {
  let start = 0;
  return parts.map((p) => {
    const s = { name: p.name, startBar: start, bars: p.bars, repeats: p.repeats };
    start += p.bars;
    return s;
  });
}

/**
 * Start a song form: the whole groove becomes one section (played once). No change when there are sections.
 * @example formSections(doc, "Verse").sections // [{ name: "Verse", startBar: 0, bars: doc.bars, repeats: 1 }]
 */
export function formSections(doc: GrooveDocument, name?: string): GrooveDocument {
  if (doc.sections.length > 0) return doc;
  return { ...doc, sections: [{ name: cleanName(name ?? "A"), startBar: 0, bars: doc.bars, repeats: 1 }] };
}

/**
 * Add a section of `bars` new empty bars at the end of the groove. Without sections, the bars already
 * written become a first section ("A") and the new one follows.
 * @example addSection(doc, { name: "Build", bars: 4 }).sections.at(-1) // { name: "Build", startBar: doc.bars, bars: 4, repeats: 1 }
 */
export function addSection(doc: GrooveDocument, opts: { name?: string; bars?: number; repeats?: number } = {}): GrooveDocument {
  const bars = opts.bars ?? 1;
  if (!Number.isInteger(bars) || bars < 1) throw new RhythmError("a new section needs at least one bar");
  const base = formSections(doc);
  requireRoom(base);
  const name = cleanName(opts.name ?? defaultSectionName(base.sections));
  const repeats = cleanRepeats(opts.repeats ?? 1);
  const grown = insertBar(base, base.bars, bars); // the last section grows; give those bars to the new section
  const last = grown.sections.length - 1;
  const sections = grown.sections.slice();
  sections[last] = { ...sections[last]!, bars: sections[last]!.bars - bars };
  sections.push({ name, startBar: base.bars, bars, repeats });
  return { ...grown, sections };
}

/**
 * Split the section holding `bar` so that a new section starts there. The first part keeps its name and
 * repeat count; the new part gets `name` (or the next form letter) and plays once. Without sections, the
 * groove is first made one section ("A"). Splitting at a section's first bar is refused.
 * @example splitSectionAt(doc, 8, "Chorus")
 */
export function splitSectionAt(doc: GrooveDocument, bar: number, name?: string): GrooveDocument {
  if (!Number.isInteger(bar) || bar <= 0 || bar >= doc.bars)
    throw new RhythmError(`a section can start at bar 2 to bar ${doc.bars}, not at bar ${bar + 1}`);
  const base = formSections(doc);
  const i = sectionIndexAt(base, bar);
  const s = base.sections[i]!;
  if (s.startBar === bar) throw new RhythmError(`section "${s.name}" already starts at bar ${bar + 1}`);
  requireRoom(base);
  const added: Section = { name: cleanName(name ?? defaultSectionName(base.sections)), startBar: bar, bars: s.startBar + s.bars - bar, repeats: 1 };
  const sections = [...base.sections.slice(0, i), { ...s, bars: bar - s.startBar }, added, ...base.sections.slice(i + 1)];
  return { ...base, sections };
}

/**
 * Rename a section (trimmed, 1 to 40 characters).
 * @example renameSection(doc, 0, "Intro")
 */
export function renameSection(doc: GrooveDocument, index: number, name: string): GrooveDocument {
  const s = requireSection(doc, index);
  const clean = cleanName(name);
  if (clean === s.name) return doc;
  const sections = doc.sections.slice();
  sections[index] = { ...s, name: clean };
  return { ...doc, sections };
}

/**
 * Set how many times a section plays in a row (1 to 64).
 * @example setRepeats(doc, 1, 3) // the second section three times
 */
export function setRepeats(doc: GrooveDocument, index: number, repeats: number): GrooveDocument {
  const s = requireSection(doc, index);
  const r = cleanRepeats(repeats);
  if (r === s.repeats) return doc;
  const sections = doc.sections.slice();
  sections[index] = { ...s, repeats: r };
  return { ...doc, sections };
}

/**
 * Move the start of section `index` (not the first) to `bar`: the section before it ends there. Each of the
 * two keeps at least one bar.
 * @example moveSectionStart(doc, 1, 6) // the second section now starts at bar 7
 */
export function moveSectionStart(doc: GrooveDocument, index: number, bar: number): GrooveDocument {
  const s = requireSection(doc, index);
  if (index === 0) throw new RhythmError("the first section always starts at bar 1");
  const prev = doc.sections[index - 1]!;
  const end = s.startBar + s.bars;
  if (!Number.isInteger(bar) || bar <= prev.startBar || bar >= end)
    throw new RhythmError(`section "${s.name}" can start from bar ${prev.startBar + 2} to bar ${end}, so that "${prev.name}" and "${s.name}" each keep a bar`);
  if (bar === s.startBar) return doc;
  const sections = doc.sections.slice();
  sections[index - 1] = { ...prev, bars: bar - prev.startBar };
  sections[index] = { ...s, startBar: bar, bars: end - bar };
  return { ...doc, sections };
}

/**
 * Join section `index` with the one after it: the joined section keeps the first one's name and repeats.
 * @example mergeWithNext(doc, 0)
 */
export function mergeWithNext(doc: GrooveDocument, index: number): GrooveDocument {
  const s = requireSection(doc, index);
  const next = doc.sections[index + 1];
  if (!next) throw new RhythmError(`section "${s.name}" is the last one: there is nothing after it to join`);
  const parts = doc.sections.filter((_, i) => i !== index + 1).map((x) => (x === s ? { ...s, bars: s.bars + next.bars } : x));
  return { ...doc, sections: tile(parts) };
}

/**
 * Remove a section's name and repeats, keeping its bars: they join the section before it (the one after,
 * for the first section). Removing the only section leaves the groove without a song form.
 * @example removeSection(doc, 1) // its bars now belong to section 1
 */
export function removeSection(doc: GrooveDocument, index: number): GrooveDocument {
  requireSection(doc, index);
  if (doc.sections.length === 1) return { ...doc, sections: [] };
  return index === 0 ? mergeWithNext({ ...doc, sections: swapFirstTwoNames(doc.sections) }, 0) : mergeWithNext(doc, index - 1);
}

/** For removing the first section: the second one's name and repeats carry the joined bars. */
function swapFirstTwoNames(sections: Section[]): Section[] {
  const [a, b, ...rest] = sections;
  return [{ ...a!, name: b!.name, repeats: b!.repeats }, b!, ...rest];
}

/**
 * Remove every section: the groove plays once as one loop.
 * @example clearSections(doc).sections // []
 */
export function clearSections(doc: GrooveDocument): GrooveDocument {
  return doc.sections.length === 0 ? doc : { ...doc, sections: [] };
}
