// Apply the committed drizzle-kit migrations (from code, so errors are printed).
import { drizzle } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import { Pool } from "pg";

const url = process.env.DATABASE_URL;
if (!url) throw new Error("DATABASE_URL is not set");
const pool = new Pool({ connectionString: url, max: 1 });
try {
  await migrate(drizzle(pool), { migrationsFolder: new URL("../drizzle", import.meta.url).pathname });
  console.log("[cairn] migrations applied");
} catch (err) {
  console.error("[cairn] migration failed:", err);
  process.exitCode = 1;
} finally {
  await pool.end();
}
