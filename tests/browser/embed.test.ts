// Embeds, the compare page and the share dialog in Debian's chromium against the BUILT test server.
//   - An embed inside an iframe of a page from another origin: notation drawn, frame height as oEmbed says, play
//     (the audio adapter's offline render checked against the core's schedule: every onset within 1 ms, none
//     missing or extra, the audio engineer's target), playhead, stop; the audio engine loads only on play.
//   - With JavaScript disabled the notation is all there.
//   - Printing (page.pdf) gives one page, also for a long groove.
//   - Bars re-wrap at phone width; dark and light; no layout shift when the island wakes up.
//   - Compare page: the verdict for the demo's equivalent pair and for a non-equivalent pair, one playhead over both.
//   - Share dialog: snippet with the chosen width and options, copy with confirmation.
import { mkdtempSync, rmSync } from "node:fs";
import { createServer, type Server } from "node:http";
import os from "node:os";
import path from "node:path";
import { chromium, type Frame, type Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_GROOVES, UNDERTOW_PAIR } from "../../src/lib/demo/grooves";
import { assertGroove, compileSchedule, type GrooveDocument } from "../../src/lib/rhythm";
import { compareOnsets } from "../../src/lib/rhythm/onsets";
import { closeDb, contentHash, createUser, db, sessionFor, uid } from "../server/helpers";
import { CHROMIUM_ARGS, baseUrl, launchBrowser, openPage, type Browser } from "./helpers";

const demo = (id: string) => assertGroove(DEMO_GROOVES.find((g) => g.id === id)!.document);

/** The oEmbed answer for an address at a width (the frame size a consumer would use). */
async function oembedFor(url: string, maxwidth: number): Promise<{ width: number; height: number }> {
  const r = await fetch(new URL(`/api/oembed?url=${encodeURIComponent(url)}&maxwidth=${maxwidth}`, baseUrl()));
  expect(r.status).toBe(200);
  return (await r.json()) as { width: number; height: number };
}

/** Pages in a PDF: its page objects (PDF 1.7, ISO 32000-1 §7.7.3.3: /Type /Page, not /Pages). */
function pdfPages(pdf: Buffer): number {
  return (pdf.toString("latin1").match(/\/Type\s*\/Page(?![s\w])/g) ?? []).length;
}

/** The drawing (bucket) the frame shows: the one whose computed display is not none. */
async function visibleBucket(target: Page | Frame): Promise<{ width: number; systems: number; svgHeight: number }> {
  return target.evaluate(() => {
    const shown = [...document.querySelectorAll<HTMLElement>(".tx-notation .tx-bucket")].filter((b) => getComputedStyle(b).display !== "none");
    if (shown.length !== 1) throw new Error(`${shown.length} drawings shown`);
    const b = shown[0]!;
    return { width: Number(b.dataset.w), systems: b.querySelectorAll("g.tx-system").length, svgHeight: b.querySelector("svg")!.getBoundingClientRect().height };
  });
}

/** Inserts a shared groove of `bars` bars (a rock beat with a fill every fourth bar) for the print test. */
async function longGroove(bars: number): Promise<string> {
  const owner = await createUser({ label: "printer" });
  const lanes: Record<string, { at: string }[]> = { "hihat-closed": [], snare: [], kick: [], "tom-high": [] };
  for (let b = 0; b < bars; b++) {
    for (let e = 0; e < 8; e++) lanes["hihat-closed"]!.push({ at: `${b * 8 + e}/8` });
    lanes.snare!.push({ at: `${4 * b + 1}/4` }, { at: `${4 * b + 3}/4` });
    lanes.kick!.push({ at: `${b}` }, { at: `${8 * b + 5}/8` });
    if (b % 4 === 3) lanes["tom-high"]!.push({ at: `${16 * b + 14}/16` });
  }
  const doc = assertGroove({
    schemaVersion: 1,
    meter: { beatsPerBar: 4, beatUnit: 4 },
    tempo: { bpm: "112", beatNote: "1/4" },
    grid: { step: "1/16" },
    bars,
    kit: { lanes: Object.entries(lanes).map(([piece, hits]) => ({ piece, hits })) },
    keys: { notes: Array.from({ length: bars }, (_, b) => ({ at: `${b}`, duration: "1", pitch: 48 + (b % 4) * 2 })) },
  });
  const id = uid(12);
  const vid = uid(16);
  await db().query("insert into grooves (id, owner_id, title, visibility) values ($1, $2, $3, 'public')", [id, owner.id, `Long road (${bars} bars)`]);
  await db().query("insert into groove_versions (id, groove_id, number, document, content_hash, author_id) values ($1, $2, 1, $3, $4, $5)", [
    vid,
    id,
    JSON.stringify(doc),
    contentHash(doc),
    owner.id,
  ]);
  await db().query("update grooves set latest_version_id = $1 where id = $2", [vid, id]);
  return vid;
}

describe("embeds in chromium", () => {
  let browser: Browser;
  let host: Server;
  let hostUrl: string;

  beforeAll(async () => {
    browser = await launchBrowser();
    // A page on another origin that embeds a Tactus groove, as a blog or a lesson page would.
    host = createServer((req, res) => {
      const u = new URL(req.url ?? "/", "http://x");
      const src = u.searchParams.get("src") ?? "";
      const w = Number(u.searchParams.get("w") ?? 720);
      const h = Number(u.searchParams.get("h") ?? 400);
      res.writeHead(200, { "content-type": "text/html; charset=utf-8" });
      res.end(`<!doctype html><html><body style="margin:0"><p>A lesson about reading grooves.</p><iframe id="tactus" src="${src}" width="${w}" height="${h}" style="border:0"></iframe></body></html>`);
    });
    await new Promise<void>((resolve) => host.listen(0, "127.0.0.1", resolve));
    const address = host.address();
    hostUrl = `http://localhost:${typeof address === "object" && address ? address.port : 0}`;
  });
  afterAll(async () => {
    await browser?.close();
    await new Promise((resolve) => host?.close(resolve));
    await closeDb();
  });

  it("plays an embed inside an iframe on another site: notation, height, playhead, onsets on time, lazy engine", async () => {
    // Salt Road (demo data): 6/8 felt in two, ride, cross-stick, kick and keys.
    const embed = `${baseUrl()}/embed/v/LmpSaltRd01v1`;
    const size = await oembedFor(embed, 720);
    const { page, errors } = await openPage(browser, `${hostUrl}/?src=${encodeURIComponent(`${embed}?audio-test=1`)}&w=${size.width}&h=${size.height}`);
    const frame = page.frame({ url: /\/embed\/v\/LmpSaltRd01v1/ })!;
    expect(frame).not.toBeNull();
    await frame.locator(".tx-bucket[data-w='720'] svg.tx-score").waitFor({ state: "visible" });
    expect(await frame.locator("h1.tx-title").textContent()).toBe("Salt Road");
    // The frame the oEmbed answer asks for holds the whole embed: nothing to scroll.
    const inner = await frame.evaluate(() => ({ scroll: document.documentElement.scrollHeight, client: document.documentElement.clientHeight }));
    expect(inner.scroll).toBeLessThanOrEqual(inner.client + 1);
    expect(size.height - inner.scroll).toBeLessThan(8);

    // Before the first press of play, no audio code has been fetched.
    const scripts: string[] = [];
    page.on("request", (r) => {
      if (r.resourceType() === "script") scripts.push(r.url());
    });
    expect(await frame.evaluate(() => "__tactusAudio" in window)).toBe(false);
    const play = frame.locator("[data-tx-play]");
    await play.click();
    await frame.locator(".tx-bucket[data-w='720'] .tx-playhead:not([hidden])").waitFor({ state: "visible", timeout: 15_000 });
    expect(scripts.some((u) => /engine/.test(u))).toBe(true);
    expect(await play.getAttribute("aria-pressed")).toBe("true");
    // The playhead moves: two readings half a second apart differ.
    const left1 = await frame.locator(".tx-bucket[data-w='720'] .tx-playhead").evaluate((el) => (el as HTMLElement).style.transform);
    await page.waitForTimeout(500);
    const left2 = await frame.locator(".tx-bucket[data-w='720'] .tx-playhead").evaluate((el) => (el as HTMLElement).style.transform);
    expect(left1).toMatch(/^translate\(/);
    expect(left2).not.toBe(left1);

    // What plays is the groove, on time: offline render of the played document, onsets against the core's schedule.
    const rendered = await frame.evaluate(async () => {
      const hook = (window as unknown as { __tactusAudio?: { doc: unknown; renderAndDetect(o?: unknown): Promise<{ onsets: number[]; peak: number }> } }).__tactusAudio;
      if (!hook) throw new Error("no audio test hook");
      const r = await hook.renderAndDetect();
      return { ...r, doc: hook.doc };
    });
    const doc = assertGroove(rendered.doc);
    expect(doc).toEqual(demo("LmpSaltRd01"));
    const cmp = compareOnsets(compileSchedule(doc).map((e) => e.time), rendered.onsets);
    expect(cmp.expected).toHaveLength(14); // distinct onsets: 12 ride eighths, plus kicks on the sixteenths 5/16 and 17/16
    expect(cmp.missing).toEqual([]);
    expect(cmp.extra).toEqual([]);
    expect(cmp.maxAbsError).toBeLessThanOrEqual(0.001);

    await play.click();
    expect(await play.getAttribute("aria-pressed")).toBe("false");
    await frame.locator(".tx-bucket[data-w='720'] .tx-playhead").waitFor({ state: "hidden" });
    expect(errors).toEqual([]);
  });

  it("shows the notation with JavaScript disabled", async () => {
    const profile = mkdtempSync(path.join(os.tmpdir(), "tactus-nojs-"));
    const context = await chromium.launchPersistentContext(profile, {
      executablePath: process.env.CHROMIUM_PATH || "/usr/bin/chromium",
      args: [...CHROMIUM_ARGS],
      headless: true,
      javaScriptEnabled: false,
      viewport: { width: 720, height: 600 },
    });
    try {
      const page = await context.newPage();
      const response = await page.goto(`${baseUrl()}/embed/g/LmpSaltRd01`);
      expect(response?.status()).toBe(200);
      const svg = page.locator(".tx-bucket[data-w='720'] svg.tx-score");
      await svg.waitFor({ state: "visible" });
      const box = await svg.boundingBox();
      expect(box!.width).toBeGreaterThan(600);
      expect(box!.height).toBeGreaterThan(150);
      // Music symbols are there as Bravura text (noteheads, clef, time signature), drawn by the server.
      expect(await svg.locator("text").count()).toBeGreaterThan(20);
      await expect.poll(() => page.evaluate(() => document.fonts.check("30pt Bravura"))).toBe(true);
      const note = page.locator(".tx-controls .tx-noscript");
      expect(await note.textContent()).toContain("Playback needs JavaScript");
      expect((await note.boundingBox())?.width).toBeGreaterThan(100);
      expect(await page.locator("[data-tx-play]").boundingBox()).toBeNull(); // no button that cannot work
      expect(await page.locator("h1.tx-title").textContent()).toBe("Salt Road");
    } finally {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    }
  });

  it("prints on one page, a long groove included", async () => {
    const longVersion = await longGroove(24);
    for (const path of ["/embed/v/LmpHarbour1v1", `/embed/v/${longVersion}`, "/embed/g/LmpUndertB1?theme=dark"]) {
      const { page, errors } = await openPage(browser, path);
      await page.evaluate(() => document.fonts.ready);
      await page.emulateMedia({ media: "print" });
      // The printed drawing is the 720 one, black on white.
      expect(await visibleBucket(page).then((b) => b.width)).toBe(720);
      expect(await page.evaluate(() => getComputedStyle(document.body).backgroundColor)).toBe("rgb(255, 255, 255)");
      expect(await page.locator("[data-tx-play]").isVisible()).toBe(false);
      const pdf = await page.pdf({ format: "A4", printBackground: true });
      expect(pdfPages(pdf), path).toBe(1);
      expect(errors).toEqual([]);
      await page.close();
    }
  });

  it("re-wraps bars at phone width instead of shrinking them, in light and dark", async () => {
    const url = "/embed/v/LmpHarbour1v1";
    const wide = await openPage(browser, url, { viewport: { width: 1280, height: 800 } });
    const phone = await openPage(browser, url, { viewport: { width: 360, height: 800 }, colorScheme: "dark" });
    const w = await visibleBucket(wide.page);
    const p = await visibleBucket(phone.page);
    expect(w.width).toBe(1280);
    expect(p.width).toBe(360);
    expect(p.systems).toBeGreaterThan(w.systems); // more lines, not smaller print
    // A staff line space stays readable: the phone drawing is at least 0.6 of the wide one's scale.
    const scale = (page: Page) => page.evaluate(() => {
      const b = [...document.querySelectorAll<HTMLElement>(".tx-bucket")].find((x) => getComputedStyle(x).display !== "none")!;
      const svg = b.querySelector("svg")!;
      return svg.getBoundingClientRect().width / svg.viewBox.baseVal.width;
    });
    expect(await scale(phone.page)).toBeGreaterThan(0.6);
    // The phone page's height is what the oEmbed answer gives for a 360-pixel frame.
    const o = await oembedFor(`${baseUrl()}${url}`, 360);
    const phoneHeight = await phone.page.evaluate(() => Math.ceil(document.body.getBoundingClientRect().height));
    expect(Math.abs(phoneHeight - o.height)).toBeLessThan(8);
    // Dark: night background and light ink (the SVG draws in currentColor).
    expect(await phone.page.evaluate(() => getComputedStyle(document.body).backgroundColor)).toBe("rgb(23, 30, 41)");
    expect(await phone.page.evaluate(() => getComputedStyle(document.querySelector(".tx-notation")!).color)).toBe("rgb(235, 230, 220)");
    expect(await wide.page.evaluate(() => getComputedStyle(document.body).backgroundColor)).toBe("rgb(255, 253, 248)");
    expect([...wide.errors, ...phone.errors]).toEqual([]);
    await wide.page.close();
    await phone.page.close();
  });

  it("does not shift the layout when the island wakes up or play is pressed", async () => {
    const page = await browser.context.newPage();
    await page.addInitScript(() => {
      const w = window as unknown as { __shifts: number };
      w.__shifts = 0;
      new PerformanceObserver((list) => {
        for (const e of list.getEntries() as unknown as { value: number; hadRecentInput: boolean }[]) if (!e.hadRecentInput) w.__shifts += e.value;
      }).observe({ type: "layout-shift", buffered: true });
    });
    await page.goto(`${baseUrl()}/embed/v/LmpWaltz003v1`, { waitUntil: "load" });
    await page.evaluate(() => document.fonts.ready);
    await page.waitForTimeout(300);
    const box = await page.locator("[data-tx-play]").boundingBox();
    await page.locator("[data-tx-play]").click();
    await page.locator(".tx-playhead:not([hidden])").first().waitFor({ state: "attached", timeout: 15_000 });
    expect(await page.locator("[data-tx-play]").boundingBox()).toEqual(box);
    expect(await page.evaluate(() => (window as unknown as { __shifts: number }).__shifts)).toBe(0);
    await page.locator("[data-tx-play]").click();
    await page.close();
  });
});

describe("the compare page in chromium", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("says the demo's two readings of Undertow sound the same, with the start offset", async () => {
    const [a, b] = UNDERTOW_PAIR;
    const { page, status, errors } = await openPage(browser, `/compare?a=${b}&b=${a}`);
    expect(status).toBe(200);
    const verdict = page.getByTestId("verdict");
    expect(await verdict.getAttribute("data-verdict")).toBe("offset");
    const text = (await verdict.textContent()) ?? "";
    expect(text).toContain("These two readings sound the same");
    // The demo's worked example (src/lib/demo/grooves.ts): B is A at double tempo displaced by an eighth; read from
    // the 152 bpm side, the 76 bpm reading is one eighth note earlier: (1/8) × 240/152 s = 197.4 ms.
    expect(text).toMatch(/start offset one eighth note = 197 ms/);
    const matched = /(\d+) onsets match/.exec(text)?.[1];
    // Every sounding event of the 76 bpm reading (demo data): 8 hi-hats + 5 snares + 4 kicks + 12 chord notes.
    expect(Number(matched)).toBe(8 + 5 + 4 + 12);
    // Both readings drawn, both columns of figures filled.
    expect(await page.locator(".tx-notation").count()).toBe(2);
    const table = page.getByTestId("figures");
    expect(await table.locator("tbody tr").count()).toBeGreaterThan(6);
    expect(await table.locator("tbody tr").first().textContent()).toMatch(/152 bpm[\s\S]*76 bpm/);
    expect(await table.locator(".tx-easier").count()).toBeGreaterThan(0);

    // One playhead over both readings: play B (the 76 bpm one) and both drawings show a playhead.
    await page.getByLabel("Play B").check();
    await page.locator("[data-tx-play]").click();
    for (const k of [0, 1]) await page.locator(`.tx-notation[data-reading="${k}"] .tx-playhead:not([hidden])`).first().waitFor({ state: "attached", timeout: 15_000 });
    await page.locator("[data-tx-play]").click();
    expect(errors).toEqual([]);
  });

  it("lists the first differences of two readings that do not sound the same", async () => {
    const { page, status, errors } = await openPage(browser, `/compare?a=LmpUndertA1&b=LmpHarbour1`);
    expect(status).toBe(200);
    const verdict = page.getByTestId("verdict");
    expect(await verdict.getAttribute("data-verdict")).toBe("different");
    expect(await verdict.textContent()).toContain("do not sound the same");
    // Demo data: "Harbour Lights" (B) starts with kick, hi-hat and an A minor chord on beat 1; the Undertow reading
    // (A) has nothing on beat 1 and its snare on the "e" of 1.
    const items = await page.getByTestId("differences").locator("li").allTextContents();
    expect(items).toContain("bar 1, beat 1: kick, only in B");
    expect(items).toContain("bar 1, beat 1: hi-hat, only in B");
    expect(items).toContain("bar 1, beat 1 e: snare, only in A");
    expect(items.length).toBeLessThanOrEqual(10);
    expect(errors).toEqual([]);
  });

  it("answers 404 with a clear message when a reading cannot be opened, and embeds comparisons of shared grooves", async () => {
    const { page, status } = await openPage(browser, `/compare?a=LmpUndertA1&b=nothing-here`);
    expect(status).toBe(404);
    expect(await page.getByTestId("compare-missing").textContent()).toContain("Reading B cannot be opened");
    const embed = await openPage(browser, `/embed/compare?a=LmpUndertA1v1&b=LmpUndertB1v1`);
    expect(embed.status).toBe(200);
    expect(await embed.page.getByTestId("verdict").getAttribute("data-verdict")).toBe("offset");
    expect(embed.errors).toEqual([]);
  });
});

describe("the share dialog in chromium", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("builds the embed code from the chosen width and options and copies it with a confirmation", async () => {
    await browser.context.grantPermissions(["clipboard-read", "clipboard-write"], { origin: baseUrl() });
    const { page, errors } = await openPage(browser, "/grooves/LmpHarbour1");
    await page.locator("astro-island:not([ssr]) [data-testid=share-open]").click();
    const dialog = page.getByTestId("share-dialog");
    expect(await dialog.isVisible()).toBe(true);
    await page.getByTestId("embed-width").fill("480");
    await page.getByTestId("embed-keys").uncheck();
    await page.getByTestId("embed-start-bar").fill("2");
    const snippet = page.getByTestId("embed-snippet");
    await expect.poll(() => snippet.inputValue()).toContain('width="480"');
    const code = await snippet.inputValue();
    expect(code).toContain(`src="${baseUrl()}/embed/g/LmpHarbour1?keys=0&amp;bar=2"`);
    expect(code).not.toMatch(/autoplay/i);
    // The height is the oEmbed height for that width and those options.
    const o = await oembedFor(`${baseUrl()}/embed/g/LmpHarbour1?keys=0&bar=2`, 480);
    expect(code).toContain(`height="${o.height}"`);
    await page.getByTestId("copy-snippet").click();
    await expect.poll(() => page.getByTestId("share-status").textContent()).toBe("Embed code copied to the clipboard.");
    expect(await page.getByTestId("copy-snippet").textContent()).toBe("Copied");
    expect(await page.evaluate(() => navigator.clipboard.readText())).toBe(code);
    await page.getByTestId("copy-link").click();
    expect(await page.evaluate(() => navigator.clipboard.readText())).toBe(`${baseUrl()}/grooves/LmpHarbour1`);
    expect(errors).toEqual([]);
  });

  it("offers nothing to embed for a private groove, and says why", async () => {
    const owner = await createUser({ label: "sharer" });
    const id = uid(12);
    const vid = uid(16);
    const doc: GrooveDocument = demo("LmpSaltRd01");
    await db().query("insert into grooves (id, owner_id, title, visibility) values ($1, $2, 'Private sketch', 'private')", [id, owner.id]);
    await db().query("insert into groove_versions (id, groove_id, number, document, content_hash, author_id) values ($1, $2, 1, $3, $4, $5)", [vid, id, JSON.stringify(doc), contentHash(doc), owner.id]);
    await db().query("update grooves set latest_version_id = $1 where id = $2", [vid, id]);
    const token = await sessionFor(owner.id);
    await browser.context.addCookies([{ name: "tactus_session", value: token, url: baseUrl() }]);
    const mine = await openPage(browser, `/grooves/${id}`);
    await mine.page.locator("astro-island:not([ssr]) [data-testid=share-open]").click();
    expect(await mine.page.getByTestId("share-private").textContent()).toContain("cannot be embedded");
    expect(await mine.page.getByTestId("embed-snippet").count()).toBe(0);
    expect(mine.errors).toEqual([]);
    await closeDb();
  });
});
