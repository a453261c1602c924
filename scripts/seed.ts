// Seed the invented demo scenario. Idempotent: each step checks whether its data is there.
// Later capabilities add their step to the list below.
import { drizzle } from "drizzle-orm/node-postgres";
import { Pool } from "pg";
import * as schema from "../src/server/db/schema";
import { seedFoundation } from "./seed/seed-foundation";
import { seedProtocol } from "./seed/seed-protocol";
import { seedSubjects } from "./seed/seed-subjects";
import { seedBinder } from "./seed/seed-binder";
import { seedAcknowledgements } from "./seed/seed-acknowledgements";
import { seedBudgets } from "./seed/seed-budgets";
import { seedPayments } from "./seed/seed-payments";
import type { SeedContext } from "./seed/context";

const steps: ((ctx: SeedContext) => Promise<void>)[] = [seedFoundation, seedProtocol, seedSubjects, seedAcknowledgements, seedBinder, seedBudgets, seedPayments];

const url = process.env.DATABASE_URL;
if (!url) throw new Error("DATABASE_URL is not set");
const pool = new Pool({ connectionString: url, max: 2 });
const ctx: SeedContext = { db: drizzle(pool, { schema, casing: "snake_case" }), log: (m) => console.log(`[seed] ${m}`) };
try {
  for (const step of steps) await step(ctx);
} catch (err) {
  console.error("[seed] failed:", err);
  process.exitCode = 1;
} finally {
  await pool.end();
}
