import "server-only";
import { and, count, eq, gt } from "drizzle-orm";
import { db } from "@/server/db/client";
import { signInAttempts } from "@/server/db/schema";

// Throttling lives in PostgreSQL (no in-memory counters): any number of app processes agree.
export const MAX_FAILURES = 5;
export const WINDOW_MINUTES = 15;

export async function isThrottled(email: string): Promise<boolean> {
  const since = new Date(Date.now() - WINDOW_MINUTES * 60_000);
  const [row] = await db
    .select({ n: count() })
    .from(signInAttempts)
    .where(and(eq(signInAttempts.email, email), eq(signInAttempts.succeeded, false), gt(signInAttempts.at, since)));
  return (row?.n ?? 0) >= MAX_FAILURES;
}

export async function recordAttempt(email: string, succeeded: boolean, ip: string | null) {
  await db.insert(signInAttempts).values({ email, succeeded, ip });
}
