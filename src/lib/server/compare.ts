// Two readings side by side: resolve each (a version id, or a groove id for its latest version), check that the
// visitor may read it, and compute what the compare page and its embed show: the core's equivalence verdict in
// words and both readings' readability figures. Results are cached per pair of versions (versions never change).
import { eq } from "drizzle-orm";
import { compareGrooves, type Equivalence } from "../rhythm/equivalence";
import { countNotation, readabilityFigures, type ReadabilityFigures } from "../rhythm/readability";
import { verdictWords, type VerdictWords } from "../share/verdict";
import { getDb } from "./db/index";
import { grooveVersions } from "./db/schema";
import { Lru, scoreOf } from "./embed-cache";
import { getGrooveForEditing } from "./grooves-read";
import type { SessionUser } from "./session";
import { sharedReading, type SharedVersion } from "./sharing";
import { parseGroove, type GrooveDocument } from "../rhythm/document";
import type { Visibility } from "./roles";

/** One reading as the compare views show it. */
export interface Reading {
  grooveId: string;
  title: string;
  ownerName: string;
  visibility: Visibility;
  versionId: string;
  versionNumber: number;
  /** Whether the id named the groove (its latest version) rather than one version. */
  latest: boolean;
  document: GrooveDocument;
}

const ID = /^[A-Za-z0-9_-]{1,64}$/;

/**
 * The id in a pasted address ("/grooves/ID", "/grooves/ID?version=VID", "/embed/v/VID", "/embed/g/ID") or the
 * id itself.
 * @example readingId("https://t.example/grooves/abc?version=v1") // "v1"
 */
export function readingId(input: string): string | null {
  const s = input.trim();
  if (ID.test(s)) return s;
  try {
    const url = new URL(s, "http://x");
    const version = url.searchParams.get("version");
    if (version && ID.test(version)) return version;
    const m = /^\/(?:grooves|embed\/[vg])\/([A-Za-z0-9_-]{1,64})\/?$/.exec(url.pathname);
    return m ? m[1]! : null;
  } catch {
    return null;
  }
}

/**
 * A reading the visitor may read (library rules: private grooves for their owner and collaborators), or null.
 * @example await readingFor("LmpUndertA1", Astro.locals.user)
 */
export async function readingFor(id: string, user: SessionUser | null): Promise<Reading | null> {
  if (!ID.test(id)) return null;
  const [version] = await getDb().select({ grooveId: grooveVersions.grooveId }).from(grooveVersions).where(eq(grooveVersions.id, id)).limit(1);
  const data = version ? await getGrooveForEditing(version.grooveId, user, id) : await getGrooveForEditing(id, user);
  if (!data) return null;
  const parsed = parseGroove(data.version.document);
  if (!parsed.ok) return null;
  return {
    grooveId: data.groove.id,
    title: data.groove.title,
    ownerName: data.groove.owner.displayName,
    visibility: data.groove.visibility,
    versionId: data.version.id,
    versionNumber: data.version.number,
    latest: !version,
    document: parsed.doc,
  };
}

/** A reading for a public surface (the compare embed): only shared grooves, whoever asks. */
export async function sharedReadingFor(id: string): Promise<{ reading: Reading; shared: SharedVersion } | null> {
  const shared = await sharedReading(id);
  if (!shared) return null;
  return {
    shared,
    reading: {
      grooveId: shared.groove.id,
      title: shared.groove.title,
      ownerName: shared.groove.ownerName,
      visibility: shared.groove.visibility,
      versionId: shared.version.id,
      versionNumber: shared.version.number,
      latest: shared.version.id !== id,
      document: shared.version.document,
    },
  };
}

export interface Comparison {
  equivalence: Equivalence;
  words: VerdictWords;
  figures: [ReadabilityFigures, ReadabilityFigures];
  /** Seconds each reading sounds after reading A (for the synced playhead), or null when they differ. */
  offsets: [number, number] | [null, null];
}

const comparisons = new Lru<Comparison>(500);

/** Readability figures of a version, with the counts of its spelled notation. */
export function figuresOf(versionId: string, doc: GrooveDocument): ReadabilityFigures {
  return readabilityFigures(doc, { notation: (d) => countNotation(scoreOf(versionId, d)) });
}

/**
 * Compare two readings (cached per version pair).
 * @example const c = compareReadings(a, b); c.words.headline
 */
export function compareReadings(a: Reading, b: Reading, names = { a: "A", b: "B" }): Comparison {
  const key = `${a.versionId}|${b.versionId}|${names.a}|${names.b}`;
  const hit = comparisons.get(key);
  if (hit) return hit;
  const equivalence = compareGrooves(a.document, b.document);
  const offsets: Comparison["offsets"] =
    equivalence.verdict === "identical" ? [0, 0] : equivalence.verdict === "offset" ? [0, equivalence.offsetSeconds] : [null, null];
  const result: Comparison = {
    equivalence,
    words: verdictWords(equivalence, names),
    figures: [figuresOf(a.versionId, a.document), figuresOf(b.versionId, b.document)],
    offsets,
  };
  comparisons.set(key, result);
  return result;
}
