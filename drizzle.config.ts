// drizzle-kit settings. `npm run db:generate` writes a new migration into drizzle/ from the schema;
// it needs no database. Applied migrations are never edited: change the schema and generate a new one.
import { defineConfig } from "drizzle-kit";

export default defineConfig({
  dialect: "postgresql",
  schema: "./src/lib/server/db/schema.ts",
  out: "./drizzle",
  dbCredentials: {
    url: process.env.DATABASE_URL ?? "postgres://postgres@127.0.0.1:55432/tactus",
  },
  strict: true,
  verbose: true,
});
