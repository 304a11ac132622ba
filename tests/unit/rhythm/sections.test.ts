/**
 * Song form. Sources: common practice (form letters A, B, C… for the parts of a song; a section played n
 * times in a row); the rest checks Tactus's own song-form rules (document.ts and sections.ts: sections follow
 * each other without gaps, cover every bar, and play in order with their repeats).
 */
import { describe, expect, it } from "vitest";
import { fc, test } from "@fast-check/vitest";
import { RhythmError, emptyGroove, parseGroove, playOrder, type GrooveDocument, type Section } from "../../../src/lib/rhythm/document";
import { copyBars, deleteBar, duplicateBar, insertBar, pasteBars, toggleHit } from "../../../src/lib/rhythm/editing";
import {
  addSection,
  clearSections,
  defaultSectionName,
  formSections,
  mergeWithNext,
  moveSectionStart,
  playedBars,
  removeSection,
  renameSection,
  sectionIndexAt,
  setRepeats,
  splitSectionAt,
} from "../../../src/lib/rhythm/sections";
import { grooveArb } from "./arbitraries";
import { valid } from "./grooves";

const shape = (doc: GrooveDocument) => doc.sections.map((s) => `${s.name}:${s.startBar}+${s.bars}×${s.repeats}`);

/** Eight bars of 4/4 with a snare on beat 2 of every bar, so bar moves can be followed by their content. */
function eightBars(): GrooveDocument {
  let doc = insertBar(emptyGroove(), 1, 7);
  for (let b = 0; b < 8; b++) doc = toggleHit(doc, "snare", `${4 * b + 1}/4`);
  return valid(doc);
}

describe("song-form sections", () => {
  it("starts a form, splits it, renames and repeats sections, and plays them in order", () => {
    let doc = formSections(eightBars(), "Verse");
    expect(shape(doc)).toEqual(["Verse:0+8×1"]);
    doc = valid(splitSectionAt(doc, 4, "Chorus"));
    doc = valid(setRepeats(doc, 0, 2));
    expect(shape(doc)).toEqual(["Verse:0+4×2", "Chorus:4+4×1"]);
    // Verse twice then the chorus: 4 × 2 + 4 bars heard.
    expect(playOrder(doc)).toEqual([0, 1, 2, 3, 0, 1, 2, 3, 4, 5, 6, 7]);
    expect(playedBars(doc)).toBe(12);
    doc = valid(renameSection(doc, 1, "  Lift  "));
    expect(doc.sections[1]!.name).toBe("Lift");
    expect(sectionIndexAt(doc, 3)).toBe(0);
    expect(sectionIndexAt(doc, 4)).toBe(1);
  });

  it("splitting a groove without sections makes the first part section A and names the new part by form letter", () => {
    const doc = valid(splitSectionAt(eightBars(), 6));
    expect(shape(doc)).toEqual(["A:0+6×1", "B:6+2×1"]);
    expect(defaultSectionName([{ name: "A" }, { name: "C" }])).toBe("B");
    expect(defaultSectionName(Array.from({ length: 26 }, (_, i) => ({ name: String.fromCharCode(65 + i) })))).toBe("A2");
  });

  it("adds a section of new empty bars at the end; the bars written before become section A", () => {
    const before = eightBars();
    const doc = valid(addSection(before, { name: "Build", bars: 2, repeats: 3 }));
    expect(doc.bars).toBe(10);
    expect(shape(doc)).toEqual(["A:0+8×1", "Build:8+2×3"]);
    expect(doc.kit).toEqual(before.kit); // nothing moved, the new bars are empty
    expect(playedBars(doc)).toBe(8 + 2 * 3);
  });

  it("moves a boundary, keeping a bar on each side", () => {
    let doc = splitSectionAt(formSections(eightBars(), "Verse"), 4, "Chorus");
    doc = valid(moveSectionStart(doc, 1, 6));
    expect(shape(doc)).toEqual(["Verse:0+6×1", "Chorus:6+2×1"]);
    doc = valid(moveSectionStart(doc, 1, 1));
    expect(shape(doc)).toEqual(["Verse:0+1×1", "Chorus:1+7×1"]);
    expect(() => moveSectionStart(doc, 1, 0)).toThrow(/can start from bar 2 to bar 8/);
    expect(() => moveSectionStart(doc, 1, 8)).toThrow(RhythmError);
    expect(() => moveSectionStart(doc, 0, 1)).toThrow(/first section always starts at bar 1/);
  });

  it("merges and removes sections into a neighbour, keeping every bar", () => {
    let doc = splitSectionAt(splitSectionAt(formSections(eightBars(), "Intro"), 2, "Verse"), 6, "Outro");
    doc = setRepeats(doc, 1, 4);
    expect(shape(valid(mergeWithNext(doc, 0)))).toEqual(["Intro:0+6×1", "Outro:6+2×1"]);
    // Removing a middle section gives its bars to the one before it.
    expect(shape(valid(removeSection(doc, 1)))).toEqual(["Intro:0+6×1", "Outro:6+2×1"]);
    // Removing the first gives its bars to the one after it, which keeps its own name and repeats.
    expect(shape(valid(removeSection(doc, 0)))).toEqual(["Verse:0+6×4", "Outro:6+2×1"]);
    expect(() => mergeWithNext(doc, 2)).toThrow(/nothing after it/);
    const one = formSections(eightBars());
    expect(valid(removeSection(one, 0)).sections).toEqual([]);
    expect(clearSections(doc).sections).toEqual([]);
    expect(clearSections(doc).kit).toBe(doc.kit);
  });

  it("refuses bad names, repeat counts and split points in words", () => {
    const doc = formSections(eightBars());
    expect(() => renameSection(doc, 0, "   ")).toThrow("a section needs a name");
    expect(() => renameSection(doc, 0, "x".repeat(41))).toThrow("at most 40 characters");
    expect(() => setRepeats(doc, 0, 0)).toThrow("from 1 to 64 times");
    expect(() => setRepeats(doc, 0, 65)).toThrow(RhythmError);
    expect(() => setRepeats(doc, 0, 1.5)).toThrow(RhythmError);
    expect(() => setRepeats(doc, 3, 2)).toThrow("there is no section 4");
    expect(() => splitSectionAt(doc, 0)).toThrow(/bar 2 to bar 8/);
    expect(() => splitSectionAt(splitSectionAt(doc, 3), 3)).toThrow(/already starts at bar 4/);
    // Unchanged values give back the same document (no empty undo step).
    expect(setRepeats(doc, 0, 1)).toBe(doc);
    expect(renameSection(doc, 0, "A")).toBe(doc);
  });

  it("duplicated bars join the section of the bar they copy, also at a section's last bar", () => {
    const doc = splitSectionAt(formSections(eightBars(), "Verse"), 4, "Chorus");
    const dup = valid(duplicateBar(doc, 3));
    expect(shape(dup)).toEqual(["Verse:0+5×1", "Chorus:5+4×1"]);
    const range = valid(duplicateBar(doc, 2, 3)); // bars 3–5 span both sections; the copies follow bar 5
    expect(shape(range)).toEqual(["Verse:0+4×1", "Chorus:4+7×1"]);
  });
});

// -------------------------------------------------------------------------------------------------------------
// Property: any sequence of section and bar operations keeps a valid document whose sections match a simple
// model (the owner of every bar), and whose play order is the model's.

type Op =
  | { op: "insert"; at: number; count: number }
  | { op: "delete"; at: number; count: number }
  | { op: "duplicate"; at: number; count: number }
  | { op: "paste"; from: number; count: number; to: number }
  | { op: "add"; bars: number; repeats: number }
  | { op: "split"; at: number }
  | { op: "rename"; index: number; name: string }
  | { op: "repeats"; index: number; repeats: number }
  | { op: "move"; index: number; at: number }
  | { op: "merge"; index: number }
  | { op: "remove"; index: number }
  | { op: "clear" };

/** Fractions in [0, 1) pick positions at run time, once the current size is known. */
const frac = fc.double({ min: 0, max: 1, maxExcluded: true, noNaN: true });
const opArb: fc.Arbitrary<Op> = fc.oneof(
  fc.record({ op: fc.constant("insert" as const), at: frac, count: fc.integer({ min: 1, max: 3 }) }),
  fc.record({ op: fc.constant("delete" as const), at: frac, count: fc.integer({ min: 1, max: 3 }) }),
  fc.record({ op: fc.constant("duplicate" as const), at: frac, count: fc.integer({ min: 1, max: 3 }) }),
  fc.record({ op: fc.constant("paste" as const), from: frac, count: fc.integer({ min: 1, max: 3 }), to: frac }),
  fc.record({ op: fc.constant("add" as const), bars: fc.integer({ min: 1, max: 3 }), repeats: fc.integer({ min: 1, max: 4 }) }),
  fc.record({ op: fc.constant("split" as const), at: frac }),
  fc.record({ op: fc.constant("rename" as const), index: frac, name: fc.constantFrom("Intro", "Verse", "Build", "Chorus", "Tag") }),
  fc.record({ op: fc.constant("repeats" as const), index: frac, repeats: fc.integer({ min: 1, max: 8 }) }),
  fc.record({ op: fc.constant("move" as const), index: frac, at: frac }),
  fc.record({ op: fc.constant("merge" as const), index: frac }),
  fc.record({ op: fc.constant("remove" as const), index: frac }),
  fc.record({ op: fc.constant("clear" as const) }),
);

/** The model: which section owns each bar (an id), and each id's name and repeats; null owners = no form. */
interface Model {
  owners: number[] | null;
  bars: number;
  meta: Map<number, { name: string; repeats: number }>;
  nextId: number;
}

function modelOf(doc: GrooveDocument): Model {
  const meta = new Map<number, { name: string; repeats: number }>();
  if (doc.sections.length === 0) return { owners: null, bars: doc.bars, meta, nextId: 0 };
  const owners: number[] = [];
  doc.sections.forEach((s, i) => {
    meta.set(i, { name: s.name, repeats: s.repeats });
    for (let b = 0; b < s.bars; b++) owners.push(i);
  });
  return { owners, bars: doc.bars, meta, nextId: doc.sections.length };
}

/** Runs of equal owners, as sections. */
function runs(m: Model): Section[] {
  if (!m.owners) return [];
  const out: Section[] = [];
  m.owners.forEach((id, bar) => {
    const last = out.at(-1);
    if (last && (last as Section & { id: number }).id === id) last.bars++;
    else out.push({ id, name: m.meta.get(id)!.name, startBar: bar, bars: 1, repeats: m.meta.get(id)!.repeats } as Section & { id: number });
  });
  return out.map(({ name, startBar, bars, repeats }) => ({ name, startBar, bars, repeats }));
}

const pick = (f: number, n: number) => Math.min(n - 1, Math.floor(f * n));

describe("song form under any sequence of edits", () => {
  test.prop([grooveArb({ maxBars: 6 }), fc.array(opArb, { minLength: 1, maxLength: 25 })], { numRuns: 150 })(
    "stays a valid document whose sections and play order follow the model",
    (start, ops) => {
      let doc = start;
      const m = modelOf(doc);
      const ids = () => runs(m).map((s) => m.owners![s.startBar]!);
      for (const o of ops) {
        const n = doc.bars;
        const before = doc;
        const secs = doc.sections.length;
        let refused = false;
        const attempt = (fn: () => GrooveDocument) => {
          try {
            doc = fn();
          } catch (e) {
            if (!(e instanceof RhythmError)) throw e;
            refused = true;
          }
        };
        switch (o.op) {
          case "insert": {
            if (n + o.count > 40) break;
            const at = pick(o.at, n + 1);
            attempt(() => insertBar(doc, at, o.count));
            m.bars += o.count;
            if (m.owners) m.owners.splice(at, 0, ...Array(o.count).fill(m.owners[Math.min(at, n - 1)]));
            break;
          }
          case "delete": {
            const at = pick(o.at, n);
            const count = Math.min(o.count, n - at);
            if (count >= n) {
              expect(() => deleteBar(doc, at, count)).toThrow(RhythmError);
              break;
            }
            attempt(() => deleteBar(doc, at, count).doc);
            m.bars -= count;
            m.owners?.splice(at, count);
            break;
          }
          case "duplicate": {
            const at = pick(o.at, n);
            const count = Math.min(o.count, n - at);
            if (n + count > 40) break;
            attempt(() => duplicateBar(doc, at, count));
            m.bars += count;
            if (m.owners) m.owners.splice(at + count, 0, ...Array(count).fill(m.owners[at + count - 1]));
            break;
          }
          case "paste": {
            const from = pick(o.from, n);
            const count = Math.min(o.count, n - from);
            const to = pick(o.to, n + 1);
            const grow = Math.max(0, to + count - n);
            attempt(() => pasteBars(doc, copyBars(doc, from, count), to).doc);
            m.bars += grow;
            if (m.owners) m.owners.push(...Array(grow).fill(m.owners[n - 1]));
            break;
          }
          case "add": {
            if (n + o.bars > 40) break;
            attempt(() => addSection(doc, { bars: o.bars, repeats: o.repeats }));
            const name = defaultSectionName(before.sections.length === 0 ? [{ name: "A" }] : before.sections);
            if (!m.owners) {
              m.owners = Array(n).fill(m.nextId);
              m.meta.set(m.nextId++, { name: "A", repeats: 1 });
            }
            m.owners.push(...Array(o.bars).fill(m.nextId));
            m.meta.set(m.nextId++, { name, repeats: o.repeats });
            m.bars += o.bars;
            break;
          }
          case "split": {
            if (n < 2) {
              expect(() => splitSectionAt(doc, 1)).toThrow(RhythmError);
              break;
            }
            const at = 1 + pick(o.at, n - 1);
            const startsThere = m.owners !== null && m.owners[at] !== m.owners[at - 1];
            attempt(() => splitSectionAt(doc, at));
            expect(refused).toBe(startsThere);
            if (refused) break;
            if (!m.owners) {
              m.owners = Array(n).fill(m.nextId);
              m.meta.set(m.nextId++, { name: "A", repeats: 1 });
            }
            const old = m.owners[at]!;
            const id = m.nextId++;
            m.meta.set(id, { name: doc.sections[sectionIndexAt(doc, at)]!.name, repeats: 1 });
            for (let b = at; b < n && m.owners[b] === old; b++) m.owners[b] = id;
            expect(m.meta.get(id)!.name).toBe(defaultSectionName(before.sections.length ? before.sections : [{ name: "A" }]));
            break;
          }
          case "rename":
          case "repeats": {
            if (secs === 0) break;
            const i = pick(o.index, secs);
            attempt(() => (o.op === "rename" ? renameSection(doc, i, o.name) : setRepeats(doc, i, o.repeats)));
            const meta = m.meta.get(ids()[i]!)!;
            if (o.op === "rename") meta.name = o.name;
            else meta.repeats = o.repeats;
            break;
          }
          case "move": {
            if (secs < 2) break;
            const i = 1 + pick(o.index, secs - 1);
            const at = pick(o.at, n);
            const r = runs(m);
            const allowed = at > r[i - 1]!.startBar && at < r[i]!.startBar + r[i]!.bars;
            attempt(() => moveSectionStart(doc, i, at));
            expect(refused).toBe(!allowed);
            if (!allowed) break;
            const [prev, mine] = [ids()[i - 1]!, ids()[i]!];
            for (let b = r[i - 1]!.startBar; b < r[i]!.startBar + r[i]!.bars; b++) m.owners![b] = b < at ? prev : mine;
            break;
          }
          case "merge":
          case "remove": {
            if (secs === 0) break;
            const i = pick(o.index, secs);
            if (o.op === "merge" && i === secs - 1) {
              expect(() => mergeWithNext(doc, i)).toThrow(RhythmError);
              break;
            }
            attempt(() => (o.op === "merge" ? mergeWithNext(doc, i) : removeSection(doc, i)));
            if (o.op === "remove" && secs === 1) {
              m.owners = null;
              break;
            }
            const list = ids();
            const [from, into] = o.op === "merge" ? [list[i + 1]!, list[i]!] : i === 0 ? [list[0]!, list[1]!] : [list[i]!, list[i - 1]!];
            m.owners = m.owners!.map((id) => (id === from ? into : id));
            break;
          }
          case "clear":
            doc = clearSections(doc);
            m.owners = null;
            break;
        }
        if (o.op !== "split" && o.op !== "move") expect(refused).toBe(false);
        if (refused) expect(doc).toBe(before);

        // The document is valid, its sections are the model's runs, and the play order follows them.
        const parsed = parseGroove(doc);
        expect(parsed.ok ? [] : parsed.issues).toEqual([]);
        expect(doc.bars).toBe(m.bars);
        const expected = runs(m);
        expect(doc.sections).toEqual(expected);
        const order = expected.length === 0
          ? Array.from({ length: m.bars }, (_, b) => b)
          : expected.flatMap((s) => Array.from({ length: s.repeats }, () => Array.from({ length: s.bars }, (_, k) => s.startBar + k)).flat());
        expect(playOrder(doc)).toEqual(order);
        expect(playedBars(doc)).toBe(order.length);
      }
    },
  );
});
