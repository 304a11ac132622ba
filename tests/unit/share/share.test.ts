// The pure parts of sharing: embed addresses and options, the embed's geometry, oEmbed sizing (oEmbed 1.0,
// oembed.com §2.2–2.4: maxwidth/maxheight bind the embed and the thumbnail; thumbnail fields come together),
// ETag matching (RFC 9110 §13.1.2, weak comparison for If-None-Match), and the compare page's words.
import { describe, expect, it } from "vitest";
import { DEMO_GROOVES, UNDERTOW_PAIR } from "../../../src/lib/demo/grooves";
import { assertGroove } from "../../../src/lib/rhythm/document";
import { compareGrooves, type Mismatch } from "../../../src/lib/rhythm/equivalence";
import { readabilityFigures } from "../../../src/lib/rhythm/readability";
import { Lru, matchesEtag, strongEtag } from "../../../src/lib/server/embed-cache";
import { BUCKET_FROM, CHROME_HEIGHT, WIDTH_BUCKETS, bucketCss, bucketForContentWidth, contentWidthOf, embedHeight } from "../../../src/lib/share/embed-geometry";
import {
  DEFAULT_EMBED_OPTIONS,
  embedCacheKey,
  embedPath,
  embedQuery,
  iframeSnippet,
  parseEmbedOptions,
  previewImageHeight,
} from "../../../src/lib/share/embed-options";
import { figureRows } from "../../../src/lib/share/figure-rows";
import { frameWidth, parseSharedUrl, thumbnailFor } from "../../../src/lib/share/oembed";
import { mismatchWords, offsetWords, pitchName, verdictWords } from "../../../src/lib/share/verdict";

const demo = (id: string) => assertGroove(DEMO_GROOVES.find((g) => g.id === id)!.document);

describe("embed options and addresses", () => {
  it("reads options, falling back to the defaults for anything malformed", () => {
    expect(parseEmbedOptions(new URLSearchParams(""))).toEqual(DEFAULT_EMBED_OPTIONS);
    expect(parseEmbedOptions(new URLSearchParams("keys=0&bar=3&theme=dark"))).toEqual({ keys: false, startBar: 3, theme: "dark" });
    expect(parseEmbedOptions(new URLSearchParams("keys=maybe&bar=-2&theme=purple"))).toEqual(DEFAULT_EMBED_OPTIONS);
    expect(parseEmbedOptions(new URLSearchParams("bar=0")).startBar).toBe(1);
    expect(parseEmbedOptions(new URLSearchParams("bar=99999")).startBar).toBe(1); // more than 4 digits: not a bar
    expect(parseEmbedOptions(new URLSearchParams("bar=5000")).startBar).toBe(4096);
  });

  it("writes the canonical query and paths, and the cache key ignores what does not change the page", () => {
    expect(embedQuery(DEFAULT_EMBED_OPTIONS)).toBe("");
    expect(embedPath({ versionId: "v1" }, { keys: false, startBar: 2, theme: "light" })).toBe("/embed/v/v1?keys=0&bar=2&theme=light");
    expect(embedPath({ grooveId: "g1" })).toBe("/embed/g/g1");
    const key = (u: string) => embedCacheKey(new URL(u));
    expect(key("http://h:1/embed/v/x?utm_source=a&bar=1")).toBe(key("http://h:1/embed/v/x"));
    expect(key("http://h:1/embed/v/x?theme=dark&keys=0")).toBe(key("http://h:1/embed/v/x?keys=0&theme=dark"));
    expect(key("http://h:1/embed/v/x?keys=0")).not.toBe(key("http://h:1/embed/v/x"));
    expect(key("http://other:1/embed/v/x")).not.toBe(key("http://h:1/embed/v/x")); // absolute links inside differ
    expect(key("http://h/embed/compare?b=2&a=1")).toBe("h/embed/compare?a=1&b=2");
  });

  it("escapes the iframe snippet and never asks for autoplay", () => {
    const html = iframeSnippet('https://t.example/embed/v/x?keys=0&bar=2', { width: 480, height: 300, title: 'Say "hi" <now>' });
    expect(html).toBe(
      '<iframe src="https://t.example/embed/v/x?keys=0&amp;bar=2" width="480" height="300" title="Say &quot;hi&quot; &lt;now&gt; (Tactus)" style="border:0;max-width:100%" loading="lazy"></iframe>',
    );
    expect(html).not.toMatch(/autoplay|allow=/);
  });
});

describe("embed geometry", () => {
  it("chooses one bucket for every content width, never drawing wider than 4/3 of the bucket", () => {
    expect(WIDTH_BUCKETS.length).toBe(BUCKET_FROM.length);
    for (let w = 200; w <= 1600; w++) {
      const b = bucketForContentWidth(w);
      const next = WIDTH_BUCKETS[WIDTH_BUCKETS.indexOf(b) + 1];
      if (next) expect(w / b).toBeLessThanOrEqual(4 / 3 + 1e-9);
      expect(w >= BUCKET_FROM[WIDTH_BUCKETS.indexOf(b)]!).toBe(true);
    }
    expect(bucketForContentWidth(336)).toBe(360);
    expect(bucketForContentWidth(696)).toBe(720);
  });

  it("computes the page height from the drawn size at that width", () => {
    expect(contentWidthOf(720)).toBe(696);
    expect(embedHeight(720, { 720: { width: 720, height: 400 } })).toBe(Math.ceil(CHROME_HEIGHT + (400 * 696) / 720));
    expect(embedHeight(360, { 360: { width: 360, height: 540 } })).toBe(Math.ceil(CHROME_HEIGHT + (540 * 336) / 360));
  });

  it("writes container queries that cover every width once", () => {
    const css = bucketCss();
    for (const b of WIDTH_BUCKETS) expect(css).toContain(`.tx-bucket[data-w='${b}']{display:block}`);
    expect(css.match(/@container/g)).toHaveLength(WIDTH_BUCKETS.length);
    expect(css).toContain("@media print");
  });
});

describe("oEmbed sizing and addresses", () => {
  const hosts = ["t.example"];
  it("reads groove pages, version pages and embed addresses on our host only", () => {
    expect(parseSharedUrl("https://t.example/grooves/abc", hosts)).toEqual({ target: { grooveId: "abc" }, grooveId: "abc", options: DEFAULT_EMBED_OPTIONS });
    expect(parseSharedUrl("https://t.example/grooves/abc?version=v1", hosts)?.target).toEqual({ versionId: "v1" });
    expect(parseSharedUrl("https://t.example/embed/v/v1?keys=0", hosts)).toEqual({ target: { versionId: "v1" }, options: { ...DEFAULT_EMBED_OPTIONS, keys: false } });
    expect(parseSharedUrl("https://t.example/embed/g/abc", hosts)?.grooveId).toBe("abc");
    for (const bad of ["https://evil.example/grooves/abc", "javascript:alert(1)", "https://t.example/library", "https://t.example/grooves/abc/edit", "https://t.example/grooves/abc?version=a%20b", "nonsense"]) {
      expect(parseSharedUrl(bad, hosts), bad).toBeNull();
    }
  });

  it("keeps the frame and the thumbnail inside maxwidth and maxheight", () => {
    expect(frameWidth()).toBe(720);
    expect(frameWidth(500)).toBe(500);
    expect(frameWidth(5000)).toBe(720);
    expect(thumbnailFor()).toEqual({ width: 1200, height: 630 });
    expect(thumbnailFor(700)).toEqual({ width: 600, height: 315 });
    expect(thumbnailFor(undefined, 200)).toEqual({ width: 300, height: 158 });
    expect(thumbnailFor(149)).toBeNull();
    // The card's aspect ratio is kept (1.91:1, the usual link-card shape).
    for (const w of [1200, 600, 300, 150]) expect(Math.abs(previewImageHeight(w) / w - 630 / 1200)).toBeLessThan(0.005);
  });
});

describe("ETags and the LRU", () => {
  it("compares If-None-Match weakly, lists and * included (RFC 9110 §13.1.2, §13.1.2 examples)", () => {
    const tag = '"xyzzy"';
    expect(matchesEtag('"xyzzy"', tag)).toBe(true);
    expect(matchesEtag('W/"xyzzy"', tag)).toBe(true);
    expect(matchesEtag('"r2d2xxxx", "c3piozzzz", "xyzzy"', tag)).toBe(true);
    expect(matchesEtag("*", tag)).toBe(true);
    expect(matchesEtag('"xyzzz"', tag)).toBe(false);
    expect(matchesEtag(null, tag)).toBe(false);
    const e = strongEtag(new TextEncoder().encode("bar"));
    expect(e).toMatch(/^"[A-Za-z0-9_-]{32}"$/);
    expect(strongEtag(new TextEncoder().encode("bar"))).toBe(e);
    expect(strongEtag(new TextEncoder().encode("baz"))).not.toBe(e);
  });

  it("evicts the least recently used entry by count and by weight", () => {
    const lru = new Lru<number>(2, 100);
    lru.set("a", 1);
    lru.set("b", 2);
    lru.get("a");
    lru.set("c", 3);
    expect(lru.get("b")).toBeUndefined();
    expect(lru.get("a")).toBe(1);
    lru.set("big", 4, 90);
    lru.set("big2", 5, 90);
    expect(lru.get("big")).toBeUndefined();
    expect(lru.get("big2")).toBe(5);
  });
});

describe("the verdict in words", () => {
  it("names note values and pitches as musicians do", () => {
    expect(offsetWords("1/8")).toBe("one eighth note");
    expect(offsetWords("3/16")).toBe("one dotted eighth note");
    expect(offsetWords("1/16")).toBe("one sixteenth note");
    // MIDI note 60 is middle C, C4 (MIDI Manufacturers Association convention); 69 is A4 (440 Hz).
    expect(pitchName(60)).toBe("C4");
    expect(pitchName(69)).toBe("A4");
    expect(pitchName(57)).toBe("A3");
    expect(pitchName(61)).toBe("C♯4");
  });

  it("states the demo's worked example: same sound, offset one eighth at 152 bpm = 197 ms", () => {
    // src/lib/demo/grooves.ts: B = A at double tempo, displaced by +1/8; (1/8) × 240/152 s = 0.19737 s.
    const [a, b] = UNDERTOW_PAIR;
    const eq = compareGrooves(demo(b), demo(a));
    const w = verdictWords(eq);
    expect(w.same).toBe(true);
    expect(w.headline).toBe("These two readings sound the same: 29 onsets match, start offset one eighth note = 197 ms.");
    expect(w.details[0]).toMatch(/^B sounds one eighth note \(197 ms\) earlier than A/);
    const identical = verdictWords(compareGrooves(demo(a), demo(a)));
    expect(identical.headline).toBe("These two readings sound the same: 29 onsets match.");
  });

  it("lists differences in bars and beats of the reading that has them", () => {
    const m: Mismatch = { side: "b", time: 0.625, bar: 1, beat: 2, pass: 0, kind: "kit", piece: "snare", velocity: 120, text: "bar 1, beat 2: snare (accent) flam only in b" };
    expect(mismatchWords(m, { a: "A", b: "B" })).toBe("bar 1, beat 2: snare (accent) flam, only in B");
    const k: Mismatch = { side: "a", time: 0, bar: 3, beat: 1, pass: 6, kind: "keys", pitch: 64, velocity: 80, text: "bar 3, beat 1: pitch 64 (velocity 80) only in a" };
    expect(mismatchWords(k, { a: "A", b: "B" })).toBe("bar 3, beat 1 (7th bar played): keys E4 (velocity 80), only in A");
    const different = verdictWords(compareGrooves(demo("LmpUndertA1"), demo("LmpHarbour1")));
    expect(different.same).toBe(false);
    expect(different.details).toContain("bar 1, beat 1: kick, only in B");
  });
});

describe("figures side by side", () => {
  it("marks the reading that reads easier on each line, as the figures' directions say", () => {
    const [a, b] = UNDERTOW_PAIR;
    const rows = figureRows(readabilityFigures(demo(a)), readabilityFigures(demo(b)));
    const row = (label: string) => rows.find((r) => r.label === label)!;
    // Undertow at 152 bpm puts the snare on 2 and 4 (common practice backbeat); at 76 bpm it sits on the "e"s.
    expect(row("Backbeat in place").easier).toBe("b");
    expect(row("Syncopation").easier).toBe("b");
    expect(row("Written tempo")).toMatchObject({ a: "76 bpm", b: "152 bpm", easier: null }); // both inside 60–180
    expect(row("Meter and length").easier).toBeNull();
    const same = figureRows(readabilityFigures(demo(a)), readabilityFigures(demo(a)));
    expect(same.every((r) => r.easier === null)).toBe(true);
  });
});
