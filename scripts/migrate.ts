// `tsx scripts/migrate.ts`: applies drizzle/ migrations to DATABASE_URL. Called by npm start and npm test.
import { closeDb, getDb } from "../src/lib/server/db/index";
import { runMigrations } from "../src/lib/server/db/migrate";

try {
  const started = performance.now();
  await runMigrations(getDb());
  console.log(`tactus: migrations applied (${Math.round(performance.now() - started)} ms)`);
} catch (error) {
  const message = error instanceof Error ? error.message : String(error);
  console.error(`tactus: error: could not apply migrations: ${message}`);
  process.exitCode = 1;
} finally {
  await closeDb();
}
