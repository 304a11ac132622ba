/**
 * Downloads of a groove version in every export format: the bytes, their media type and the file name.
 * Server-only (images need the VexFlow server renderer and resvg). Routes authorise first, then call this.
 */
import type { GrooveDocument } from "../rhythm/document";
import { EXPORT_FORMATS, contentDisposition, downloadName, type ExportFormat } from "./filenames";
import { notationPng, notationSvg } from "./images.server";
import { exportMidi } from "./midi-export";
import { exportMusicXml, type MusicXmlOptions } from "./musicxml-export";

export { ImageTooLarge } from "./images.server";

export interface DownloadRequest {
  format: ExportFormat;
  title: string;
  versionNumber: number;
  /** Images: width in CSS pixels, PNG scale, bar range (0-based, `toBar` exclusive). */
  width?: number;
  scale?: number;
  fromBar?: number;
  toBar?: number;
  /** MusicXML credits. */
  credits?: MusicXmlOptions["credits"];
  /** Serve for display (images) rather than as an attachment. */
  inline?: boolean;
}

export interface Download {
  body: Uint8Array<ArrayBuffer> | string;
  headers: Record<string, string>;
}

/**
 * Builds one download. Throws ImageTooLarge when an image would be too big to draw.
 * @example const { body, headers } = buildDownload(doc, { format: "mid", title: "Salt Road", versionNumber: 3 });
 */
export function buildDownload(doc: GrooveDocument, req: DownloadRequest): Download {
  const { format, title } = req;
  let body: Uint8Array<ArrayBuffer> | string;
  switch (format) {
    case "mid":
      body = new Uint8Array(exportMidi(doc, { title }));
      break;
    case "musicxml":
      body = exportMusicXml(doc, { title, credits: req.credits });
      break;
    case "svg":
      body = notationSvg(doc, { title, width: req.width, fromBar: req.fromBar, toBar: req.toBar });
      break;
    case "png":
      body = new Uint8Array(notationPng(doc, { title, width: req.width, scale: req.scale, fromBar: req.fromBar, toBar: req.toBar }));
      break;
  }
  const mediaType = EXPORT_FORMATS[format].mediaType;
  const textual = format === "musicxml" || format === "svg";
  return {
    body,
    headers: {
      "content-type": textual ? `${mediaType}; charset=utf-8` : mediaType,
      "content-disposition": contentDisposition(downloadName(title, format, req.versionNumber), req.inline && (format === "svg" || format === "png") ? "inline" : "attachment"),
      "x-content-type-options": "nosniff",
      // An SVG opened from this address must not run anything (it holds no scripts; this makes sure).
      ...(format === "svg" ? { "content-security-policy": "default-src 'none'; style-src 'unsafe-inline'; font-src data:" } : {}),
    },
  };
}

