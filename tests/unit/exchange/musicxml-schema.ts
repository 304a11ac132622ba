/**
 * Offline validation against the MusicXML 4.0 XSD (W3C Music Notation Community Group) with xmllint-wasm
 * (libxml2's xmllint compiled to WebAssembly). The schema files are the repository's copies in
 * tests/fixtures/musicxml-4.0 (see its README.md); musicxml.xsd imports xml.xsd and xlink.xsd by web address,
 * so those two imports are pointed at the preloaded local copies, in memory only.
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { validateXML, type XMLValidationResult } from "xmllint-wasm";

export const REPO_ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../../..");
export const FIXTURE_DIR = path.join(REPO_ROOT, "tests/fixtures/musicxml-4.0");
/** The shared reference folder beside the repository (present on the team's machines and in CI). */
export const SHARED_DIR = path.resolve(REPO_ROOT, "../shared/reference/musicxml-4.0");

let schema: { main: string; xml: string; xlink: string } | undefined;

function loadSchema() {
  schema ??= {
    main: readFileSync(path.join(FIXTURE_DIR, "musicxml.xsd"), "utf8").replace(
      /schemaLocation="http:\/\/www\.musicxml\.org\/xsd\/(xml|xlink)\.xsd"/g,
      'schemaLocation="$1.xsd"',
    ),
    xml: readFileSync(path.join(FIXTURE_DIR, "xml.xsd"), "utf8"),
    xlink: readFileSync(path.join(FIXTURE_DIR, "xlink.xsd"), "utf8"),
  };
  return schema;
}

/**
 * Validates files against the schema in one xmllint run (the schema is compiled once).
 * @example const r = await validateMusicXml([{ fileName: "a.musicxml", contents: xml }]); r.valid
 */
export async function validateMusicXml(files: { fileName: string; contents: string }[]): Promise<XMLValidationResult> {
  const s = loadSchema();
  return validateXML({
    xml: files,
    schema: [{ fileName: "musicxml.xsd", contents: s.main }],
    preload: [
      { fileName: "xml.xsd", contents: s.xml },
      { fileName: "xlink.xsd", contents: s.xlink },
    ],
    maxMemoryPages: 16384, // 1 GiB: long scores in one run
  });
}
