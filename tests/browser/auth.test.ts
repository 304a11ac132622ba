// Accounts in Debian's chromium against the built test server: sign up through the form (field errors from the
// server shown beside the field), see the signed-in header, confirm the address from the development mailbox,
// sign out, fail and then succeed to sign in, reset the password by the mailed link, and the admin page.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { PASSWORD, closeDb, createUser, db, sessionFor, uid } from "../server/helpers";
import { baseUrl, launchBrowser, openPage, type Browser } from "./helpers";

/** Wait until every island on the page has hydrated (Astro drops the `ssr` attribute then). */
async function hydrated(page: Page) {
  await page.waitForFunction(() => document.querySelectorAll("astro-island[ssr]").length === 0);
}

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

describe("accounts in chromium", () => {
  it("signs up, confirms the address from the mailbox, signs out and in again", async () => {
    const email = `browser-${uid(8).toLowerCase()}@lamplight-ferry.test`;
    const { page, status, errors } = await openPage(browser, "/sign-up");
    expect(status).toBe(200);
    await hydrated(page);
    await page.getByLabel("Your name").fill("Rosa Tidewell");
    await page.getByLabel("E-mail address").fill(email);
    // A common password: the server refuses it and the message appears under the field.
    await page.getByLabel("Password").fill("password123");
    await page.getByRole("button", { name: "Create account" }).click();
    await expect.poll(() => page.locator("#password-error").textContent()).toMatch(/too common/);
    await page.getByLabel("Password").fill("tidewell keeps time");
    await page.getByRole("button", { name: "Create account" }).click();
    await page.waitForURL(/\/library/);
    await expect.poll(() => page.getByTestId("signed-in-as").textContent()).toBe("Rosa Tidewell");
    // The session cookie is HttpOnly: scripts cannot read it.
    expect(await page.evaluate(() => document.cookie)).not.toContain("tactus_session");
    // Not confirmed yet: the library says so and can send the link again.
    await hydrated(page);
    await page.getByRole("button", { name: "Send the link again" }).click();
    await expect.poll(() => page.getByText("Sent: check your inbox.").count()).toBe(1);

    await page.goto(`${baseUrl()}/dev/mailbox?to=${encodeURIComponent(email)}`);
    const link = page.locator('a[href*="/verify?token="]').first();
    await link.click();
    await hydrated(page);
    await page.getByRole("button", { name: "Confirm my address" }).click();
    await expect.poll(() => page.getByRole("status").textContent()).toMatch(/confirmed/);
    const verified = await db().query("select email_verified_at from users where email = $1", [email]);
    expect(verified.rows[0].email_verified_at).not.toBeNull();

    await page.goto(`${baseUrl()}/library`);
    await hydrated(page);
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL((u) => u.pathname === "/");
    await page.goto(`${baseUrl()}/sign-in?next=/library`);
    await hydrated(page);
    await page.getByLabel("E-mail address").fill(email);
    await page.getByLabel("Password").fill("not my password");
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect.poll(() => page.getByRole("alert").first().textContent()).toMatch(/wrong/);
    await page.getByLabel("Password").fill("tidewell keeps time");
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(/\/library/);
    await expect.poll(() => page.getByTestId("signed-in-as").textContent()).toBe("Rosa Tidewell");
    expect(errors.filter((e) => !/status of 40[01]/.test(e))).toEqual([]);
  });

  it("resets a forgotten password with the mailed link", async () => {
    const user = await createUser({ label: "forgetful" });
    const { page } = await openPage(browser, "/reset");
    await hydrated(page);
    await page.getByLabel("E-mail address of your account").fill(user.email);
    await page.getByRole("button", { name: "Send me a reset link" }).click();
    await expect.poll(() => page.getByRole("status").textContent()).toMatch(/on its way/);
    await page.goto(`${baseUrl()}/dev/mailbox?to=${encodeURIComponent(user.email)}`);
    await page.locator('a[href*="/reset?token="]').first().click();
    await hydrated(page);
    await page.getByLabel("New password", { exact: true }).fill("the tide came in early");
    await page.getByLabel("The same password again").fill("the tide came in early");
    await page.getByRole("button", { name: "Set the new password" }).click();
    await expect.poll(() => page.getByRole("status").textContent()).toMatch(/password is changed/);
    const r = await fetch(new URL("/api/auth/sign-in", baseUrl()), {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ email: user.email, password: "the tide came in early" }),
    });
    expect(r.status).toBe(200);
  });

  it("lets an admin find a user and disable them; the user's open page is signed out at the next request", async () => {
    const admin = await createUser({ siteRole: "admin", label: "harbourmaster" });
    const victim = await createUser({ label: "deckhand" });
    const victimContext = await launchBrowser();
    try {
      const url = new URL(baseUrl());
      await victimContext.context.addCookies([{ name: "tactus_session", value: await sessionFor(victim.id), domain: url.hostname, path: "/", httpOnly: true, secure: true, sameSite: "Lax" }]);
      const victimPage = await victimContext.context.newPage();
      await victimPage.goto(`${baseUrl()}/library`);
      await expect.poll(() => victimPage.getByTestId("signed-in-as").textContent()).toBe(victim.displayName);

      await browser.context.addCookies([{ name: "tactus_session", value: await sessionFor(admin.id), domain: url.hostname, path: "/", httpOnly: true, secure: true, sameSite: "Lax" }]);
      const { page } = await openPage(browser, "/admin");
      await hydrated(page);
      await page.getByLabel("Search by name or e-mail").fill(victim.email);
      const row = page.locator(`tr[data-user-email="${victim.email}"]`);
      await row.waitFor();
      await row.getByRole("button", { name: "Disable" }).click();
      await expect.poll(() => page.getByRole("status").textContent()).toMatch(/disabled and signed out everywhere/);

      await victimPage.reload();
      expect(await victimPage.getByTestId("signed-in-as").count()).toBe(0);
      expect(await victimPage.getByRole("link", { name: "Sign in" }).count()).toBeGreaterThan(0);
      const signIn = await fetch(new URL("/api/auth/sign-in", baseUrl()), {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ email: victim.email, password: PASSWORD }),
      });
      expect(signIn.status).toBe(403);
    } finally {
      await victimContext.close();
      await browser.context.clearCookies();
    }
  });
});
