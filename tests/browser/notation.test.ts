// Live notation in the editor, in Debian's chromium against the built test server: the SVG appears with the
// app's own Bravura and Academico, draws exactly what the server draws for the same groove (the server measures
// text from the same font files), follows an edit, and follows the light or dark theme.
import { createRequire } from "node:module";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { baseUrl, launchBrowser, openPage, type Browser } from "./helpers";
import { DEMO_GROOVES } from "../../src/lib/demo/grooves";
import { assertGroove, type GrooveDocument } from "../../src/lib/rhythm/document";
import { spellGroove } from "../../src/lib/rhythm/notation/spell";
import { renderScoreOnServer } from "../../src/adapters/vexflow/server";
import { inkOf } from "../unit/notation-render/svg";

const require = createRequire(import.meta.url);
const { JSDOM } = require("jsdom") as { JSDOM: new (xml: string, opts: { contentType: string }) => { window: Window } };

/** Open the editor with `doc` as the browser's scratch draft, and wait for its notation. */
async function editorWith(browser: Browser, doc: GrooveDocument, options: Parameters<typeof openPage>[2] = {}) {
  const opened = await openPage(browser, "/grooves/new", options);
  await opened.page.evaluate(
    (d) => localStorage.setItem("tactus:draft:scratch", JSON.stringify({ v: 1, grooveId: null, baseVersionId: null, doc: d, savedAt: Date.now() })),
    doc,
  );
  await opened.page.reload();
  await opened.page.locator("astro-island:not([ssr]) [data-editor]").waitFor();
  await opened.page.waitForFunction((n) => document.querySelectorAll(".tx-notation-canvas g.tx-bar").length === n, doc.bars);
  return opened;
}

/**
 * The drawing's bar and tie groups (each bar is its own small <svg> in the browser), in bar order, and the
 * width it was drawn at. With `serverSvg`, the same groups read from the server's single SVG instead.
 */
const groupsOf = (page: Page, serverSvg?: string) =>
  page.evaluate((svg) => {
    const root = svg ? new DOMParser().parseFromString(svg, "image/svg+xml") : document;
    const bars = [...root.querySelectorAll("g.tx-bar")].sort((a, b) => Number(a.getAttribute("data-bar")) - Number(b.getAttribute("data-bar")));
    const ties = [...root.querySelectorAll("g.tx-ties")];
    const canvas = document.querySelector<HTMLElement>(".tx-notation-canvas")!;
    const xml = new XMLSerializer();
    return { groups: [...bars, ...ties].map((g) => xml.serializeToString(g)), width: parseFloat(canvas.style.width) };
  }, serverSvg ?? null);

/**
 * What the groups draw, element by element (inkOf: the page leaves out VexFlow's wrapper groups, the server
 * keeps them), as the numbers and the text between them.
 */
function parts(groups: string[]): { shape: string; numbers: number[] } {
  const ink = groups.flatMap((g) => inkOf(new JSDOM(g, { contentType: "image/svg+xml" }).window.document.documentElement)).join("\n");
  return { shape: ink.replace(/-?\d+(?:\.\d+)?/g, "#"), numbers: (ink.match(/-?\d+(?:\.\d+)?/g) ?? []).map(Number) };
}

describe("notation in chromium", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  const harbour = assertGroove(DEMO_GROOVES.find((g) => g.id === "LmpHarbour1")!.document);

  it("shows the editor's notation with the app's own music fonts and no console errors", async () => {
    const { page, errors } = await editorWith(browser, harbour);
    const drawing = page.getByRole("img", { name: "Notation: 4/4, 96 bpm, 2 bars, drum kit and keys" });
    expect(await drawing.isVisible()).toBe(true);
    expect(await drawing.locator("svg.tx-score-bar").count()).toBe(2);
    expect(await page.evaluate(() => document.fonts.check("30pt Bravura"))).toBe(true);
    expect(await page.evaluate(() => document.fonts.check("10pt Academico"))).toBe(true);
    // The font files come from this server, not from elsewhere.
    const fontUrls = await page.evaluate(() => performance.getEntriesByType("resource").map((e) => e.name).filter((n) => /bravura|academico/i.test(n)));
    expect(fontUrls.some((u) => /bravura.*\.woff2/.test(u))).toBe(true);
    expect(fontUrls.every((u) => u.startsWith(new URL(baseUrl()).origin))).toBe(true);
    await page.close();
    expect(errors).toEqual([]);
  });

  it("draws what the server draws for the same groove and width (to 0.05 px)", async () => {
    for (const demo of DEMO_GROOVES) {
      const doc = assertGroove(demo.document);
      const { page, errors } = await editorWith(browser, doc);
      const drawn = await groupsOf(page);
      const server = await groupsOf(page, renderScoreOnServer(spellGroove(doc), { width: drawn.width }).svg);
      await page.close();
      expect(errors).toEqual([]);
      const browserSide = parts(drawn.groups);
      const serverSide = parts(server.groups);
      expect(browserSide.shape, demo.title).toBe(serverSide.shape);
      const worst = Math.max(...browserSide.numbers.map((n, i) => Math.abs(n - serverSide.numbers[i]!)));
      expect(worst, demo.title).toBeLessThan(0.05);
    }
  }, 120_000);

  it("follows an edit: a click on the grid adds the note to the notation", async () => {
    const { page, errors } = await editorWith(browser, harbour);
    // Noteheads and rests, glyph by glyph (the page draws a bar's glyphs of one kind as one text).
    const heads = () =>
      page.evaluate(() => [...document.querySelectorAll(".tx-notation-canvas text.vf-notehead")].reduce((n, t) => n + (t.textContent?.length ?? 0), 0));
    const before = await heads();
    // Add a hit on an empty step of the snare row (bar 1, beat 1 "a": column 3).
    const snare = page.locator('[data-kcell][aria-label^="Snare, bar 1, beat 1 a:"]');
    expect(await snare.getAttribute("aria-label")).toMatch(/: empty$/);
    await snare.click();
    await page.waitForFunction(
      (n) => [...document.querySelectorAll(".tx-notation-canvas text.vf-notehead")].reduce((k, t) => k + (t.textContent?.length ?? 0), 0) > n,
      before,
    );
    expect(await heads()).toBe(before + 1);
    await page.close();
    expect(errors).toEqual([]);
  });

  it("draws in the page's text colour, light or dark", async () => {
    const colour = async (scheme: "light" | "dark") => {
      const { page, errors } = await editorWith(browser, harbour, { colorScheme: scheme });
      const c = await page.evaluate(() => {
        const svg = document.querySelector("svg.tx-score-bar")!;
        const path = svg.querySelector("path.vf-stave")!;
        return { svg: getComputedStyle(svg).color, stroke: getComputedStyle(path).stroke, body: getComputedStyle(document.body).color };
      });
      await page.close();
      expect(errors).toEqual([]);
      return c;
    };
    const light = await colour("light");
    const dark = await colour("dark");
    expect(light.stroke).toBe(light.svg);
    expect(dark.stroke).toBe(dark.svg);
    expect(light.svg).not.toBe(dark.svg);
  });
});
