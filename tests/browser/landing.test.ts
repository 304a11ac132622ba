// The landing page in Debian's chromium (playwright-core), against the built test server.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launchBrowser, openPage, type Browser } from "./helpers";

describe("landing page in chromium", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("shows its heading and the demo step grid with no console errors", async () => {
    const { page, status, errors } = await openPage(browser, "/");
    expect(status).toBe(200);
    const heading = page.getByRole("heading", { level: 1 });
    expect(await heading.isVisible()).toBe(true);
    expect(await heading.textContent()).toMatch(/Write grooves down/);
    // The demo groove is drawn on the server as an SVG picture with an accessible name.
    const picture = page.getByRole("img", { name: /Harbour Lights at Four/ });
    expect(await picture.isVisible()).toBe(true);
    // The fonts come from the app itself (@fontsource files), and they load.
    await page.evaluate(() => document.fonts.ready);
    expect(await page.evaluate(() => document.fonts.check('16px "IBM Plex Sans"'))).toBe(true);
    expect(await page.evaluate(() => document.fonts.check('12px "JetBrains Mono"'))).toBe(true);
    await page.close();
    expect(errors).toEqual([]);
  });

  it("follows the system colour scheme", async () => {
    const light = await openPage(browser, "/", { colorScheme: "light" });
    const dark = await openPage(browser, "/", { colorScheme: "dark" });
    const background = (p: typeof light.page) => p.evaluate(() => getComputedStyle(document.body).backgroundColor);
    const [lightBg, darkBg] = [await background(light.page), await background(dark.page)];
    expect(lightBg).not.toBe(darkBg);
    // Dark mode has a dark background: the sum of its RGB channels is low.
    const sum = (rgb: string) => (rgb.match(/\d+/g) ?? []).slice(0, 3).reduce((a, b) => a + Number(b), 0);
    expect(sum(darkBg)).toBeLessThan(sum(lightBg));
    expect(sum(darkBg)).toBeLessThan(150);
    await light.page.close();
    await dark.page.close();
    expect([...light.errors, ...dark.errors]).toEqual([]);
  });

  it("fits a phone screen without sideways scrolling of the page", async () => {
    const { page, errors } = await openPage(browser, "/", { viewport: { width: 375, height: 740 } });
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    expect(await page.getByRole("navigation", { name: "Main" }).isVisible()).toBe(true);
    await page.close();
    expect(errors).toEqual([]);
  });
});
