import "server-only";
import type { ScheduledJob } from "./run-scheduled-job";
import { expiringDocumentsDigest } from "@/server/binder/expiry-digest";
import { acknowledgementReminderJob, overdueAcknowledgementDigestJob } from "@/server/acknowledgements/reminder-jobs";

// Every scheduled job of the worker. Capabilities add theirs (acknowledgement reminders,
// overdue digests, expiring-document digests …).
export const scheduledJobs: ScheduledJob[] = [acknowledgementReminderJob, overdueAcknowledgementDigestJob, expiringDocumentsDigest];
