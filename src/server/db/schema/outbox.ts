import { index, integer, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";

/**
 * Transactional outbox: mail is inserted in the same transaction as the change that causes it;
 * the worker claims rows with SKIP LOCKED and sends them. `dedupeKey` makes enqueueing idempotent.
 */
export const outboxMessages = pgTable(
  "outbox_messages",
  {
    id: uuid().primaryKey().defaultRandom(),
    dedupeKey: text().notNull(),
    toAddress: text().notNull(),
    subject: text().notNull(),
    textBody: text().notNull(),
    htmlBody: text(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    attempts: integer().notNull().default(0),
    nextAttemptAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    lastError: text(),
    sentAt: timestamp({ withTimezone: true }),
    /** Message-ID given to the SMTP server, so a resend after a crash is recognisable. */
    messageId: text().notNull(),
  },
  (t) => [uniqueIndex("outbox_dedupe_key").on(t.dedupeKey), index("outbox_pending_idx").on(t.sentAt, t.nextAttemptAt)],
);

/** One row per (job, period): a scheduled job that runs twice in a period does its work once. */
export const jobRuns = pgTable(
  "job_runs",
  {
    id: uuid().primaryKey().defaultRandom(),
    jobName: text().notNull(),
    periodKey: text().notNull(),
    startedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    finishedAt: timestamp({ withTimezone: true }),
  },
  (t) => [uniqueIndex("job_runs_job_period_key").on(t.jobName, t.periodKey)],
);

export type OutboxMessage = typeof outboxMessages.$inferSelect;
