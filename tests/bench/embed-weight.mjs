// Page weight of the embed, measured in Debian's chromium (issue 6), not part of npm test:
// `npm run bench -- embed-weight`. Uses the BUILT app against real PostgreSQL (support/embed-server.mjs).
//
// For a phone-sized and a desktop-sized frame, with a fresh profile (nothing cached), prints:
//   - JavaScript fetched before the first press of play, each file and the total gzipped (gzip -6 of the bytes
//     the browser received: the app's static assets are served uncompressed here, a CDN would compress them);
//   - largest contentful paint (LCP) and its element;
//   - cumulative layout shift (CLS) from navigation through the island waking up and a press of play;
//   - what the first press of play then loads (the audio engine and Tone.js).
// Targets: JS before play < 30 KB gzipped, LCP < 1 s, CLS = 0.
import { mkdtempSync, rmSync } from "node:fs";
import { cpus, loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { gzipSync } from "node:zlib";
import { chromium } from "playwright-core";
import { startEmbedServer } from "./support/embed-server.mjs";

const TARGET = { jsKb: 30, lcpMs: 1000, cls: 0 };
const ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"];
const RUNS = Number(process.env.BENCH_RUNS) || 5;

function say(message) {
  process.stdout.write(`embed-weight: ${message}\n`);
}

const kb = (n) => (n / 1024).toFixed(1);
const median = (xs) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

async function measure(url, viewport) {
  const profile = mkdtempSync(join(tmpdir(), "tactus-weight-"));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: process.env.CHROMIUM_PATH || "/usr/bin/chromium",
    args: ARGS,
    headless: true,
    viewport,
  });
  try {
    const page = await context.newPage();
    await page.addInitScript(() => {
      const w = window;
      w.__cls = 0;
      w.__lcp = null;
      new PerformanceObserver((list) => {
        for (const e of list.getEntries()) if (!e.hadRecentInput) w.__cls += e.value;
      }).observe({ type: "layout-shift", buffered: true });
      new PerformanceObserver((list) => {
        const e = list.getEntries().at(-1);
        w.__lcp = { time: e.startTime, element: e.element ? `${e.element.tagName.toLowerCase()}${e.element.className ? `.${String(e.element.className).split(" ")[0]}` : ""}` : "?", size: e.size };
      }).observe({ type: "largest-contentful-paint", buffered: true });
    });
    const scripts = new Map();
    let played = false;
    page.on("response", async (r) => {
      if (r.request().resourceType() !== "script") return;
      try {
        const body = await r.body();
        scripts.set(r.url(), { raw: body.length, gzip: gzipSync(body, { level: 6 }).length, afterPlay: played });
      } catch {}
    });
    await page.goto(url, { waitUntil: "networkidle" });
    await page.evaluate(() => document.fonts.ready);
    await page.waitForTimeout(300);
    const before = [...scripts].filter(([, s]) => !s.afterPlay);
    played = true;
    await page.click("[data-tx-play]");
    await page.waitForSelector(".tx-playhead:not([hidden])", { state: "attached", timeout: 20_000 });
    await page.waitForTimeout(800);
    await page.click("[data-tx-play]");
    const { cls, lcp } = await page.evaluate(() => ({ cls: window.__cls, lcp: window.__lcp }));
    const after = [...scripts].filter(([, s]) => s.afterPlay);
    return { before, after, cls, lcp };
  } finally {
    await context.close();
    rmSync(profile, { recursive: true, force: true });
  }
}

say(`machine: ${cpus().length} cores, load average ${loadavg().map((x) => x.toFixed(2)).join(" / ")}; ${RUNS} runs per size`);
const app = await startEmbedServer({ say });
let ok = true;
try {
  const url = `${app.base}/embed/v/${app.versionId}`;
  await fetch(url); // the server draws and stores the page once; every measured load is a stored one
  for (const [name, viewport] of [
    ["phone frame 360 × 640", { width: 360, height: 640 }],
    ["desktop frame 720 × 520", { width: 720, height: 520 }],
  ]) {
    const runs = [];
    for (let i = 0; i < RUNS; i++) runs.push(await measure(url, viewport));
    const first = runs[0];
    for (const [u, s] of first.before) say(`${name}: before play ${new URL(u).pathname} ${kb(s.raw)} KB (${kb(s.gzip)} KB gzipped)`);
    const jsGzip = first.before.reduce((a, [, s]) => a + s.gzip, 0);
    const afterGzip = first.after.reduce((a, [, s]) => a + s.gzip, 0);
    const lcp = median(runs.map((r) => r.lcp?.time ?? Infinity));
    const cls = Math.max(...runs.map((r) => r.cls));
    say(`${name}: first press of play loads ${first.after.length} scripts, ${kb(afterGzip)} KB gzipped (audio engine and Tone.js)`);
    const met = jsGzip / 1024 < TARGET.jsKb && lcp < TARGET.lcpMs && cls === TARGET.cls;
    say(
      `${name}: JS before play ${kb(jsGzip)} KB gzipped (target < ${TARGET.jsKb}); LCP median ${lcp.toFixed(0)} ms over ${RUNS} loads, ` +
        `element ${first.lcp?.element} (target < ${TARGET.lcpMs}); CLS worst ${cls} (target ${TARGET.cls}) → ${met ? "targets met" : "TARGETS MISSED"}`,
    );
    ok &&= met;
  }
  say(`machine load after the runs: ${loadavg().map((x) => x.toFixed(2)).join(" / ")}`);
} finally {
  await app.stop();
}
process.exitCode = ok ? 0 : 1;
