import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { jobRuns } from "@/server/db/schema";

export type ScheduledJob = {
  name: string;
  /** The period a run belongs to, e.g. "2026-12-01" for a daily job; one run per period. */
  periodKey: (now: Date) => string;
  /** Does the work; runs inside the transaction that records the period, so both commit or neither. */
  run: (ctx: { now: Date; periodKey: string; tx: Parameters<Parameters<typeof db.transaction>[0]>[0] }) => Promise<void>;
};

/**
 * Run a job at most once per period, whatever the number of workers or restarts: the (job, period)
 * row is inserted in the same transaction as the job's effects (e.g. outbox mail), so a crash
 * rolls both back and a second run finds the period done.
 */
export async function runScheduledJob(job: ScheduledJob, now: Date): Promise<"ran" | "already-done"> {
  const periodKey = job.periodKey(now);
  return db.transaction(async (tx) => {
    const inserted = await tx
      .insert(jobRuns)
      .values({ jobName: job.name, periodKey })
      .onConflictDoNothing({ target: [jobRuns.jobName, jobRuns.periodKey] })
      .returning({ id: jobRuns.id });
    if (inserted.length === 0) return "already-done";
    await job.run({ now, periodKey, tx });
    await tx.update(jobRuns).set({ finishedAt: sql`now()` }).where(and(eq(jobRuns.jobName, job.name), eq(jobRuns.periodKey, periodKey)));
    return "ran";
  });
}
