/**
 * Exchange with other programs: Standard MIDI File export and import, MusicXML 4.0 export, download names and
 * chart words. Pure TypeScript (no DOM, no framework). Server-only parts live beside it: downloads.server.ts
 * (bytes and headers of every download), images.server.ts (SVG and PNG of the notation), print-chart.server.ts
 * (the notation of the printable chart, one SVG per system).
 */
export { exportMidi, graceVelocity, metronomeClocks, quarterBpm, tempoMicroseconds, MIDI_PPQ, KIT_CHANNEL, KEYS_CHANNEL, type MidiExportOptions } from "./midi-export";
export { importMidi, tempoFromMicroseconds, IMPORT_GRIDS, MIDI_MAX_BYTES, MidiImportError, type ImportGrid, type ImportReport, type MidiImportOptions, type MidiImportResult } from "./midi-import";
export { exportMusicXml, scoreToMusicXml, musicXmlDivisions, type MusicXmlOptions } from "./musicxml-export";
export { asciiStem, unicodeStem, downloadName, contentDisposition, EXPORT_FORMATS, type ExportFormat, type DownloadName } from "./filenames";
export { tempoText, meterText, swingText, formText } from "./chart-facts";
export { GM1_PERCUSSION, GM1_SUBSTITUTES, percussionPiece, percussionLabel } from "./gm-percussion";
