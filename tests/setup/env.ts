// Helpers for integration tests: the settings that `npm test` (scripts/test.mjs) passes in, with a clear
// message when a test is run without them. Import from test files; this is not a vitest setup file.

/** Reads a variable that `npm test` sets; throws a clear error when the test was started another way. */
export function requireEnv(name: "DATABASE_URL" | "TEST_BASE_URL" | "TEST_SERVER_ENTRY" | "CHROMIUM_PATH" | (string & {})): string {
  const value = process.env[name];
  if (!value) {
    throw new Error(`${name} is not set: run integration tests through \`npm test\` (it starts the test database and server).`);
  }
  return value;
}
