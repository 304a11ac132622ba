/**
 * Notation spelling benchmark (not part of npm test). Run: `npm run bench -- notation`
 * (or `node --import tsx tests/bench/notation.bench.ts`).
 *
 * Builds a 1,000-bar song form in 4/4 on a sixteenth grid with eight kit lanes and a keys part on both
 * staves (chords held across beats and bar lines, a syncopated bass line), then times `spellGroove` on a
 * fresh copy of the document each run (no cache carried over), and `spellBars` for an 8-bar window at the
 * end of the song (incremental rendering). Target: spelling 1,000 bars under 300 ms.
 */
import { cpus, loadavg } from "node:os";
import { performance } from "node:perf_hooks";
import { spellBars, spellGroove } from "../../src/lib/rhythm";
import { buildSongForm } from "./support/song-form";

const BARS = 1000;
const RUNS = 7;
const TARGET_MS = 300;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
}

const doc = buildSongForm(BARS);
const hits = doc.kit.lanes.reduce((n, l) => n + l.hits.length, 0);
console.log(`song: ${BARS} bars of 4/4, 1/16 grid, ${doc.kit.lanes.length} kit lanes (${hits} hits), ${doc.keys.notes.length} keys notes`);

let peakHeap = 0;
const times: number[] = [];
const cpuTimes: number[] = [];
let events = 0;
for (let r = 0; r <= RUNS; r++) {
  const copy = structuredClone(doc); // a fresh document: the per-document cache starts empty every run
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const score = spellGroove(copy);
  const ms = performance.now() - t0;
  const cpu = process.cpuUsage(c0);
  if (r > 0) cpuTimes.push((cpu.user + cpu.system) / 1000);
  peakHeap = Math.max(peakHeap, process.memoryUsage().heapUsed);
  events = score.bars.reduce((n, b) => n + b.kit.up.length + b.kit.down.length + (b.keys ? b.keys.treble.length + b.keys.bass.length : 0), 0);
  if (r === 0) console.log(`spellGroove, first (cold) run: ${ms.toFixed(1)} ms`);
  else times.push(ms);
}
const spell = median(times);
console.log(`spellGroove, median of ${RUNS}: ${spell.toFixed(1)} ms wall (fastest ${Math.min(...times).toFixed(1)} ms), ${median(cpuTimes).toFixed(1)} ms CPU, for ${events} written events`);
console.log(`target: spelling ${BARS} bars under ${TARGET_MS} ms: ${spell < TARGET_MS ? "met" : "MISSED"} (wall time; CPU time is steadier on a busy machine)`);

const windowTimes: number[] = [];
for (let r = 0; r < RUNS; r++) {
  const copy = structuredClone(doc);
  const t0 = performance.now();
  spellBars(copy, BARS - 8, BARS);
  windowTimes.push(performance.now() - t0);
}
console.log(`spellBars, last 8 bars on a fresh document: median ${median(windowTimes).toFixed(1)} ms`);
const warm = structuredClone(doc);
spellBars(warm, 0, 1);
const w0 = performance.now();
spellBars(warm, BARS - 8, BARS);
console.log(`spellBars, last 8 bars with the document already prepared: ${(performance.now() - w0).toFixed(2)} ms`);
console.log(`peak heap used: ${(peakHeap / 1048576).toFixed(1)} MB`);
console.log(`machine: ${cpus().length} cores, load average ${loadavg().map((x) => x.toFixed(1)).join(" / ")} (wall times grow with the load; CPU time less so)`);
if (spell >= TARGET_MS) process.exitCode = 1;
