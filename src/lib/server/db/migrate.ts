// Applies the committed SQL migrations in drizzle/ (idempotent: already applied ones are skipped).
import path from "node:path";
import { fileURLToPath } from "node:url";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import type { Database } from "./index";

/** The drizzle/ folder at the repository root. */
export const MIGRATIONS_FOLDER = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../../../../drizzle");

/** Brings the database of `db` up to the newest migration. */
export async function runMigrations(db: Database, migrationsFolder: string = MIGRATIONS_FOLDER): Promise<void> {
  await migrate(db, { migrationsFolder });
}
