/**
 * Addresses of a groove's downloads and printable chart (see src/pages/api/grooves/[id]/export/[format].ts and
 * src/pages/grooves/[id]/print.astro). Shared by the groove page (Astro) and the library (React).
 */
import { EXPORT_FORMATS, type ExportFormat } from "../../lib/exchange/filenames";

export interface DownloadLink {
  format: ExportFormat;
  /** Button text, e.g. "MIDI". */
  label: string;
  /** What the file is for, for a title or a hint. */
  hint: string;
  href: string;
}

const HINTS: Record<ExportFormat, string> = {
  mid: "Standard MIDI File: kit on channel 10, keys on channel 1, for electronic kits and sequencers",
  musicxml: "MusicXML 4.0: the notation, for other notation programs",
  svg: "The notation as a vector image",
  png: "The notation as a picture",
};

/**
 * Download links of a version (the latest when `versionId` is absent).
 * @example downloadLinks("LmpSaltRd01")[0].href // "/api/grooves/LmpSaltRd01/export/mid"
 */
export function downloadLinks(grooveId: string, versionId?: string | null): DownloadLink[] {
  const q = versionId ? `?version=${encodeURIComponent(versionId)}` : "";
  return (Object.keys(EXPORT_FORMATS) as ExportFormat[]).map((format) => ({
    format,
    label: EXPORT_FORMATS[format].label,
    hint: HINTS[format],
    href: `/api/grooves/${encodeURIComponent(grooveId)}/export/${format}${q}`,
  }));
}

/** The printable chart of a version. */
export function printHref(grooveId: string, versionId?: string | null): string {
  return `/grooves/${encodeURIComponent(grooveId)}/print${versionId ? `?version=${encodeURIComponent(versionId)}` : ""}`;
}
