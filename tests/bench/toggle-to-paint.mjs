// Toggle-to-paint benchmark of the live notation: the BUILT app in Debian's chromium (playwright-core), a
// 4-bar and a 32-bar groove loaded into the editor, 200 step toggles each by real mouse clicks, timed with
// the page's own performance marks: "tactus:edit" (the step grid marks it when the toggle is dispatched),
// "tactus:notation-updated" (the notation SVG has been changed) and "tactus:painted" (the next animation
// frame after that change, i.e. the frame that shows it). Prints median and p95 against the targets
// (p95 ≤ 16 ms at 4 bars, ≤ 50 ms at 32 bars), then the Node-side render time per bar (server SVG).
//
// `npm run bench -- toggle-to-paint`. Builds the app into .data/bench-notation-dist unless BENCH_SERVER_ENTRY
// names a built entry.mjs or BENCH_BASE_URL points at a running server. The server listens on BENCH_PORT
// (default 4421). BENCH_TOGGLES changes the number of toggles (default 200).
import { spawn } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { cpus, loadavg, tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { chromium } from "playwright-core";
import { assertGroove } from "../../src/lib/rhythm/document.ts";
import { spellGroove } from "../../src/lib/rhythm/notation/spell.ts";
import { renderScoreOnServer } from "../../src/adapters/vexflow/server.ts";

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");
const TOGGLES = Number(process.env.BENCH_TOGGLES) || 200;
const PORT = Number(process.env.BENCH_PORT) || 4421;
const TARGETS = { 4: 16, 32: 50 };
const ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"];

const say = (m) => process.stdout.write(`toggle-to-paint: ${m}\n`);

/**
 * A 4/4 groove on a sixteenth grid: hi-hat eighths, snare on 2 and 4 with a ghost, a kick figure, and held
 * keys chords on both staves (invented demo material).
 */
export function benchGroove(bars) {
  const hits = { "hihat-closed": [], snare: [], kick: [] };
  const notes = [];
  for (let b = 0; b < bars; b++) {
    const at = (sixteenth) => `${b * 16 + sixteenth}/16`;
    for (let e = 0; e < 16; e += 2) hits["hihat-closed"].push({ at: at(e) });
    hits.snare.push({ at: at(4) }, { at: at(12) }, { at: at(7), dynamic: "ghost" });
    hits.kick.push({ at: at(0) }, { at: at(6) }, { at: at(10) });
    const chord = b % 2 === 0 ? [45, 57, 60, 64] : [41, 53, 57, 60];
    for (const pitch of chord) notes.push({ at: `${b}`, duration: "1/2", pitch, velocity: 80 }, { at: `${2 * b + 1}/2`, duration: "1/2", pitch: pitch + 2, velocity: 80 });
  }
  return assertGroove({
    schemaVersion: 1,
    meter: { beatsPerBar: 4, beatUnit: 4 },
    tempo: { bpm: "96", beatNote: "1/4" },
    grid: { step: "1/16" },
    bars,
    sections: [],
    kit: { lanes: Object.entries(hits).map(([piece, h]) => ({ piece, hits: h })) },
    keys: { notes, splitPitch: 60 },
  });
}

function run(cmd, args, env) {
  return new Promise((resolve, reject) => {
    const child = spawn(cmd, args, { cwd: ROOT, env, stdio: ["ignore", "ignore", "inherit"] });
    child.on("exit", (code) => (code === 0 ? resolve() : reject(new Error(`${cmd} ${args.join(" ")} exited ${code}`))));
  });
}

async function startServer() {
  if (process.env.BENCH_BASE_URL) return { url: process.env.BENCH_BASE_URL, stop: async () => {} };
  let entry = process.env.BENCH_SERVER_ENTRY;
  if (!entry) {
    say("building the app into .data/bench-notation-dist");
    await run(path.join(ROOT, "node_modules/.bin/astro"), ["build"], { ...process.env, ASTRO_TELEMETRY_DISABLED: "1", TACTUS_OUT_DIR: "./.data/bench-notation-dist" });
    entry = path.join(ROOT, ".data/bench-notation-dist/server/entry.mjs");
  }
  const server = spawn(process.execPath, [entry], { cwd: ROOT, env: { ...process.env, HOST: "127.0.0.1", PORT: String(PORT) }, stdio: ["ignore", "ignore", "inherit"] });
  const url = `http://127.0.0.1:${PORT}`;
  for (let i = 0; i < 100; i++) {
    try {
      const r = await fetch(`${url}/grooves/new`);
      if (r.ok) break;
    } catch {
      // not up yet
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  return {
    url,
    stop: () =>
      new Promise((resolve) => {
        server.once("exit", resolve);
        server.kill("SIGTERM");
      }),
  };
}

const quantile = (sorted, q) => sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1))];
const fmt = (v) => v.toFixed(1).padStart(6);

async function measureBrowser(context, url, bars) {
  const page = await context.newPage();
  const errors = [];
  page.on("pageerror", (e) => errors.push(e.message));
  page.on("console", (m) => m.type() === "error" && errors.push(m.text()));
  await page.goto(`${url}/grooves/new`);
  const doc = benchGroove(bars);
  await page.evaluate((d) => localStorage.setItem("tactus:draft:scratch", JSON.stringify({ v: 1, grooveId: null, baseVersionId: null, doc: d, savedAt: Date.now() })), doc);
  await page.reload();
  await page.locator("astro-island:not([ssr]) [data-editor]").waitFor();
  await page.locator(".tx-notation-canvas g.tx-bar").first().waitFor({ timeout: 20_000 });
  await page
    .waitForFunction((n) => document.querySelectorAll(".tx-notation-canvas g.tx-bar").length === n, bars, { timeout: 20_000 })
    .catch(async (e) => {
      const seen = await page.evaluate(() => [document.querySelectorAll(".tx-notation-canvas g.tx-bar").length, document.querySelector(".tx-notation")?.textContent]);
      throw new Error(`the ${bars}-bar groove did not show (${JSON.stringify(seen)}; ${errors.join(" | ")}): ${e.message}`);
    });
  // The snare row toggles across the groove: each click changes one bar (set or clear a hit on a sixteenth).
  const row = Number(await page.locator('[data-kcell][aria-label^="Snare,"]').first().getAttribute("data-row"));
  const columns = bars * 16;
  await page.evaluate(() => performance.clearMarks());
  const drawn = [];
  const drawMs = [];
  let msBefore = Number(await page.locator(".tx-notation-draw").first().getAttribute("data-draw-ms"));
  let drawnBefore = Number(await page.locator(".tx-notation-draw").first().getAttribute("data-bars-drawn"));
  for (let i = 0; i < TOGGLES; i++) {
    const col = (i * 37 + 3) % columns;
    const cell = page.locator(`[data-kcell][data-row="${row}"][data-col="${col}"]`);
    // Real mouse input at the cell's centre (scrolled to the middle of the grid, clear of the sticky row
    // headers); page.mouse adds no hit-target listeners to the page, unlike locator.click().
    // The grid renders only the columns near its visible part: scroll there first.
    await page.evaluate((c) => {
      const scroller = document.querySelector(".tx-scroll");
      const any = document.querySelector("[data-kcell]");
      if (scroller && any) scroller.scrollLeft = Math.max(0, c * any.getBoundingClientRect().width - scroller.clientWidth / 2);
    }, col);
    await cell.waitFor({ state: "attached" });
    const box = await cell.evaluate((el) => {
      el.scrollIntoView({ block: "center", inline: "center" });
      const r = el.getBoundingClientRect();
      return { x: r.x + r.width / 2, y: r.y + r.height / 2 };
    });
    await page.waitForTimeout(30);
    const before = await page.evaluate(() => performance.getEntriesByName("tactus:painted").length);
    // Press, wait for the notation to be painted, then release (as a hand would, some 100 ms later).
    await page.mouse.move(box.x, box.y);
    await page.mouse.down();
    await page.waitForFunction((n) => performance.getEntriesByName("tactus:painted").length > n, before, { polling: "raf", timeout: 5000 }).catch(async (e) => {
      const info = await page.evaluate(([r, c]) => {
        const el = document.querySelector(`[data-kcell][data-row="${r}"][data-col="${c}"]`);
        const rect = el?.getBoundingClientRect();
        const top = rect ? document.elementFromPoint(rect.x + rect.width / 2, rect.y + rect.height / 2) : null;
        return { label: el?.getAttribute("aria-label"), top: top?.outerHTML.slice(0, 120), marks: performance.getEntriesByType("mark").slice(-4).map((m) => m.name) };
      }, [row, col]);
      throw new Error(`toggle ${i} (column ${col}) painted nothing: ${JSON.stringify(info)} ${e.message}`);
    });
    const total = Number(await page.locator(".tx-notation-draw").first().getAttribute("data-bars-drawn"));
    drawn.push(total - drawnBefore);
    const msTotal = Number(await page.locator(".tx-notation-draw").first().getAttribute("data-draw-ms"));
    drawMs.push(msTotal - msBefore);
    msBefore = msTotal;
    drawnBefore = total;
    if (process.env.BENCH_DEBUG) say(`  column ${col}: ${drawn.at(-1)} bars redrawn`);
    await page.mouse.up();
    await page.waitForTimeout(20);
  }
  const marks = await page.evaluate(() => performance.getEntriesByType("mark").map((m) => [m.name, m.startTime]));
  await page.close();
  const paint = [];
  const update = [];
  marks.forEach(([name, t], i) => {
    if (name !== "tactus:edit") return;
    const next = (n) => marks.slice(i + 1).find(([m]) => m === n)?.[1];
    const u = next("tactus:notation-updated");
    const p = next("tactus:painted");
    if (u !== undefined) update.push(u - t);
    if (p !== undefined) paint.push(p - t);
  });
  return { paint: paint.sort((a, b) => a - b), update: update.sort((a, b) => a - b), errors, drawn: drawn.reduce((a, b) => a + b, 0) / Math.max(1, drawn.length), drawMs: drawMs.sort((a, b) => a - b) };
}

function measureNode(bars, runs = 9) {
  const score = spellGroove(benchGroove(bars));
  for (let i = 0; i < 3; i++) renderScoreOnServer(score, { width: 1000 }); // warm up (fonts, JIT)
  const times = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    renderScoreOnServer(score, { width: 1000 });
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  return quantile(times, 0.5) / bars;
}

if (process.argv[2] === "--print-groove") {
  process.stdout.write(JSON.stringify(benchGroove(Number(process.argv[3]) || 4)));
  process.exit(0);
}

const server = await startServer();
const profile = mkdtempSync(path.join(tmpdir(), "tactus-bench-"));
let failed = false;
try {
  say(`machine: ${cpus().length} cores, load ${loadavg().map((l) => l.toFixed(2)).join(" ")}; ${TOGGLES} toggles per groove`);
  const context = await chromium.launchPersistentContext(profile, { executablePath: process.env.CHROMIUM_PATH || "/usr/bin/chromium", args: ARGS, headless: true, viewport: { width: 1280, height: 900 } });
  try {
    for (const bars of [4, 32]) {
      const { paint, update, errors, drawn, drawMs } = await measureBrowser(context, server.url, bars);
      const p95 = quantile(paint, 0.95);
      const ok = paint.length === TOGGLES && p95 <= TARGETS[bars] && errors.length === 0;
      failed ||= !ok;
      say(
        `${String(bars).padStart(2)} bars: toggle→painted median ${fmt(quantile(paint, 0.5))} ms, p95 ${fmt(p95)} ms (target ≤ ${TARGETS[bars]} ms) ` +
          `| toggle→SVG updated median ${fmt(quantile(update, 0.5))} ms, p95 ${fmt(quantile(update, 0.95))} ms | notation renderer ${fmt(quantile(drawMs, 0.5))} ms median, ${drawn.toFixed(2)} bars redrawn per toggle | ${paint.length} samples ${ok ? "OK" : "MISSED"}`,
      );
      if (errors.length) say(`  page errors: ${errors.slice(0, 3).join(" | ")}`);
    }
  } finally {
    await context.close();
  }
  for (const bars of [4, 32]) say(`node: server SVG render ${fmt(measureNode(bars))} ms per bar (${bars}-bar groove with keys, width 1000, median of 9 after 3 warm-up renders)`);
} finally {
  rmSync(profile, { recursive: true, force: true });
  await server.stop();
}
if (failed) process.exitCode = 1;
