// The printable chart in Debian's chromium: title, tempo, meter, credits and the notation render; the page prints
// to PDF at A4 (ISO 216: 210 × 297 mm = 595.3 × 841.9 pt) and US Letter (8.5 × 11 in = 612 × 792 pt) as the
// @page rule asks; a long chart runs over several pages without cutting a system; page numbers are set in the
// bottom margin (CSS Paged Media: @page margin boxes with counter(page) and counter(pages)).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { api, closeDb, createGroove, createUser, sessionFor, uid, type TestUser } from "../server/helpers";
import { baseUrl, launchBrowser, openPage, type Browser } from "./helpers";

let browser: Browser;
let owner: TestUser;
let cookie: string;

/** Pages of a PDF and the size of the first, in points. */
function pdfInfo(pdf: Buffer): { pages: number; width: number; height: number } {
  const text = pdf.toString("latin1");
  const box = /\/MediaBox\s*\[\s*0\s+0\s+([\d.]+)\s+([\d.]+)\s*\]/.exec(text);
  return { pages: (text.match(/\/Type\s*\/Page\b/g) ?? []).length, width: Number(box?.[1]), height: Number(box?.[2]) };
}

beforeAll(async () => {
  browser = await launchBrowser();
  owner = await createUser({ label: "printer" });
  cookie = await sessionFor(owner.id);
  const url = new URL(baseUrl());
  await browser.context.addCookies([{ name: "tactus_session", value: cookie, domain: url.hostname, path: "/", httpOnly: true, sameSite: "Lax" }]);
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

describe("printable chart", () => {
  it("shows the title, tempo, meter, credits and the notation (a public demo groove)", async () => {
    const { page, status, errors } = await openPage(browser, "/grooves/LmpSaltRd01/print?composer=The%20Lamplight%20Ferry&transcriber=Ines%20Varga");
    expect(status).toBe(200);
    expect(await page.getByTestId("chart-title").textContent()).toBe("Salt Road");
    expect(await page.getByTestId("chart-tempo").textContent()).toMatch(/58 bpm \(dotted quarter note\)/);
    expect(await page.getByTestId("chart-meter").textContent()).toMatch(/6\/8/);
    const credits = await page.getByTestId("chart-credits").textContent();
    expect(credits).toContain("The Lamplight Ferry");
    expect(credits).toContain("Ines Varga");
    // The notation: server-drawn systems with music glyphs, drawn in the Bravura font once it has loaded.
    const systems = page.locator("[data-testid=chart-music] .system svg");
    expect(await systems.count()).toBeGreaterThanOrEqual(1);
    expect(await page.locator("[data-testid=chart-music] svg g.tx-system text").count()).toBeGreaterThan(5);
    await page.evaluate(() => document.fonts.ready);
    expect(await page.evaluate(() => document.fonts.check("30pt Bravura"))).toBe(true);
    const box = await systems.first().boundingBox();
    expect(box!.width).toBeGreaterThan(600);
    expect(box!.height).toBeGreaterThan(60);
    expect(errors).toEqual([]);
  });

  it("the credits form fills the header; the print button opens the print dialog", async () => {
    const { page } = await openPage(browser, "/grooves/LmpHarbour1/print");
    await page.getByLabel("Arranged by").fill("Marta Olsen");
    await page.getByRole("button", { name: "Update the chart" }).click();
    await page.waitForURL(/arranger=Marta/);
    expect(await page.getByTestId("chart-credits").textContent()).toContain("Marta Olsen");
    await page.evaluate(() => {
      (window as unknown as { printed: number }).printed = 0;
      window.print = () => void ((window as unknown as { printed: number }).printed += 1);
    });
    await page.getByRole("button", { name: "Print or save as PDF" }).click();
    expect(await page.evaluate(() => (window as unknown as { printed: number }).printed)).toBe(1);
  });

  it("prints to PDF on A4 and on Letter, as the @page rule asks", async () => {
    for (const [paper, w, h] of [["a4", 595.3, 841.9], ["letter", 612, 792]] as const) {
      const { page } = await openPage(browser, `/grooves/LmpHarbour1/print?paper=${paper}`);
      await page.evaluate(() => document.fonts.ready);
      const pdf = await page.pdf({ preferCSSPageSize: true, printBackground: true });
      expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
      const info = pdfInfo(pdf);
      expect(Math.abs(info.width - w), `${paper} width ${info.width}`).toBeLessThan(2);
      expect(Math.abs(info.height - h), `${paper} height ${info.height}`).toBeLessThan(2);
      expect(info.pages).toBe(1);
      // On paper the screen controls are gone and the chart fills the page.
      await page.emulateMedia({ media: "print" });
      expect(await page.getByTestId("print-controls").isVisible()).toBe(false);
      await page.close();
    }
  });

  it("a long chart runs over numbered pages without cutting a system", async () => {
    const lanes = [
      { piece: "hihat-closed", hits: Array.from({ length: 64 * 8 }, (_, i) => ({ at: `${i}/8` })) },
      { piece: "snare", hits: Array.from({ length: 64 * 2 }, (_, i) => ({ at: `${2 * i + 1}/4` })) },
      { piece: "kick", hits: Array.from({ length: 64 * 2 }, (_, i) => ({ at: `${i}/2` })) },
    ];
    const doc = { schemaVersion: 1, meter: { beatsPerBar: 4, beatUnit: 4 }, tempo: { bpm: "100", beatNote: "1/4" }, grid: { step: "1/16" }, bars: 64, sections: [], kit: { lanes }, keys: { notes: [], splitPitch: 60 } };
    const created = await api("POST", "/api/grooves", { cookie, body: { title: `Long chart ${uid(4)}`, document: doc } });
    expect(created.status).toBe(201);
    const { page, errors } = await openPage(browser, `/grooves/${created.body.id}/print`);
    expect(await page.locator("[data-testid=chart-music] .system").count()).toBeGreaterThanOrEqual(16);
    await page.emulateMedia({ media: "print" });
    const avoid = await page.locator("[data-testid=chart-music] .system").first().evaluate((el) => getComputedStyle(el).breakInside);
    expect(avoid).toBe("avoid");
    const pdf = await page.pdf({ preferCSSPageSize: true });
    expect(pdfInfo(pdf).pages).toBeGreaterThanOrEqual(2);
    // Page numbers: the page's @page rule puts "Page n of N" in the bottom margin.
    const pageRule = await page.evaluate(() =>
      [...document.styleSheets].flatMap((s) => [...s.cssRules]).find((r) => r instanceof CSSPageRule)?.cssText ?? "",
    );
    expect(pageRule).toMatch(/size:\s*a4/i);
    expect(pageRule).toMatch(/@bottom-center\s*\{[^}]*content:\s*"Page " counter\(page\) " of " counter\(pages\)/);
    expect(errors).toEqual([]);
  });

  it("a private groove's chart is not found for other people", async () => {
    const g = await createGroove(owner.id, { title: "Private chart" });
    const res = await fetch(new URL(`/grooves/${g.grooveId}/print`, baseUrl()));
    expect(res.status).toBe(404);
    const mine = await fetch(new URL(`/grooves/${g.grooveId}/print`, baseUrl()), { headers: { cookie: `tactus_session=${cookie}` } });
    expect(mine.status).toBe(200);
  });
});
