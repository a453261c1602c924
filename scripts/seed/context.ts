import type { NodePgDatabase } from "drizzle-orm/node-postgres";
import type * as schema from "../../src/server/db/schema";

export type SeedContext = { db: NodePgDatabase<typeof schema>; log: (msg: string) => void };
