// Audio in the editor, in Debian's chromium against the built test server: program a swung groove by clicks, press
// play and watch the playhead move, then render the same groove offline in the page (the adapter's test hook, only
// with ?audio-test=1) and check every rendered onset against the core's schedule, computed here in Node: each
// instrument on its own channel (every stroke checked), and the whole mix (strokes together are one onset).
// Target (issue 4): every onset within 1 ms of the schedule, none missing, none extra. Count-in and metronome:
// common practice, one click per beat at the groove's tempo before the groove starts.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { launchBrowser, openPage, type Browser } from "./helpers";
import { assertGroove, compileSchedule, type GrooveDocument } from "../../src/lib/rhythm";
import { compareOnsets } from "../../src/lib/rhythm/onsets";
import { FLAM_GRACE_SECONDS } from "../../src/lib/rhythm/playback-plan";

const cell = (page: Page, row: number, col: number) => page.locator(`[data-kcell][data-row="${row}"][data-col="${col}"]`);

interface Rendered {
  stems?: { voice: string; onsets: number[] }[];
  rms: number[];
  onsets: number[];
  duration: number;
  sampleRate: number;
  renderSeconds: number;
  peak: number;
  doc: GrooveDocument;
}

async function renderInPage(page: Page, options: Record<string, unknown> = {}): Promise<Rendered> {
  return page.evaluate(async (opts) => {
    const hook = (window as unknown as { __tactusAudio?: { doc: unknown; renderAndDetect(o: unknown): Promise<Omit<Rendered, "doc">> } }).__tactusAudio;
    if (!hook) throw new Error("no audio test hook on this page");
    const r = await hook.renderAndDetect(opts);
    return { ...r, doc: hook.doc } as Rendered;
  }, options);
}

type Expected = Record<string, number[]>;

/** The core's schedule, voice by voice (the voice of a kit hit is its piece; keys notes are "keys"), shifted by `offset`. */
function byVoice(doc: GrooveDocument, offset = 0, into: Expected = {}): Expected {
  for (const e of compileSchedule(doc)) (into[e.kind === "keys" ? "keys" : e.piece!] ??= []).push(e.time + offset);
  return into;
}

/** Compare every voice's rendered onsets (its own channel) with what it should play; totals over all voices. */
function compareStems(r: Rendered, expected: Expected) {
  const stems = r.stems ?? [];
  expect(stems.map((s) => s.voice).sort()).toEqual(Object.keys(expected).sort());
  let missing: string[] = [];
  let extra: string[] = [];
  let maxAbsError = 0;
  let onsets = 0;
  for (const { voice, onsets: got } of stems) {
    const c = compareOnsets(expected[voice]!, got);
    missing = missing.concat(c.missing.map((t) => `${voice} ${t.toFixed(4)}`));
    extra = extra.concat(c.extra.map((t) => `${voice} ${t.toFixed(4)}`));
    maxAbsError = Math.max(maxAbsError, c.maxAbsError);
    onsets += c.expected.length;
  }
  return { missing, extra, maxAbsError, onsets };
}

/** Read the transport's position label for a while; return every distinct value seen. */
async function positionsFor(page: Page, ms: number): Promise<string[]> {
  const seen: string[] = [];
  const until = Date.now() + ms;
  while (Date.now() < until) {
    const text = (await page.locator(".tx-position").textContent()) ?? "";
    if (seen[seen.length - 1] !== text) seen.push(text);
    await page.waitForTimeout(40);
  }
  return seen;
}

describe("audio in the editor (chromium)", () => {
  let browser: Browser;
  let page: Page;
  let errors: string[];

  beforeAll(async () => {
    browser = await launchBrowser();
    const opened = await openPage(browser, "/grooves/new?audio-test=1");
    page = opened.page;
    errors = opened.errors;
    await page.evaluate(() => localStorage.clear());
    await page.reload();
    await page.locator("astro-island:not([ssr]) [data-editor]").waitFor();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("plays what was programmed, moves the playhead, and stops", async () => {
    // Hi-hat eighths, snare on 2 and 4, kick on 1 and the "and" of 3, swung in triplet feel.
    for (let c = 0; c < 16; c += 2) await cell(page, 0, c).click();
    await cell(page, 1, 4).click();
    await cell(page, 1, 12).click();
    await cell(page, 2, 0).click();
    await cell(page, 2, 10).click();
    await page.getByLabel("Swing").selectOption({ label: "Triplet (67%)" });

    expect(await page.locator(".tx-position").textContent()).toBe("—");
    await page.getByRole("button", { name: /^Play/ }).click();
    // The first play loads Tone.js; then the bar and beat heard change beat by beat (96 bpm: 0.625 s a beat).
    const seen = await positionsFor(page, 3500);
    const beats = seen.filter((s) => /^bar 1 · beat [1-4]$/.test(s));
    expect(new Set(beats).size).toBeGreaterThanOrEqual(3);
    expect(await page.locator(".tx-playhead").count()).toBeGreaterThan(0);
    expect(await page.getByRole("button", { name: /^Stop/ }).getAttribute("aria-pressed")).toBe("true");

    await page.getByRole("button", { name: /^Stop/ }).click();
    await page.waitForTimeout(200);
    expect(await page.locator(".tx-position").textContent()).toBe("—");
    expect(await page.getByRole("button", { name: /^Play/ }).getAttribute("aria-pressed")).toBe("false");
    expect(errors).toEqual([]);
  });

  it("renders the groove with every onset within 1 ms of the core's schedule, none missing or extra", async () => {
    // Each instrument on its own channel: every stroke of every voice is checked.
    const r = await renderInPage(page, { tap: "stems" });
    const doc = assertGroove(r.doc);
    expect(doc.swing.ratio).toBeCloseTo(2 / 3, 9);
    const cmp = compareStems(r, byVoice(doc));
    expect(cmp.onsets).toBe(12); // 8 hi-hats, 2 snares, 2 kicks
    expect(cmp.missing).toEqual([]);
    expect(cmp.extra).toEqual([]);
    expect(cmp.maxAbsError).toBeLessThanOrEqual(0.001);
    // The swung off-beat sounds at 2/3 of the beat (common practice for triplet swing): 0.4167 s at 96 bpm.
    const hats = r.stems!.find((s) => s.voice === "hihat-closed")!.onsets;
    expect(Math.abs(hats[1]! - (2 / 3) * 0.625)).toBeLessThanOrEqual(0.001);

    // The whole mix, before the limiter: the same onsets (strokes together are one), at a moderate level
    // (master volume −12 dB by default), well below full scale.
    const mix = await renderInPage(page);
    const mixed = compareOnsets(compileSchedule(doc).map((e) => e.time), mix.onsets);
    expect(mixed.expected).toHaveLength(8);
    expect(mixed.missing).toEqual([]);
    expect(mixed.extra).toEqual([]);
    expect(mixed.maxAbsError).toBeLessThanOrEqual(0.001);
    expect(mix.peak).toBeGreaterThan(0.01);
    expect(mix.peak).toBeLessThan(0.9);
    expect(errors).toEqual([]);
  });

  it("puts a one-bar count-in of four clicks before the groove, and clicks every beat with the metronome", async () => {
    const r = await renderInPage(page, { countInBars: 1, metronome: true, tap: "stems" });
    const doc = assertGroove(r.doc);
    const beat = 0.625; // quarter = 96
    const expected = byVoice(doc, 4 * beat);
    expected.click = [0, 1, 2, 3, 4, 5, 6, 7].map((k) => k * beat); // count-in, then one click a beat
    const cmp = compareStems(r, expected);
    expect(cmp.missing).toEqual([]);
    expect(cmp.extra).toEqual([]);
    expect(cmp.maxAbsError).toBeLessThanOrEqual(0.001);
  });

  it("loops a bar range: the body sounds again, on time, every time round", async () => {
    const r = await renderInPage(page, { loopRange: { startBar: 0, endBar: 1 }, passes: 3, tap: "stems" });
    const doc = assertGroove(r.doc);
    const expected: Expected = {};
    for (const k of [0, 1, 2]) byVoice(doc, k * 2.5, expected);
    const cmp = compareStems(r, expected);
    expect(cmp.onsets).toBe(36);
    expect(cmp.missing).toEqual([]);
    expect(cmp.extra).toEqual([]);
    expect(cmp.maxAbsError).toBeLessThanOrEqual(0.001);
  });

  it("plays a flam as a grace stroke just before the main stroke, and closes an open hi-hat with the next closed one", async () => {
    // Common practice: a flam's grace stroke comes a few tens of milliseconds before the main stroke; the open
    // hi-hat rings until the pedal closes it, which a closed stroke does.
    const base = { schemaVersion: 1, meter: { beatsPerBar: 4, beatUnit: 4 }, tempo: { bpm: 120, beatNote: "1/4" }, grid: { step: "1/16" }, bars: 1, keys: { notes: [] } };
    const flam = await renderInPage(page, { doc: { ...base, kit: { lanes: [{ piece: "snare", hits: [{ at: "1/4", articulation: "flam" }, { at: "3/4" }] }] } }, tap: "stems" });
    const cmp = compareStems(flam, { snare: [0.5 - FLAM_GRACE_SECONDS, 0.5, 1.5] });
    expect(FLAM_GRACE_SECONDS).toBeGreaterThanOrEqual(0.015);
    expect(FLAM_GRACE_SECONDS).toBeLessThanOrEqual(0.05);
    expect(cmp.missing).toEqual([]);
    expect(cmp.extra).toEqual([]);
    expect(cmp.maxAbsError).toBeLessThanOrEqual(0.001);

    // An open hi-hat on beat 1, with and without a closed stroke on beat 2 (0.5 s); level 0.62–0.72 s.
    const window: [number, number][] = [[0.62, 0.72]];
    const closed = await renderInPage(page, {
      doc: { ...base, kit: { lanes: [{ piece: "hihat-open", hits: [{ at: "0" }] }, { piece: "hihat-closed", hits: [{ at: "1/4" }] }] } },
      windows: window,
    });
    const ringing = await renderInPage(page, { doc: { ...base, kit: { lanes: [{ piece: "hihat-open", hits: [{ at: "0" }] }] } }, windows: window });
    expect(ringing.rms[0]!).toBeGreaterThan(0.0005); // still clearly sounding 0.6 s after the stroke
    // Closed: at least 12 dB quieter than when it rings on.
    expect(closed.rms[0]!).toBeLessThan(ringing.rms[0]! / 4);
    expect(errors).toEqual([]);
  });

  it("follows a tempo change while playing and keeps the playhead going", async () => {
    await page.getByRole("button", { name: /^Play/ }).click();
    await positionsFor(page, 800);
    const tempo = page.getByLabel("Tempo (bpm)");
    await tempo.fill("150");
    await tempo.press("Enter");
    // At 150 bpm a beat is 0.4 s: in 2 s the playhead passes several beats.
    const seen = await positionsFor(page, 2000);
    expect(seen.filter((s) => s.startsWith("bar 1 · beat")).length).toBeGreaterThanOrEqual(3);
    await page.getByRole("button", { name: /^Stop/ }).click();
    const r = await renderInPage(page, { tap: "stems" });
    const doc = assertGroove(r.doc);
    expect(Number(doc.tempo.bpm)).toBe(150);
    const cmp = compareStems(r, byVoice(doc));
    expect(cmp.missing).toEqual([]);
    expect(cmp.extra).toEqual([]);
    expect(cmp.maxAbsError).toBeLessThanOrEqual(0.001);
    // Looped at the new tempo (a bar of 4/4 at 150 bpm lasts 1.6 s), three times round, each on time.
    const looped = await renderInPage(page, { loopRange: { startBar: 0, endBar: 1 }, passes: 3, tap: "stems" });
    const expected: Expected = {};
    for (const k of [0, 1, 2]) byVoice(doc, k * 1.6, expected);
    const loopCmp = compareStems(looped, expected);
    expect(loopCmp.missing).toEqual([]);
    expect(loopCmp.extra).toEqual([]);
    expect(loopCmp.maxAbsError).toBeLessThanOrEqual(0.001);
    expect(errors).toEqual([]);
  });
});
