// Download buttons and the MIDI import dialog in Debian's chromium, against the built test server: the groove page
// links every format of the version shown and its printable chart; the library has a download menu per groove and
// an import dialog that reminds users to import only files they may use, shows the report, asks for the tempo the
// file does not give, lets an unknown percussion key become a kit piece, and creates the groove.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { api, closeDb, createGroove, createUser, sessionFor, type TestUser } from "../server/helpers";
import { buildSmf } from "../unit/exchange/smf-reader";
import { baseUrl, launchBrowser, openPage, type Browser } from "./helpers";

let browser: Browser;
let user: TestUser;
let cookie: string;

async function hydrated(page: Page) {
  await page.waitForFunction(() => document.querySelectorAll("astro-island[ssr]").length === 0);
}

beforeAll(async () => {
  browser = await launchBrowser();
  user = await createUser({ label: "importer" });
  cookie = await sessionFor(user.id);
  const url = new URL(baseUrl());
  await browser.context.addCookies([{ name: "tactus_session", value: cookie, domain: url.hostname, path: "/", httpOnly: true, sameSite: "Lax" }]);
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

describe("download buttons", () => {
  it("the groove page links every format of the version shown, and the chart", async () => {
    const { page, errors } = await openPage(browser, "/grooves/LmpSaltRd01");
    const links = page.getByTestId("download-links");
    expect((await links.locator("a[download]").allTextContents()).map((t) => t.trim())).toEqual(["MIDI", "MusicXML", "SVG", "PNG"]);
    const midi = await links.locator("a[data-format=mid]").getAttribute("href");
    expect(midi).toMatch(/^\/api\/grooves\/LmpSaltRd01\/export\/mid\?version=/);
    const res = await page.request.get(new URL(midi!, baseUrl()).href);
    expect(res.status()).toBe(200);
    expect(res.headers()["content-disposition"]).toMatch(/filename="salt-road-v1\.mid"/);
    expect((await res.body()).subarray(0, 4).toString("latin1")).toBe("MThd");
    await links.getByRole("link", { name: "Print chart" }).click();
    await page.waitForURL(/\/grooves\/LmpSaltRd01\/print/);
    expect(await page.getByTestId("chart-title").textContent()).toBe("Salt Road");
    expect(errors).toEqual([]);
  });

  it("the library has a download menu for each groove", async () => {
    const g = await createGroove(user.id, { title: "Menu check" });
    const { page, errors } = await openPage(browser, "/library?scope=mine");
    await hydrated(page);
    await page.getByRole("button", { name: "Download Menu check" }).click();
    const hrefs = await page.locator(`#dl-${g.grooveId} a`).evaluateAll((as) => as.map((a) => a.getAttribute("href")));
    expect(hrefs).toEqual([
      `/api/grooves/${g.grooveId}/export/mid`,
      `/api/grooves/${g.grooveId}/export/musicxml`,
      `/api/grooves/${g.grooveId}/export/svg`,
      `/api/grooves/${g.grooveId}/export/png`,
      `/grooves/${g.grooveId}/print`,
    ]);
    await page.keyboard.press("Escape");
    expect(await page.locator(`#dl-${g.grooveId}`).count()).toBe(0);
    expect(errors).toEqual([]);
  });
});

describe("MIDI import dialog", () => {
  it("reminds, reports, asks for the tempo, maps an unknown key, and creates the groove", async () => {
    // No tempo event; kick, snare and claves (GM 75, no kit piece) on channel 10; one snare 30 ticks late.
    const ev = (delta: number, status: number, key: number, vel: number) => [...(delta < 128 ? [delta] : [0x80 | (delta >> 7), delta & 127]), status, key, vel];
    const track = [
      ...ev(0, 0x99, 36, 100), ...ev(60, 0x89, 36, 0),
      ...ev(450, 0x99, 38, 100), ...ev(60, 0x89, 38, 0), // snare 30 ticks after beat 2
      ...ev(390, 0x99, 75, 90), ...ev(60, 0x89, 75, 0),
      0x00, 0xff, 0x2f, 0x00,
    ];
    const file = Buffer.from(buildSmf(0, 480, [track]));
    const { page, errors } = await openPage(browser, "/library?scope=mine");
    await hydrated(page);
    await page.getByRole("button", { name: "Import MIDI" }).click();
    const dialog = page.getByRole("dialog", { name: "Import a MIDI file" });
    expect(await dialog.getByTestId("import-rights").textContent()).toMatch(/Import only files you may use/);
    await dialog.locator("input[type=file]").setInputFiles({ name: "rehearsal take.mid", mimeType: "audio/midi", buffer: file });
    const report = dialog.getByTestId("import-report");
    await report.waitFor();
    expect(await report.textContent()).toMatch(/does not say its tempo or meter/);
    expect(await dialog.getByTestId("import-moves").textContent()).toMatch(/1 note moved/);
    expect(await dialog.getByTestId("import-unknown").textContent()).toMatch(/Claves \(75\), 1 stroke/);

    await dialog.getByLabel("Tempo (bpm)").fill("84");
    await dialog.getByLabel("Meter").fill("4/4");
    await dialog.getByRole("button", { name: "Use these" }).click();
    await expect.poll(() => report.textContent()).toMatch(/84 bpm/);
    await dialog.getByLabel("Kit piece for Claves (75)").selectOption("cowbell");
    await expect.poll(async () => (await dialog.getByTestId("import-report").textContent()) ?? "").toMatch(/Notes3 of 3/);
    expect(await dialog.getByLabel("Title of the new groove").inputValue()).toBe("rehearsal take");
    await dialog.getByLabel("Title of the new groove").fill("Rehearsal take, imported");
    await dialog.getByRole("button", { name: "Create the groove and open it" }).click();
    await page.waitForURL(/\/grooves\/[A-Za-z0-9_-]+\/edit/);
    const id = /\/grooves\/([A-Za-z0-9_-]+)\/edit/.exec(page.url())![1]!;
    const g = await api("GET", `/api/grooves/${id}`, { cookie });
    expect(g.body.title).toBe("Rehearsal take, imported");
    const v = await api("GET", `/api/grooves/${id}/versions/${g.body.latestVersion.id}`, { cookie });
    expect(v.body.message).toBe("Imported from rehearsal take.mid");
    expect(v.body.document.tempo.bpm).toBe("84");
    expect(v.body.document.kit.lanes.map((l: { piece: string }) => l.piece).sort()).toEqual(["cowbell", "kick", "snare"]);
    expect(errors).toEqual([]);
  });

  it("shows the server's refusal for a file that is not MIDI", async () => {
    const { page } = await openPage(browser, "/library?scope=mine");
    await hydrated(page);
    await page.getByRole("button", { name: "Import MIDI" }).click();
    const dialog = page.getByRole("dialog", { name: "Import a MIDI file" });
    await dialog.locator("input[type=file]").setInputFiles({ name: "notes.mid", mimeType: "audio/midi", buffer: Buffer.from("these are notes, in words") });
    await expect.poll(async () => (await dialog.getByRole("alert").textContent()) ?? "").toMatch(/not a MIDI file/);
  });
});
