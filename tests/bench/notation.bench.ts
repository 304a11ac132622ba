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
import { assertGroove, spellBars, spellGroove, type GrooveDocument, type GrooveDocumentInput } from "../../src/lib/rhythm";

const BARS = 1000;
const RUNS = 7;
const TARGET_MS = 300;

function buildSong(): GrooveDocument {
  const at = (bar: number, sixteenth: number) => `${bar * 16 + sixteenth}/16`;
  const lanes: Record<string, { at: string; dynamic?: "ghost" | "normal" | "accent"; articulation?: "open" | "flam" }[]> = {
    "hihat-closed": [],
    "hihat-open": [],
    ride: [],
    crash: [],
    snare: [],
    "tom-high": [],
    "tom-floor": [],
    kick: [],
  };
  const notes: GrooveDocumentInput["keys"]["notes"] = [];
  for (let b = 0; b < BARS; b++) {
    const chorus = Math.floor(b / 8) % 2 === 1;
    const fill = b % 8 === 7;
    for (let i = 0; i < 16; i++) {
      if (fill && i >= 8) {
        (i < 12 ? lanes["tom-high"] : lanes["tom-floor"])!.push({ at: at(b, i) });
        continue;
      }
      if (chorus) {
        if (i % 2 === 0) lanes.ride!.push({ at: at(b, i), dynamic: i % 4 === 0 ? "accent" : "normal" });
      } else if (i === 14) lanes["hihat-open"]!.push({ at: at(b, i) });
      else lanes["hihat-closed"]!.push({ at: at(b, i), dynamic: i % 4 === 0 ? "accent" : i % 2 ? "ghost" : "normal" });
    }
    for (const i of [0, 7, 10]) lanes.kick!.push({ at: at(b, i) });
    for (const i of fill ? [4] : [4, 12]) lanes.snare!.push({ at: at(b, i), dynamic: "accent" });
    if (!fill) lanes.snare!.push({ at: at(b, 15), dynamic: "ghost", articulation: "flam" });
    if (b % 8 === 0) lanes.crash!.push({ at: at(b, 0), dynamic: "accent" });
    // Keys: a chord held a dotted quarter, an anticipation tied over the bar line, a syncopated bass line.
    const root = 60 + ((b * 7) % 12);
    for (const p of [root, root + 4, root + 7]) notes.push({ at: at(b, 0), duration: "3/8", pitch: p, velocity: 80 });
    if (b < BARS - 1) for (const p of [root + 2, root + 5]) notes.push({ at: at(b, 14), duration: "1/4", pitch: p, velocity: 92 });
    const bass = root - 24;
    notes.push({ at: at(b, 0), duration: "3/16", pitch: bass, velocity: 100 });
    notes.push({ at: at(b, 3), duration: "1/16", pitch: bass + 7, velocity: 90 });
    notes.push({ at: at(b, 6), duration: "5/16", pitch: bass + 12, velocity: 90 });
  }
  const sections: GrooveDocumentInput["sections"] = [];
  const names = ["Intro", "Verse", "Chorus", "Verse", "Chorus", "Bridge", "Chorus", "Outro"];
  for (let start = 0, k = 0; start < BARS; k++) {
    const bars = Math.min(k === 0 ? 8 : 16, BARS - start);
    sections.push({ name: names[k % names.length]!, startBar: start, bars, repeats: k % 3 === 2 ? 2 : 1 });
    start += bars;
  }
  return assertGroove({
    schemaVersion: 1,
    meter: { beatsPerBar: 4, beatUnit: 4 },
    tempo: { bpm: 112, beatNote: "1/4" },
    grid: { step: "1/16" },
    bars: BARS,
    sections,
    kit: { lanes: Object.entries(lanes).map(([piece, hits]) => ({ piece: piece as never, hits })) },
    keys: { notes, splitPitch: 60 },
  });
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
}

const doc = buildSong();
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
