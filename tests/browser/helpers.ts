// Shared helpers for browser tests: Debian's chromium driven by playwright-core (never a downloaded browser),
// a fresh profile per launch, and a record of every console error and uncaught page error.
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { chromium, type BrowserContext, type Page } from "playwright-core";
import { requireEnv } from "../setup/env";

/** The flags every Tactus browser test uses (no network side traffic, no GPU, no sandbox inside containers). */
export const CHROMIUM_ARGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
] as const;

/** Base URL of the built test server that `npm test` started (TEST_BASE_URL). */
export function baseUrl(): string {
  return requireEnv("TEST_BASE_URL");
}

export interface Browser {
  context: BrowserContext;
  /** Closes chromium and removes its profile folder. */
  close(): Promise<void>;
}

/**
 * Launches chromium with a fresh user-data folder.
 * @example
 * const browser = await launchBrowser();
 * afterAll(() => browser.close());
 */
export async function launchBrowser(options: { colorScheme?: "light" | "dark"; viewport?: { width: number; height: number } } = {}): Promise<Browser> {
  const profile = mkdtempSync(path.join(os.tmpdir(), "tactus-chromium-"));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: process.env.CHROMIUM_PATH || "/usr/bin/chromium",
    args: [...CHROMIUM_ARGS],
    headless: true,
    colorScheme: options.colorScheme ?? "light",
    viewport: options.viewport ?? { width: 1280, height: 900 },
  });
  return {
    context,
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

export interface OpenedPage {
  page: Page;
  /** HTTP status of the main document. */
  status: number | null;
  /** Console messages of type "error" and uncaught exceptions, in order. */
  errors: string[];
}

/**
 * Opens `pathOrUrl` (relative to the test server) in a new tab and records errors from the first byte on.
 * @example
 * const { page, errors } = await openPage(browser, "/");
 * expect(errors).toEqual([]);
 */
export async function openPage(
  browser: Browser,
  pathOrUrl: string,
  options: { colorScheme?: "light" | "dark"; viewport?: { width: number; height: number } } = {},
): Promise<OpenedPage> {
  const page = await browser.context.newPage();
  const errors: string[] = [];
  page.on("console", (message) => {
    if (message.type() === "error") errors.push(`console: ${message.text()}`);
  });
  page.on("pageerror", (error) => errors.push(`page error: ${error.message}`));
  if (options.colorScheme) await page.emulateMedia({ colorScheme: options.colorScheme });
  if (options.viewport) await page.setViewportSize(options.viewport);
  const url = new URL(pathOrUrl, baseUrl()).href;
  const response = await page.goto(url, { waitUntil: "load" });
  return { page, status: response?.status() ?? null, errors };
}
