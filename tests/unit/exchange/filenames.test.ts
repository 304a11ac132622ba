/**
 * Download file names from titles, and the Content-Disposition header (RFC 6266, with the UTF-8 `filename*`
 * parameter of RFC 8187 / RFC 5987, whose example `filename*=UTF-8''%e2%82%ac%20rates` names "€ rates").
 */
import { describe, expect, it } from "vitest";
import { asciiStem, contentDisposition, downloadName, EXPORT_FORMATS, unicodeStem } from "../../../src/lib/exchange/filenames";

describe("file names from titles", () => {
  it("ASCII stems: accents dropped, words joined by hyphens, lower case", () => {
    expect(asciiStem("Harbour Lights at Four — verse")).toBe("harbour-lights-at-four-verse");
    expect(asciiStem("Ça ira, café! Straße")).toBe("ca-ira-cafe-strasse");
    expect(asciiStem("  ../../etc/passwd  ")).toBe("etc-passwd");
    expect(asciiStem("鼓のリズム")).toBe("groove"); // nothing left in ASCII: the fallback
    expect(asciiStem("x".repeat(200))).toHaveLength(80);
  });

  it("Unicode stems keep the title but not the characters file systems refuse", () => {
    expect(unicodeStem('Salt Road: 6/8 "in two" <draft>?')).toBe("Salt Road 6 8 in two draft");
    expect(unicodeStem("鼓のリズム")).toBe("鼓のリズム");
    expect(unicodeStem("..hidden")).toBe("hidden");
    expect(unicodeStem("\u0000\u001f")).toBe("groove");
  });

  it("names carry the version number and the format's extension", () => {
    expect(downloadName("Salt Road", "mid", 3)).toEqual({ ascii: "salt-road-v3.mid", unicode: "Salt Road v3.mid" });
    expect(downloadName("Salt Road", "musicxml").ascii).toBe("salt-road.musicxml");
    expect(Object.keys(EXPORT_FORMATS)).toEqual(["mid", "musicxml", "svg", "png"]);
    expect(EXPORT_FORMATS.musicxml.mediaType).toBe("application/vnd.recordare.musicxml+xml"); // the media type the MusicXML specification registers for uncompressed files (from memory)
    expect(EXPORT_FORMATS.mid.mediaType).toBe("audio/midi");
  });
});

describe("Content-Disposition (RFC 6266)", () => {
  it("plain ASCII names need only filename", () => {
    expect(contentDisposition({ ascii: "salt-road.mid", unicode: "salt-road.mid" })).toBe('attachment; filename="salt-road.mid"');
  });

  it("other names add filename* in UTF-8, percent-encoded (RFC 8187's example: € rates)", () => {
    expect(contentDisposition({ ascii: "rates.txt", unicode: "€ rates" })).toBe(`attachment; filename="rates.txt"; filename*=UTF-8''%E2%82%AC%20rates`);
    expect(contentDisposition(downloadName("Café (live)", "mid"), "inline")).toBe(`inline; filename="cafe-live.mid"; filename*=UTF-8''Caf%C3%A9%20%28live%29.mid`);
  });
});
