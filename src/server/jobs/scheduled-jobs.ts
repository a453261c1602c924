import "server-only";
import type { ScheduledJob } from "./run-scheduled-job";

// Every scheduled job of the worker. Capabilities add theirs (acknowledgement reminders,
// overdue digests, expiring-document digests …).
export const scheduledJobs: ScheduledJob[] = [];
