// Server settings read from the environment. Scripts, drizzle-kit and the app share these names.
// (process.env rather than astro:env, so plain Node scripts and tests can import this module too.)

/** Default database: the private dev cluster that `npm start` runs (PGPORT overrides its port). */
export const DEFAULT_DATABASE_URL = `postgres://postgres@127.0.0.1:${process.env.PGPORT || 55432}/tactus`;

/** PostgreSQL connection string for the app. */
export function databaseUrl(): string {
  return process.env.DATABASE_URL || DEFAULT_DATABASE_URL;
}

/** The app's version, shown by /api/health (TACTUS_VERSION overrides, e.g. a commit id in a deployment). */
export const APP_VERSION: string = process.env.TACTUS_VERSION || "0.1.0";

/** Largest JSON request body the API accepts, in bytes (API_BODY_LIMIT overrides). */
export const BODY_LIMIT_BYTES: number = Number(process.env.API_BODY_LIMIT) || 512 * 1024;
