#!/usr/bin/env node
// `npm run bench [-- NAME]`: runs every benchmark script in tests/bench (*.ts, *.mjs) with tsx, one after another.
// Benchmarks print their own figures; they are not part of `npm test`. A NAME argument filters by file name.
import { readdirSync } from "node:fs";
import path from "node:path";
import { Fatal, ROOT, baseEnv, bin, ensureDependencies, runInherit, runMain, say } from "./lib/common.mjs";

runMain(async () => {
  await ensureDependencies();
  const folder = path.join(ROOT, "tests", "bench");
  const filters = process.argv.slice(2);
  let files = [];
  try {
    files = readdirSync(folder).filter((f) => /\.(ts|mjs)$/.test(f) && !f.endsWith(".d.ts")).sort();
  } catch {
    throw new Fatal("tests/bench does not exist yet: add a benchmark script there first.");
  }
  files = files.filter((f) => filters.length === 0 || filters.some((name) => f.includes(name)));
  if (files.length === 0) throw new Fatal("no benchmark matched: list tests/bench to see the names.");
  let failed = 0;
  for (const file of files) {
    say(`benchmark ${file}`);
    const code = await runInherit(bin("tsx"), [path.join(folder, file)], { env: baseEnv() });
    if (code !== 0) failed++;
  }
  if (failed) throw new Fatal(`${failed} benchmark(s) failed: see the output above.`);
});
