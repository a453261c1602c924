import "server-only";
import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import { Pool } from "pg";
import { env } from "@/env";
import * as schema from "./schema";

// One pooled client for the whole process. Kept on globalThis so dev hot-reload does not leak pools.
const globalForDb = globalThis as unknown as { cairnPool?: Pool };

export const pool: Pool =
  globalForDb.cairnPool ??
  new Pool({ connectionString: env.DATABASE_URL, max: 10, idleTimeoutMillis: 30_000, application_name: "cairn" });
if (env.NODE_ENV !== "production") globalForDb.cairnPool = pool;

export const db = drizzle(pool, { schema, casing: "snake_case" });
export type Db = NodePgDatabase<typeof schema>;
/** A transaction handle or the db itself: domain functions accept either. */
export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0] | Db;
