// Vitest: run by `npm test` (scripts/test.mjs), which first prepares the test database and the built server.
// - unit: tests/unit/** in the node environment, files in parallel. A file opts into a DOM with the docblock
//   `/** @vitest-environment jsdom */` (or `// @vitest-environment jsdom`) at its top.
// - integration: tests/server/** (real PostgreSQL, HTTP) and tests/browser/** (chromium), one file at a time,
//   after the unit tests, since they share the test database and the test server.
// tests/bench/** is never collected: benchmarks run with `npm run bench`.
import { defineConfig } from "vitest/config";

export default defineConfig({
  test: {
    environment: "node",
    exclude: ["tests/bench/**", "**/node_modules/**", "dist/**", "dist-test/**", ".data/**"],
    projects: [
      {
        extends: true,
        test: {
          name: "unit",
          include: ["tests/unit/**/*.test.{ts,tsx}"],
          sequence: { groupOrder: 0 },
        },
      },
      {
        extends: true,
        test: {
          name: "integration",
          include: ["tests/server/**/*.test.{ts,tsx}", "tests/browser/**/*.test.{ts,tsx}"],
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 60_000,
          sequence: { groupOrder: 1 },
        },
      },
    ],
  },
});
