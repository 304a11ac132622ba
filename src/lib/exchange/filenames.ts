/**
 * File names for downloads, built from a groove's title.
 *
 * A download needs two names: a plain ASCII one for the `filename` parameter of Content-Disposition (every
 * browser reads it) and the title as written, in UTF-8, for `filename*` (RFC 6266 section 4.3 with the
 * RFC 8187 encoding), which browsers prefer when present. Both are stripped of characters that file systems
 * refuse (`/ \ : * ? " < > |` and control characters).
 */

/** Formats Tactus exports, with their extension and media type. */
export const EXPORT_FORMATS = {
  mid: { extension: "mid", mediaType: "audio/midi", label: "MIDI" },
  musicxml: { extension: "musicxml", mediaType: "application/vnd.recordare.musicxml+xml", label: "MusicXML" },
  svg: { extension: "svg", mediaType: "image/svg+xml", label: "SVG" },
  png: { extension: "png", mediaType: "image/png", label: "PNG" },
} as const;

export type ExportFormat = keyof typeof EXPORT_FORMATS;

const MAX_STEM = 80;

/**
 * An ASCII file stem from a title: accents dropped, words joined by hyphens, lower case, at most 80 characters.
 * @example asciiStem("Harbour Lights at Four (verse)") // "harbour-lights-at-four-verse"
 * @example asciiStem("Ça ira, café!") // "ca-ira-cafe"
 */
export function asciiStem(title: string, fallback = "groove"): string {
  const stem = title
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "") // combining marks left by NFKD (é → e + ́)
    .replace(/ß/g, "ss")
    .replace(/[^A-Za-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .toLowerCase()
    .slice(0, MAX_STEM)
    .replace(/-+$/, "");
  return stem || fallback;
}

/**
 * The title as a file stem in any script: characters file systems refuse become spaces, runs of spaces collapse.
 * @example unicodeStem('Salt Road: 6/8 "in two"') // "Salt Road 6 8 in two"
 */
export function unicodeStem(title: string, fallback = "groove"): string {
  const stem = [...title.normalize("NFC").replace(/[\u0000-\u001f\u007f/\\:*?"<>|]+/g, " ").replace(/\s+/g, " ").trim()]
    .slice(0, MAX_STEM)
    .join("")
    .trim()
    .replace(/^\.+/, "");
  return stem || fallback;
}

export interface DownloadName {
  /** ASCII name, e.g. "harbour-lights-at-four-v3.mid". */
  ascii: string;
  /** Name as written, e.g. "Harbour Lights at Four v3.mid". */
  unicode: string;
}

/**
 * The download name of an export.
 * @example downloadName("Harbour Lights at Four", "mid", 3).ascii // "harbour-lights-at-four-v3.mid"
 */
export function downloadName(title: string, format: ExportFormat, versionNumber?: number): DownloadName {
  const ext = EXPORT_FORMATS[format].extension;
  const v = versionNumber !== undefined ? versionNumber : null;
  return {
    ascii: `${asciiStem(title)}${v !== null ? `-v${v}` : ""}.${ext}`,
    unicode: `${unicodeStem(title)}${v !== null ? ` v${v}` : ""}.${ext}`,
  };
}

/** RFC 8187 value-chars: attr-char stays, every other byte of the UTF-8 encoding is percent-encoded. */
function rfc8187(value: string): string {
  return encodeURIComponent(value).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
}

/**
 * A Content-Disposition header value for an attachment (RFC 6266), with the ASCII name and, when it differs,
 * the UTF-8 name in `filename*`.
 * @example contentDisposition({ ascii: "cafe.mid", unicode: "Café.mid" }) // `attachment; filename="cafe.mid"; filename*=UTF-8''Caf%C3%A9.mid`
 */
export function contentDisposition(name: DownloadName, disposition: "attachment" | "inline" = "attachment"): string {
  const base = `${disposition}; filename="${name.ascii}"`;
  return name.unicode === name.ascii ? base : `${base}; filename*=UTF-8''${rfc8187(name.unicode)}`;
}
