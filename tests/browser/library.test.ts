// The library and a groove's page in Debian's chromium against the built test server: the TanStack table (loading,
// sort by a column header, search, tag filter, pages, empty state), creating a groove with the form, the version
// history (open an old version read-only, restore it as a new version), details, invitations and the trash.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { closeDb, createGroove, createUser, db, sessionFor, uid, type TestUser } from "../server/helpers";
import { baseUrl, launchBrowser, openPage, type Browser } from "./helpers";

async function hydrated(page: Page) {
  await page.waitForFunction(() => document.querySelectorAll("astro-island[ssr]").length === 0);
}
const titles = (page: Page) => page.locator("tbody tr td:first-child a").allTextContents();

let browser: Browser;
let user: TestUser;
const tag = `t${uid(6).toLowerCase()}`;

beforeAll(async () => {
  browser = await launchBrowser();
  user = await createUser({ label: "shelf" });
  const names = ["Quayside shuffle", "Anchor chain", "Moorings", "Lantern waltz", "Night ferry", "Bilge pump funk"];
  for (const [i, title] of names.entries()) await createGroove(user.id, { title, tags: i % 2 ? [tag] : [], visibility: "private" });
  const url = new URL(baseUrl());
  await browser.context.addCookies([{ name: "tactus_session", value: await sessionFor(user.id), domain: url.hostname, path: "/", httpOnly: true, secure: true, sameSite: "Lax" }]);
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

describe("library in chromium", () => {
  it("sorts by a column, searches, filters by tag, pages, and shows an empty state", async () => {
    const { page, errors } = await openPage(browser, "/library?scope=mine");
    await hydrated(page);
    await expect.poll(() => titles(page)).toHaveLength(6);
    await page.getByRole("button", { name: /^Title/ }).click();
    await expect.poll(() => titles(page)).toEqual(["Anchor chain", "Bilge pump funk", "Lantern waltz", "Moorings", "Night ferry", "Quayside shuffle"]);
    expect(await page.locator("th", { hasText: "Title" }).getAttribute("aria-sort")).toBe("ascending");
    await page.getByRole("button", { name: /^Title/ }).click();
    await expect.poll(() => titles(page).then((t) => t[0])).toBe("Quayside shuffle");
    expect(page.url()).toContain("sort=title");

    await page.getByPlaceholder("Search titles and descriptions").fill("ferry");
    await expect.poll(() => titles(page)).toEqual(["Night ferry"]);
    await page.getByPlaceholder("Search titles and descriptions").fill("");
    await expect.poll(() => titles(page)).toHaveLength(6);

    await page.getByRole("button", { name: tag, exact: true }).first().click();
    await expect.poll(() => titles(page)).toHaveLength(3);
    await page.getByRole("button", { name: `Remove filter tag: ${tag}` }).click();
    await expect.poll(() => titles(page)).toHaveLength(6);

    await page.getByPlaceholder("Search titles and descriptions").fill("no such groove anywhere");
    await expect.poll(() => page.getByTestId("library-empty").textContent()).toMatch(/No groove matches/);
    expect(errors).toEqual([]);
  });

  it("pages through a long list", async () => {
    const many = await createUser({ label: "hoarder" });
    for (let i = 0; i < 23; i++) await createGroove(many.id, { title: `Buoy ${String(i).padStart(2, "0")}` });
    const ctx = await launchBrowser();
    try {
      const url = new URL(baseUrl());
      await ctx.context.addCookies([{ name: "tactus_session", value: await sessionFor(many.id), domain: url.hostname, path: "/", httpOnly: true, secure: true, sameSite: "Lax" }]);
      const page = await ctx.context.newPage();
      await page.goto(`${baseUrl()}/library?scope=mine&sort=title&dir=asc`);
      await hydrated(page);
      await expect.poll(() => titles(page)).toHaveLength(20);
      expect(await page.getByRole("navigation", { name: "Pages" }).textContent()).toMatch(/Page 1 of 2/);
      await page.getByRole("button", { name: "Next" }).click();
      await expect.poll(() => titles(page)).toEqual(["Buoy 20", "Buoy 21", "Buoy 22"]);
    } finally {
      await ctx.close();
    }
  });

  it("creates a groove with the form and opens it in the editor", async () => {
    const { page } = await openPage(browser, "/library");
    await hydrated(page);
    await page.getByRole("button", { name: "New groove" }).click();
    await page.getByLabel("Title", { exact: true }).fill("Slipway stomp");
    await page.getByLabel("Tags").fill("Stomp, half time");
    await page.getByRole("button", { name: "Create and open" }).click();
    await page.waitForURL(/\/grooves\/[A-Za-z0-9_-]+\/edit$/);
    const id = new URL(page.url()).pathname.split("/")[2]!;
    const row = (await db().query("select title, tags, owner_id from grooves where id = $1", [id])).rows[0];
    expect(row).toEqual({ title: "Slipway stomp", tags: ["stomp", "half time"], owner_id: user.id });
  });

  it("opens an old version read-only, restores it as a new version, edits details, invites, and trashes", async () => {
    const g = await createGroove(user.id, { title: "Harbour bell" });
    const { page, errors } = await openPage(browser, `/grooves/${g.grooveId}`);
    await hydrated(page);
    expect(await page.getByTestId("groove-title").textContent()).toBe("Harbour bell");
    // The version is shown as notation drawn on the server (percussion clef glyph from Bravura: SMuFL U+E069,
    // "unpitchedPercussionClef1"), with a visible drawing for this width.
    const notation = page.getByTestId("version-notation");
    expect(await notation.locator("svg:visible").count()).toBe(1);
    expect(await notation.locator("svg:visible").innerHTML()).toContain("\uE069");
    const history = page.getByTestId("version-history");
    await expect.poll(() => history.locator("li").count()).toBe(2);
    await history.locator("li", { hasText: "v1" }).getByRole("link", { name: "Open" }).click();
    await page.waitForURL(/version=/);
    expect(await page.locator("#version-title").textContent()).toMatch(/Version 1 — read-only/);
    expect(await page.getByRole("link", { name: /Open in the editor/ }).count()).toBe(0);
    await hydrated(page);
    await page.getByTestId("version-history").locator("li", { hasText: "v1" }).getByRole("button", { name: "Restore as new version" }).click();
    await expect.poll(() => page.getByRole("status").first().textContent()).toMatch(/Version 1 is now version 3/);
    const v3 = (await db().query("select content_hash from groove_versions where groove_id = $1 and number = 3", [g.grooveId])).rows[0];
    const v1 = (await db().query("select content_hash from groove_versions where id = $1", [g.firstVersionId])).rows[0];
    expect(v3.content_hash).toBe(v1.content_hash);

    await page.goto(`${baseUrl()}/grooves/${g.grooveId}`);
    await hydrated(page);
    await page.getByLabel("Title", { exact: true }).fill("Harbour bell, reharmonised");
    await page.getByRole("button", { name: "Save details" }).click();
    await expect.poll(() => page.getByRole("status").first().textContent()).toMatch(/Saved/);
    expect((await db().query("select title from grooves where id = $1", [g.grooveId])).rows[0].title).toBe("Harbour bell, reharmonised");

    const guest = `guest-${uid(6).toLowerCase()}@lamplight-ferry.test`;
    await page.getByLabel("Invite by e-mail").fill(guest);
    await page.getByLabel("Role", { exact: true }).selectOption("editor");
    await page.getByRole("button", { name: "Invite" }).click();
    await expect.poll(() => page.getByText(`Invitation sent to ${guest}.`).count()).toBe(1);
    await expect.poll(() => page.getByText(`${guest} · editor`).count()).toBe(1);

    page.once("dialog", (d) => d.accept());
    await page.getByRole("button", { name: "Move to trash" }).click();
    await page.waitForURL(/scope=trash/);
    await hydrated(page);
    await expect.poll(() => titles(page)).toContain("Harbour bell, reharmonised");
    await page.locator("tr", { hasText: "Harbour bell, reharmonised" }).getByRole("button", { name: "Restore" }).click();
    await expect.poll(() => titles(page)).not.toContain("Harbour bell, reharmonised");
    expect((await db().query("select deleted_at from grooves where id = $1", [g.grooveId])).rows[0].deleted_at).toBeNull();
    expect(errors, errors.join("\n")).toEqual([]);
  });
});
