/**
 * Rhythm core benchmark (not part of npm test). Run: `node --import tsx tests/bench/core.bench.ts`
 * (or `npm run bench -- core`).
 *
 * Builds a 1,000-bar song form in 4/4 on a sixteenth grid with eight kit lanes and a keys part, then
 * times rescale, displace, re-bar, compileSchedule and compareGrooves next to a baseline measured in the
 * same run: sorting as many float onsets as the schedule has events. Targets: each transform and the
 * equivalence check under 10× the baseline; peak heap under 200 MB.
 */
import { performance } from "node:perf_hooks";
import {
  assertGroove,
  compareGrooves,
  compileSchedule,
  displace,
  doubleTime,
  halfTime,
  rebar,
  type GrooveDocument,
  type GrooveDocumentInput,
} from "../../src/lib/rhythm";

const BARS = 1000;
const RUNS = 7;

function buildSong(): GrooveDocument {
  const sixteenth = (bar: number, i: number) => `${bar * 16 + i}/16`;
  const lanes: Record<string, { at: string; dynamic?: "ghost" | "normal" | "accent"; articulation?: "open" }[]> = {
    "hihat-closed": [],
    "hihat-open": [],
    kick: [],
    snare: [],
    "hihat-foot": [],
    ride: [],
    crash: [],
    "tom-floor": [],
  };
  const notes: GrooveDocumentInput["keys"]["notes"] = [];
  for (let b = 0; b < BARS; b++) {
    const chorus = Math.floor(b / 16) % 2 === 1;
    for (let i = 0; i < 16; i++) {
      if (i === 14) lanes["hihat-open"]!.push({ at: sixteenth(b, i), articulation: "open" });
      else if (!chorus) lanes["hihat-closed"]!.push({ at: sixteenth(b, i), dynamic: i % 4 === 0 ? "accent" : i % 2 ? "ghost" : "normal" });
      if (chorus && i % 4 === 0) lanes.ride!.push({ at: sixteenth(b, i) });
    }
    for (const i of [0, 6, 10]) lanes.kick!.push({ at: sixteenth(b, i) });
    for (const i of [4, 12]) lanes.snare!.push({ at: sixteenth(b, i), dynamic: "accent" });
    for (const i of [7, 15]) lanes.snare!.push({ at: sixteenth(b, i), dynamic: "ghost" });
    for (const i of [2, 6, 10, 14]) lanes["hihat-foot"]!.push({ at: sixteenth(b, i) });
    if (b % 8 === 0) lanes.crash!.push({ at: sixteenth(b, 0), dynamic: "accent" });
    if (b % 4 === 3) lanes["tom-floor"]!.push({ at: sixteenth(b, 13) });
    // Keys: a chord on 1, and an anticipated chord on the last sixteenth held across the barline.
    const root = 48 + ((b * 5) % 12);
    for (const p of [root, root + 4, root + 7]) notes.push({ at: sixteenth(b, 0), duration: "3/8", pitch: p, velocity: 84 });
    if (b < BARS - 1) for (const p of [root + 2, root + 5, root + 9]) notes.push({ at: sixteenth(b, 15), duration: "1/4", pitch: p, velocity: 96 });
  }
  const sections: GrooveDocumentInput["sections"] = [];
  const names = ["Intro", "Verse", "Chorus", "Verse", "Chorus", "Bridge", "Chorus", "Outro"];
  for (let start = 0, k = 0; start < BARS; k++) {
    const bars = Math.min(k === 0 ? 8 : 16, BARS - start);
    sections.push({ name: names[k % names.length]!, startBar: start, bars, repeats: 1 });
    start += bars;
  }
  return assertGroove({
    schemaVersion: 1,
    meter: { beatsPerBar: 4, beatUnit: 4 },
    tempo: { bpm: 96, beatNote: "1/4" },
    grid: { step: "1/16" },
    bars: BARS,
    sections,
    kit: { lanes: Object.entries(lanes).map(([piece, hits]) => ({ piece: piece as never, hits })) },
    keys: { notes, splitPitch: 60 },
  });
}

let peakHeap = 0;
const sampleHeap = () => (peakHeap = Math.max(peakHeap, process.memoryUsage().heapUsed));

/** Median wall time in ms over RUNS runs after one warm-up run. */
function time<T>(fn: () => T): { ms: number; result: T } {
  let result = fn();
  sampleHeap();
  const samples: number[] = [];
  for (let r = 0; r < RUNS; r++) {
    const t0 = performance.now();
    result = fn();
    samples.push(performance.now() - t0);
    sampleHeap();
  }
  samples.sort((a, b) => a - b);
  return { ms: samples[Math.floor(RUNS / 2)]!, result };
}

/**
 * Median times of an operation and of the baseline, run alternately so both see the same machine load
 * (this machine is shared: absolute times vary between runs, the ratio much less).
 */
function paired(fn: () => unknown, baseline: () => unknown): { ms: number; base: number } {
  fn();
  baseline();
  const ops: number[] = [];
  const bases: number[] = [];
  for (let r = 0; r < RUNS; r++) {
    let t = performance.now();
    baseline();
    bases.push(performance.now() - t);
    t = performance.now();
    fn();
    ops.push(performance.now() - t);
    sampleHeap();
  }
  const median = (xs: number[]) => xs.sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
  return { ms: median(ops), base: median(bases) };
}

const t0 = performance.now();
const song = buildSong();
const buildMs = performance.now() - t0;
sampleHeap();
const events = compileSchedule(song).length;
const hits = song.kit.lanes.reduce((a, l) => a + l.hits.length, 0);

// Baseline: sort as many float onsets as the schedule has events (fresh shuffled copy each run).
let seed = 12345;
const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
const onsets = Array.from({ length: events }, () => rnd() * 3000);
const sortOnsets = () => onsets.slice().sort((a, b) => a - b);
const baseline = time(sortOnsets);

const doubled = doubleTime(song);
const displaced = displace(song, "1/8", "pad");
const rows: [string, number, number, boolean][] = [];
const add = (name: string, fn: () => unknown, target = true) => {
  const { ms, base } = paired(fn, sortOnsets);
  rows.push([name, ms, base, target]);
};
add("rescale ×2 (double time)", () => doubleTime(song));
add("rescale ×1/2 (half time of the doubled)", () => halfTime(doubled));
add("displace 1/8 pad", () => displace(song, "1/8", "pad"));
add("displace -1/16 trim", () => displace(song, "-1/16", "trim"));
add("rebar 4/4 → 2/2", () => rebar(song, { beatsPerBar: 2, beatUnit: 2 }));
add("compileSchedule", () => compileSchedule(song));
add("compareGrooves identical (vs double time)", () => {
  const v = compareGrooves(song, doubled);
  if (v.verdict !== "identical") throw new Error(`expected identical, got ${v.verdict}`);
});
add("compareGrooves offset (vs displaced 1/8)", () => {
  const v = compareGrooves(song, displaced);
  if (v.verdict !== "offset" || v.offsetNotes !== "1/8") throw new Error(`expected an offset of 1/8, got ${JSON.stringify(v).slice(0, 200)}`);
});
const loop = { ...song, sections: [] };
const rotatedLoop = displace(loop, "1/8");
add("compareGrooves rotation (whole song as a loop)", () => {
  const v = compareGrooves(loop, rotatedLoop);
  if (v.verdict !== "offset" || !v.rotation) throw new Error(`expected a rotation, got ${v.verdict}`);
});
add("compose: double, displace 1/8 pad, compare", () => compareGrooves(song, displace(doubleTime(song), "1/8", "pad")));
add("assertGroove (zod parse, for reference)", () => assertGroove(song), false);

const mb = (b: number) => (b / 2 ** 20).toFixed(1);
console.log(`Rhythm core bench: ${BARS} bars of 4/4 on a 1/16 grid, ${song.kit.lanes.length} kit lanes (${hits} hits), ${song.keys.notes.length} keys notes, ${events} events`);
console.log(`built in ${buildMs.toFixed(0)} ms; median of ${RUNS} runs after a warm-up; Node ${process.version}`);
console.log(`baseline: sort ${events} float onsets: ${baseline.ms.toFixed(2)} ms alone; below, measured alternately with each operation`);
console.log("operation".padEnd(46) + "ms".padStart(9) + "baseline ms".padStart(13) + "× baseline".padStart(12) + "  target < 10×");
let ok = true;
for (const [name, ms, base, target] of rows) {
  const ratio = ms / base;
  const pass = !target || ratio < 10;
  ok &&= pass;
  console.log(name.padEnd(46) + ms.toFixed(2).padStart(9) + base.toFixed(2).padStart(13) + ratio.toFixed(1).padStart(12) + (target ? (pass ? "  ok" : "  OVER") : "  (not a target)"));
}
const rssMb = process.resourceUsage().maxRSS / 1024;
const heapOk = peakHeap < 200 * 2 ** 20;
console.log(`peak heap used (sampled after each run): ${mb(peakHeap)} MB (target < 200 MB: ${heapOk ? "ok" : "OVER"}); peak RSS ${rssMb.toFixed(1)} MB`);
if (!ok || !heapOk) process.exitCode = 1;
