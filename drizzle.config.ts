import { defineConfig } from "drizzle-kit";

// Migrations are generated from the schema and committed; scripts/migrate.ts applies them.
export default defineConfig({
  dialect: "postgresql",
  schema: "./src/server/db/schema/index.ts",
  out: "./drizzle",
  dbCredentials: { url: process.env.DATABASE_URL ?? "postgres://cairn@127.0.0.1:54329/cairn" },
  casing: "snake_case",
  strict: true,
  verbose: false,
});
