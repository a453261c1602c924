import { relations, sql } from "drizzle-orm";
import { bigint, check, date, index, integer, jsonb, pgEnum, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { users } from "./people";
import { sites, studies } from "./studies";

// Payments (DESIGN.md capability 7): payee accounts, payment runs with frozen lines, one transfer per
// run × site × currency, Stripe events stored once by id, receipts confirmed by the site and queries.

export const payeeStateEnum = pgEnum("payee_state", ["pending", "verified", "restricted", "rejected"]);
export const paymentRunStateEnum = pgEnum("payment_run_state", ["prepared", "approved", "sending", "sent", "cancelled"]);
export const runLineStateEnum = pgEnum("run_line_state", ["in_run", "sent", "paid", "failed", "reversed"]);
export const transferStateEnum = pgEnum("transfer_state", ["queued", "sending", "sent", "paid", "failed", "reversed"]);
export const paymentQueryStateEnum = pgEnum("payment_query_state", ["open", "answered", "resolved"]);

/** A site's connected account in Stripe, with its verification state as last reported. */
export const payeeAccounts = pgTable(
  "payee_accounts",
  {
    id: uuid().primaryKey().defaultRandom(),
    studyId: uuid().notNull().references(() => studies.id),
    siteId: uuid().notNull().references(() => sites.id),
    stripeAccountId: text().notNull(),
    state: payeeStateEnum().notNull().default("pending"),
    /** Stripe's requirements.disabled_reason, when there is one. */
    stateReason: text(),
    createdBy: uuid().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("payee_accounts_site_key").on(t.siteId), uniqueIndex("payee_accounts_stripe_key").on(t.stripeAccountId)],
);

export const paymentRuns = pgTable(
  "payment_runs",
  {
    id: uuid().primaryKey().defaultRandom(),
    studyId: uuid().notNull().references(() => studies.id),
    /** Run number within the study, for people ("Run 7"). */
    number: integer().notNull(),
    state: paymentRunStateEnum().notNull().default("prepared"),
    /** What the preparer selected: cycle label, site ids, currency. */
    selection: jsonb().$type<{ cycle?: string | null; siteIds?: string[] | null; currency?: string | null }>().notNull().default({}),
    note: text().notNull().default(""),
    /** SHA-256 of the canonical run content (lines and amounts): what the approver saw. */
    contentHash: text().notNull(),
    lineCount: integer().notNull(),
    preparedBy: uuid().notNull().references(() => users.id),
    preparedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    approvedBy: uuid().references(() => users.id),
    approvedAt: timestamp({ withTimezone: true }),
    sendRequestedBy: uuid().references(() => users.id),
    sendRequestedAt: timestamp({ withTimezone: true }),
    cancelledBy: uuid().references(() => users.id),
    cancelledAt: timestamp({ withTimezone: true }),
  },
  (t) => [
    uniqueIndex("payment_runs_study_number_key").on(t.studyId, t.number),
    // Four eyes, also in the database: the approver is never the preparer.
    check("payment_runs_four_eyes_check", sql`${t.approvedBy} is null or ${t.approvedBy} <> ${t.preparedBy}`),
  ],
);

/** A run's line: an earned line of the schedule, frozen with its amount when the run was made. */
export const paymentRunLines = pgTable(
  "payment_run_lines",
  {
    id: uuid().primaryKey().defaultRandom(),
    runId: uuid().notNull().references(() => paymentRuns.id),
    studyId: uuid().notNull().references(() => studies.id),
    siteId: uuid().notNull().references(() => sites.id),
    currency: text().notNull(),
    lineKey: text().notNull(),
    kind: text().notNull(),
    description: text().notNull(),
    serviceDate: date({ mode: "string" }).notNull(),
    dueDate: date({ mode: "string" }).notNull(),
    cycle: text().notNull(),
    /** ISO 4217 minor units of the site's currency. */
    amountMinor: bigint({ mode: "bigint" }).notNull(),
    state: runLineStateEnum().notNull().default("in_run"),
    stateReason: text(),
    transferId: uuid(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex("payment_run_lines_run_line_key").on(t.runId, t.lineKey),
    // A line is in at most one live run: failed and reversed lines are due again, nothing else is.
    uniqueIndex("payment_run_lines_live_key").on(t.siteId, t.lineKey).where(sql`state in ('in_run', 'sent', 'paid')`),
    index("payment_run_lines_site_idx").on(t.siteId),
    index("payment_run_lines_transfer_idx").on(t.transferId),
    check("payment_run_lines_amount_check", sql`${t.amountMinor} > 0`),
  ],
);

/** One Stripe transfer per run × site × currency; also the worker's queue (claimed with SKIP LOCKED). */
export const paymentTransfers = pgTable(
  "payment_transfers",
  {
    id: uuid().primaryKey().defaultRandom(),
    runId: uuid().notNull().references(() => paymentRuns.id),
    studyId: uuid().notNull().references(() => studies.id),
    siteId: uuid().notNull().references(() => sites.id),
    currency: text().notNull(),
    amountMinor: bigint({ mode: "bigint" }).notNull(),
    /** The amount in Stripe's unit for the currency (whole yen for JPY). */
    stripeAmount: bigint({ mode: "bigint" }).notNull(),
    destinationAccountId: text().notNull(),
    /** Derived from run + site + currency only: every retry, tab or worker sends the same key. */
    idempotencyKey: text().notNull(),
    stripeTransferId: text(),
    state: transferStateEnum().notNull().default("queued"),
    attempts: integer().notNull().default(0),
    nextAttemptAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    /** A claim lease: a worker that dies mid-send leaves it to expire, then another worker retries. */
    leaseUntil: timestamp({ withTimezone: true }),
    lastError: text(),
    failureCode: text(),
    failureMessage: text(),
    sentAt: timestamp({ withTimezone: true }),
    paidAt: timestamp({ withTimezone: true }),
    failedAt: timestamp({ withTimezone: true }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex("payment_transfers_idempotency_key").on(t.idempotencyKey),
    uniqueIndex("payment_transfers_run_site_currency_key").on(t.runId, t.siteId, t.currency),
    uniqueIndex("payment_transfers_stripe_key").on(t.stripeTransferId),
    index("payment_transfers_queue_idx").on(t.state, t.nextAttemptAt),
    index("payment_transfers_site_idx").on(t.siteId),
    check("payment_transfers_amount_check", sql`${t.amountMinor} > 0 and ${t.stripeAmount} > 0`),
  ],
);

/** Each Stripe event once, by its id: a repeat delivery finds the row and changes nothing. */
export const stripeEvents = pgTable(
  "stripe_events",
  {
    id: text().primaryKey(),
    type: text().notNull(),
    /** Event creation time at Stripe (unix seconds), to order events about one object. */
    stripeCreated: bigint({ mode: "number" }).notNull(),
    objectId: text(),
    payload: jsonb().notNull(),
    receivedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    outcome: text().notNull().default(""),
  },
  (t) => [index("stripe_events_object_idx").on(t.objectId)],
);

/** Site finance confirms a payment arrived: date, amount and bank reference as the bank shows them. */
export const paymentConfirmations = pgTable(
  "payment_confirmations",
  {
    id: uuid().primaryKey().defaultRandom(),
    transferId: uuid().notNull().references(() => paymentTransfers.id),
    studyId: uuid().notNull().references(() => studies.id),
    siteId: uuid().notNull().references(() => sites.id),
    receivedOn: date({ mode: "string" }).notNull(),
    amountMinor: bigint({ mode: "bigint" }).notNull(),
    bankReference: text().notNull(),
    confirmedBy: uuid().notNull().references(() => users.id),
    confirmedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("payment_confirmations_transfer_key").on(t.transferId), index("payment_confirmations_site_idx").on(t.siteId)],
);

/** A question about a payment or one of its lines, between site finance and sponsor finance. */
export const paymentQueries = pgTable(
  "payment_queries",
  {
    id: uuid().primaryKey().defaultRandom(),
    studyId: uuid().notNull().references(() => studies.id),
    siteId: uuid().notNull().references(() => sites.id),
    transferId: uuid().references(() => paymentTransfers.id),
    lineKey: text(),
    subject: text().notNull(),
    state: paymentQueryStateEnum().notNull().default("open"),
    raisedBy: uuid().notNull().references(() => users.id),
    raisedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("payment_queries_site_idx").on(t.siteId), index("payment_queries_transfer_idx").on(t.transferId)],
);

export const paymentQueryMessages = pgTable(
  "payment_query_messages",
  {
    id: uuid().primaryKey().defaultRandom(),
    queryId: uuid().notNull().references(() => paymentQueries.id),
    authorId: uuid().notNull().references(() => users.id),
    /** Which side wrote it: "site" or "sponsor". */
    side: text().notNull(),
    body: text().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("payment_query_messages_query_idx").on(t.queryId), check("payment_query_messages_side_check", sql`${t.side} in ('site', 'sponsor')`)],
);

export const paymentRunsRelations = relations(paymentRuns, ({ many }) => ({ lines: many(paymentRunLines), transfers: many(paymentTransfers) }));
export const paymentRunLinesRelations = relations(paymentRunLines, ({ one }) => ({ run: one(paymentRuns, { fields: [paymentRunLines.runId], references: [paymentRuns.id] }) }));
export const paymentTransfersRelations = relations(paymentTransfers, ({ one }) => ({ run: one(paymentRuns, { fields: [paymentTransfers.runId], references: [paymentRuns.id] }) }));
export const paymentQueriesRelations = relations(paymentQueries, ({ many }) => ({ messages: many(paymentQueryMessages) }));
export const paymentQueryMessagesRelations = relations(paymentQueryMessages, ({ one }) => ({
  query: one(paymentQueries, { fields: [paymentQueryMessages.queryId], references: [paymentQueries.id] }),
}));

export type PayeeAccountRow = typeof payeeAccounts.$inferSelect;
export type PaymentRunRow = typeof paymentRuns.$inferSelect;
export type PaymentRunLineRow = typeof paymentRunLines.$inferSelect;
export type PaymentTransferRow = typeof paymentTransfers.$inferSelect;
export type StripeEventRow = typeof stripeEvents.$inferSelect;
export type PaymentConfirmationRow = typeof paymentConfirmations.$inferSelect;
export type PaymentQueryRow = typeof paymentQueries.$inferSelect;
export type PaymentQueryMessageRow = typeof paymentQueryMessages.$inferSelect;
