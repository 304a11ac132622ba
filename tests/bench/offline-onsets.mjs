/**
 * Offline audio render benchmark (not part of npm test). Run: `npm run bench -- offline-onsets`
 * (or `node --import tsx tests/bench/offline-onsets.mjs`).
 *
 * Bundles the audio adapter and the rhythm core (esbuild, as the app's build does with Vite) into a blank page of
 * Debian's chromium (playwright-core), renders a 16-bar groove at 180 bpm with triplet swing through Tone.Offline
 * with the real synthesized kit and keys, detects the onsets and compares them with the core's schedule
 * (compileSchedule, computed here in Node). Prints onset counts, missing and extra onsets, the max and mean timing
 * error, and the render time, for three renders:
 * 1. per instrument: every voice on its own channel (the same plan, transport and instruments), so every event of
 *    every voice is checked, unmasked by the others. Target (issue 4): all within 1 ms, none missing or extra.
 * 2. the full mix before the limiter: distinct onsets (events struck together are one onset); a quiet stroke
 *    under louder ringing cymbals can be masked here, which is the mix, not the timing.
 * 3. the whole chain through the limiter: its constant look-ahead delay.
 */
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { build } from "esbuild";
import { chromium } from "playwright-core";
import { assertGroove, compileSchedule } from "../../src/lib/rhythm/index.ts";
import { compareOnsets, distinctTimes } from "../../src/lib/rhythm/onsets.ts";

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");
const ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"];

/** 16 bars of a swung groove for an invented tune ("Ferry Lights", The Lamplight Ferry): 180 bpm, 4/4, triplet swing. */
function benchGroove() {
  const BARS = 16;
  const lanes = { kick: [], snare: [], "hihat-closed": [], "hihat-open": [], "hihat-foot": [], ride: [], crash: [], "tom-high": [], "tom-floor": [] };
  const notes = [];
  for (let b = 0; b < BARS; b++) {
    const at = (sixteenths) => `${b * 16 + sixteenths}/16`;
    const fill = b % 4 === 3;
    lanes.kick.push({ at: at(0) }, { at: at(6) });
    if (!fill) lanes.kick.push({ at: at(10) });
    lanes.snare.push({ at: at(4) }, { at: at(12), dynamic: b % 2 ? "accent" : "normal" });
    if (b % 2 === 0) lanes.snare.push({ at: at(14), dynamic: "ghost" });
    if (b === 0 || b === 8) lanes.crash.push({ at: at(0) });
    for (let e = 0; e < 8; e++) {
      if ((b === 0 || b === 8) && e === 0) continue; // the crash takes the downbeat
      if (fill && e >= 6) continue;
      if (b % 4 === 1 && e === 7) lanes["hihat-open"].push({ at: at(e * 2) });
      else if (b >= 8 && b < 12) lanes.ride.push({ at: at(e * 2) });
      else lanes["hihat-closed"].push({ at: at(e * 2) });
    }
    if (b % 4 === 2) lanes["hihat-foot"].push({ at: at(4) }, { at: at(12) });
    if (fill) {
      lanes["tom-high"].push({ at: at(12) });
      lanes["tom-floor"].push({ at: at(14) });
    }
    // Keys: a chord on the "and" of 1 and on beat 3 (swung eighths), and a bass note on 1.
    const root = [48, 53, 55, 50][b % 4];
    notes.push({ at: at(0), duration: "1/8", pitch: root - 12 });
    for (const p of [root + 12, root + 16, root + 19]) notes.push({ at: at(2), duration: "1/8", pitch: p }, { at: at(8), duration: "1/4", pitch: p });
  }
  return assertGroove({
    schemaVersion: 1,
    meter: { beatsPerBar: 4, beatUnit: 4 },
    tempo: { bpm: 180, beatNote: "1/4" },
    grid: { step: "1/16" },
    swing: { unit: "1/8", ratio: 2 / 3 },
    bars: BARS,
    sections: [],
    kit: { lanes: Object.entries(lanes).filter(([, hits]) => hits.length).map(([piece, hits]) => ({ piece, hits })) },
    keys: { notes, splitPitch: 60 },
  });
}

async function bundle() {
  const result = await build({
    stdin: {
      contents: `
        import { renderOffline } from "./src/adapters/tone/offline.ts";
        import { detectOnsets, mixDown } from "./src/lib/rhythm/onsets.ts";
        window.bench = async (doc, options) => {
          const r = await renderOffline(doc, options);
          const mono = mixDown(r.channels);
          let peak = 0;
          for (const v of mono) peak = Math.max(peak, Math.abs(v));
          const stems = r.stems ? r.stems.map((voice, i) => ({ voice, onsets: detectOnsets(r.channels[i], r.sampleRate) })) : null;
          return { onsets: stems ? [] : detectOnsets(mono, r.sampleRate), stems, duration: r.duration, renderSeconds: r.renderSeconds, peak, sampleRate: r.sampleRate };
        };`,
      resolveDir: ROOT,
      loader: "ts",
    },
    bundle: true,
    format: "iife",
    platform: "browser",
    target: "chrome120",
    write: false,
    logLevel: "silent",
  });
  return result.outputFiles[0].text;
}

const fmtMs = (s) => `${(s * 1000).toFixed(3)} ms`;

async function main() {
  const doc = benchGroove();
  const expected = distinctTimes(compileSchedule(doc).map((e) => e.time));
  const code = await bundle();
  const profile = mkdtempSync(path.join(os.tmpdir(), "tactus-bench-"));
  const context = await chromium.launchPersistentContext(profile, { executablePath: process.env.CHROMIUM_PATH || "/usr/bin/chromium", args: ARGS, headless: true });
  let failed = false;
  try {
    const page = await context.newPage();
    const errors = [];
    page.on("pageerror", (e) => errors.push(e.message));
    page.on("console", (m) => m.type() === "error" && errors.push(m.text()));
    await page.setContent("<!doctype html><title>offline render bench</title>");
    await page.addScriptTag({ content: code });
    const schedule = compileSchedule(doc);
    console.log(`groove: 16 bars, 4/4, quarter = 180, eighth swing 2/3, ${schedule.length} events, ${expected.length} distinct onsets`);

    const perVoice = await page.evaluate(([d]) => window.bench(d, { tap: "stems" }), [doc]);
    console.log(`1. per instrument: ${perVoice.duration.toFixed(2)} s at ${perVoice.sampleRate} Hz, ${perVoice.stems.length} voices on their own channels, rendered in ${(perVoice.renderSeconds * 1000).toFixed(0)} ms`);
    let events = 0, matched = 0, missing = 0, extra = 0, maxErr = 0, sumErr = 0;
    for (const { voice, onsets } of perVoice.stems) {
      const want = schedule.filter((e) => (e.kind === "keys" ? "keys" : e.piece) === voice).map((e) => e.time);
      const c = compareOnsets(want, onsets);
      events += c.expected.length;
      matched += c.errors.length;
      missing += c.missing.length;
      extra += c.extra.length;
      maxErr = Math.max(maxErr, c.maxAbsError);
      sumErr += c.errors.reduce((a, e) => a + Math.abs(e), 0);
      console.log(`   ${voice.padEnd(13)} ${String(c.expected.length).padStart(3)} onsets, missing ${c.missing.length}, extra ${c.extra.length}, max ${fmtMs(c.maxAbsError)}, mean ${fmtMs(c.meanAbsError)}`);
    }
    console.log(`   all voices: ${events} onsets, matched ${matched}, missing ${missing}, extra ${extra}, max error ${fmtMs(maxErr)}, mean ${fmtMs(matched ? sumErr / matched : 0)}`);

    const mix = await page.evaluate(([d]) => window.bench(d, { tap: "pre-limiter" }), [doc]);
    const cmp = compareOnsets(expected, mix.onsets);
    console.log(`2. full mix before the limiter: rendered in ${(mix.renderSeconds * 1000).toFixed(0)} ms (peak ${mix.peak.toFixed(3)}); detected ${mix.onsets.length}, matched ${cmp.errors.length}, missing ${cmp.missing.length}, extra ${cmp.extra.length}; max ${fmtMs(cmp.maxAbsError)}, mean ${fmtMs(cmp.meanAbsError)}`);
    if (cmp.missing.length) console.log(`   missing at: ${cmp.missing.slice(0, 10).map((t) => t.toFixed(4)).join(", ")}`);
    if (cmp.extra.length) console.log(`   extra at: ${cmp.extra.slice(0, 10).map((t) => t.toFixed(4)).join(", ")}`);

    const withLimiter = await page.evaluate(([d]) => window.bench(d, { tap: "output" }), [doc]);
    const lim = compareOnsets(expected, withLimiter.onsets, 0.02);
    const mean = lim.errors.length ? lim.errors.reduce((a, b) => a + b, 0) / lim.errors.length : NaN;
    console.log(`3. through the limiter: peak ${withLimiter.peak.toFixed(3)} (ceiling −1 dBFS = 0.891), mean onset delay ${fmtMs(mean)} (the limiter's look-ahead)`);
    if (errors.length) console.log(`page errors: ${errors.join(" | ")}`);
    const ok = maxErr <= 0.001 && missing === 0 && extra === 0 && errors.length === 0;
    console.log(`target (per instrument: all within 1 ms, none missing or extra): ${ok ? "met" : "NOT met"}`);
    failed = !ok;
  } finally {
    await context.close();
    rmSync(profile, { recursive: true, force: true });
  }
  if (failed) process.exitCode = 1;
}

await main();
