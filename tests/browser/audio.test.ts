// Audio in the editor, in Debian's chromium against the built test server: program a swung groove by clicks, press
// play and watch the playhead move, then render the same groove offline in the page (the adapter's test hook, only
// with ?audio-test=1) and check every rendered onset against the core's schedule, computed here in Node.
// Target (issue 4): every onset within 1 ms of the schedule, none missing, none extra. Count-in and metronome:
// common practice, one click per beat at the groove's tempo before the groove starts.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { launchBrowser, openPage, type Browser } from "./helpers";
import { assertGroove, compileSchedule, type GrooveDocument } from "../../src/lib/rhythm";
import { compareOnsets } from "../../src/lib/rhythm/onsets";

const cell = (page: Page, row: number, col: number) => page.locator(`[data-kcell][data-row="${row}"][data-col="${col}"]`);

interface Rendered {
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
    const r = await renderInPage(page);
    const doc = assertGroove(r.doc);
    expect(doc.swing.ratio).toBeCloseTo(2 / 3, 9);
    const expected = compileSchedule(doc).map((e) => e.time);
    const cmp = compareOnsets(expected, r.onsets);
    expect(cmp.expected).toHaveLength(8); // eight swung eighths; kick and snare fall on them
    expect(cmp.missing).toEqual([]);
    expect(cmp.extra).toEqual([]);
    expect(cmp.maxAbsError).toBeLessThanOrEqual(0.001);
    // The swung off-beat sounds at 2/3 of the beat (common practice for triplet swing): 0.4167 s at 96 bpm.
    expect(Math.abs(r.onsets[1]! - (2 / 3) * 0.625)).toBeLessThanOrEqual(0.001);
    // Moderate level out of the master volume (−12 dB by default): well below full scale.
    expect(r.peak).toBeGreaterThan(0.01);
    expect(r.peak).toBeLessThan(0.9);
    expect(errors).toEqual([]);
  });

  it("puts a one-bar count-in of four clicks before the groove, and clicks every beat with the metronome", async () => {
    const r = await renderInPage(page, { countInBars: 1, metronome: true });
    const doc = assertGroove(r.doc);
    const beat = 0.625; // quarter = 96
    const countIn = [0, 1, 2, 3].map((k) => k * beat);
    const groove = compileSchedule(doc).map((e) => e.time + 4 * beat);
    const clicks = [0, 1, 2, 3].map((k) => 4 * beat + k * beat);
    const cmp = compareOnsets([...countIn, ...groove, ...clicks], r.onsets);
    expect(cmp.missing).toEqual([]);
    expect(cmp.extra).toEqual([]);
    expect(cmp.maxAbsError).toBeLessThanOrEqual(0.001);
    expect(cmp.expected).toHaveLength(12);
  });

  it("loops a bar range: the body sounds again, on time, every time round", async () => {
    const r = await renderInPage(page, { loopRange: { startBar: 0, endBar: 1 }, passes: 3 });
    const doc = assertGroove(r.doc);
    const bar = 2.5;
    const once = compileSchedule(doc).map((e) => e.time);
    const cmp = compareOnsets([0, 1, 2].flatMap((k) => once.map((t) => t + k * bar)), r.onsets);
    expect(cmp.missing).toEqual([]);
    expect(cmp.extra).toEqual([]);
    expect(cmp.maxAbsError).toBeLessThanOrEqual(0.001);
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
    const r = await renderInPage(page);
    const doc = assertGroove(r.doc);
    expect(Number(doc.tempo.bpm)).toBe(150);
    const cmp = compareOnsets(compileSchedule(doc).map((e) => e.time), r.onsets);
    expect(cmp.missing).toEqual([]);
    expect(cmp.extra).toEqual([]);
    expect(cmp.maxAbsError).toBeLessThanOrEqual(0.001);
    // Looped at the new tempo (a bar of 4/4 at 150 bpm lasts 1.6 s), three times round, each on time.
    const looped = await renderInPage(page, { loopRange: { startBar: 0, endBar: 1 }, passes: 3 });
    const once = compileSchedule(doc).map((e) => e.time);
    const loopCmp = compareOnsets([0, 1, 2].flatMap((k) => once.map((t) => t + k * 1.6)), looped.onsets);
    expect(loopCmp.missing).toEqual([]);
    expect(loopCmp.extra).toEqual([]);
    expect(loopCmp.maxAbsError).toBeLessThanOrEqual(0.001);
    expect(errors).toEqual([]);
  });
});
