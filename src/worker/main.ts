// The background worker: sends the outbox and runs scheduled jobs. Any number may run at once:
// outbox rows are claimed with SKIP LOCKED and scheduled jobs record (job, period) once.
import { deliverOutbox } from "@/server/mail/deliver-outbox";
import { scheduledJobs } from "@/server/jobs/scheduled-jobs";
import { runScheduledJob } from "@/server/jobs/run-scheduled-job";
import { pool } from "@/server/db/client";
import { sendQueuedTransfers } from "@/server/payments/send-transfers";

const OUTBOX_EVERY_MS = 2_000;
const PAYMENTS_EVERY_MS = 2_000;
const JOBS_EVERY_MS = 60_000;
let stopping = false;

async function loop(name: string, everyMs: number, work: () => Promise<unknown>) {
  while (!stopping) {
    try {
      await work();
    } catch (err) {
      console.error(`[worker] ${name} failed:`, (err as Error).message);
    }
    await new Promise((r) => setTimeout(r, everyMs));
  }
}

for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.on(signal, async () => {
    stopping = true;
    await pool.end().catch(() => undefined);
    process.exit(0);
  });
}

console.log("[worker] started");
void loop("outbox", OUTBOX_EVERY_MS, () => deliverOutbox());
// Payment transfers: claimed with SKIP LOCKED and sent under their idempotency keys.
void loop("payments", PAYMENTS_EVERY_MS, () => sendQueuedTransfers({ limit: 20 }));
void loop("jobs", JOBS_EVERY_MS, async () => {
  for (const job of scheduledJobs) await runScheduledJob(job, new Date());
});
