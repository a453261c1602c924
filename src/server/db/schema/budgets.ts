import { relations } from "drizzle-orm";
import { bigint, check, date, index, integer, pgEnum, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { sql } from "drizzle-orm";
import { documents } from "./documents";
import { users } from "./people";
import { protocolVersions } from "./protocol";
import { sites, studies } from "./studies";

// Site budgets (DESIGN.md capability 5). A budget is one per site, in the site's currency; its
// content lives in versions, each effective from a date. A version under which any line was
// earned is never edited: a change is a new version (an amendment).

export const paymentCycleEnum = pgEnum("payment_cycle", ["monthly", "quarterly"]);
export const paymentTriggerEnum = pgEnum("payment_trigger", ["visit_completed", "data_entered", "monitor_verified"]);
export const budgetItemKindEnum = pgEnum("budget_item_kind", ["startup", "milestone", "visit", "screen_failure"]);
export const milestoneKindEnum = pgEnum("milestone_kind", ["site_activated", "first_implant", "nth_enrolled", "close_out"]);

export const siteBudgets = pgTable(
  "site_budgets",
  {
    id: uuid().primaryKey().defaultRandom(),
    studyId: uuid().notNull().references(() => studies.id),
    siteId: uuid().notNull().references(() => sites.id),
    /** ISO 4217, the site's currency when the budget was made. */
    currency: text().notNull(),
    createdBy: uuid().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("site_budgets_site_key").on(t.siteId), index("site_budgets_study_idx").on(t.studyId)],
);

export const budgetVersions = pgTable(
  "budget_versions",
  {
    id: uuid().primaryKey().defaultRandom(),
    budgetId: uuid().notNull().references(() => siteBudgets.id),
    siteId: uuid().notNull().references(() => sites.id),
    versionNumber: integer().notNull(),
    /** Site-local calendar date from which events are priced with this version. */
    effectiveFrom: date({ mode: "string" }).notNull(),
    /** The protocol amendment this budget amendment follows, when there is one. */
    protocolVersionId: uuid().references(() => protocolVersions.id),
    /** Why this version exists (first budget, amendment reason). */
    reason: text().notNull().default(""),
    /** One paid screen failure per this many enrolled subjects (null: no ratio). */
    screenFailureCapPerEnrolled: integer(),
    /** At most this many paid screen failures (null: no maximum). */
    screenFailureCapMax: integer(),
    overheadBps: integer().notNull(),
    holdbackBps: integer().notNull(),
    cycle: paymentCycleEnum().notNull(),
    netDays: integer().notNull(),
    trigger: paymentTriggerEnum().notNull(),
    createdBy: uuid().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex("budget_versions_budget_number_key").on(t.budgetId, t.versionNumber),
    uniqueIndex("budget_versions_budget_effective_key").on(t.budgetId, t.effectiveFrom),
    index("budget_versions_site_idx").on(t.siteId),
    check("budget_versions_rates_check", sql`${t.overheadBps} between 0 and 100000 and ${t.holdbackBps} between 0 and 10000 and ${t.netDays} between 0 and 365`),
  ],
);

/** The fees of a version: start-up, milestones, one per visit code, the screen-failure fee. */
export const budgetItems = pgTable(
  "budget_items",
  {
    id: uuid().primaryKey().defaultRandom(),
    budgetVersionId: uuid().notNull().references(() => budgetVersions.id),
    kind: budgetItemKindEnum().notNull(),
    milestone: milestoneKindEnum(),
    /** N of the N-subjects-enrolled milestone. */
    n: integer(),
    visitCode: text(),
    amountMinor: bigint({ mode: "bigint" }).notNull(),
  },
  (t) => [
    index("budget_items_version_idx").on(t.budgetVersionId),
    uniqueIndex("budget_items_version_visit_key").on(t.budgetVersionId, t.visitCode),
    check("budget_items_amount_check", sql`${t.amountMinor} >= 0`),
  ],
);

/** A pass-through cost paid on an approved invoice (e.g. an ethics-committee fee). */
export const passThroughInvoices = pgTable(
  "pass_through_invoices",
  {
    id: uuid().primaryKey().defaultRandom(),
    studyId: uuid().notNull().references(() => studies.id),
    siteId: uuid().notNull().references(() => sites.id),
    /** The invoice file in storage. */
    documentId: uuid().references(() => documents.id),
    description: text().notNull(),
    amountMinor: bigint({ mode: "bigint" }).notNull(),
    /** Site-local date the sponsor approved the invoice: the line's service date. */
    approvedOn: date({ mode: "string" }).notNull(),
    approvedBy: uuid().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("pass_through_invoices_site_idx").on(t.siteId), check("pass_through_invoices_amount_check", sql`${t.amountMinor} >= 0`)],
);

/**
 * Exchange rates entered by sponsor finance: one unit of `currency` is worth `rate` units of the
 * study's reporting currency, as of `rateDate`. The rate is a decimal string with up to 10 places.
 */
export const exchangeRates = pgTable(
  "exchange_rates",
  {
    id: uuid().primaryKey().defaultRandom(),
    studyId: uuid().notNull().references(() => studies.id),
    currency: text().notNull(),
    reportingCurrency: text().notNull(),
    rate: text().notNull(),
    rateDate: date({ mode: "string" }).notNull(),
    source: text().notNull().default(""),
    enteredBy: uuid().references(() => users.id),
    enteredAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("exchange_rates_study_pair_date_key").on(t.studyId, t.currency, t.reportingCurrency, t.rateDate)],
);

/**
 * Payments recorded against earned lines, keyed by the engine's line keys. Minimal on purpose:
 * the payments capability (runs, transfers, confirmations) replaces or extends it.
 */
export const paymentsRecorded = pgTable(
  "payments_recorded",
  {
    id: uuid().primaryKey().defaultRandom(),
    studyId: uuid().notNull().references(() => studies.id),
    siteId: uuid().notNull().references(() => sites.id),
    lineKey: text().notNull(),
    amountMinor: bigint({ mode: "bigint" }).notNull(),
    /** Site-local date the money was paid. */
    paidOn: date({ mode: "string" }).notNull(),
    reference: text().notNull().default(""),
    recordedBy: uuid().references(() => users.id),
    recordedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("payments_recorded_site_idx").on(t.siteId), index("payments_recorded_study_idx").on(t.studyId), check("payments_recorded_amount_check", sql`${t.amountMinor} > 0`)],
);

export const siteBudgetsRelations = relations(siteBudgets, ({ one, many }) => ({
  site: one(sites, { fields: [siteBudgets.siteId], references: [sites.id] }),
  versions: many(budgetVersions),
}));
export const budgetVersionsRelations = relations(budgetVersions, ({ one, many }) => ({
  budget: one(siteBudgets, { fields: [budgetVersions.budgetId], references: [siteBudgets.id] }),
  items: many(budgetItems),
}));
export const budgetItemsRelations = relations(budgetItems, ({ one }) => ({
  version: one(budgetVersions, { fields: [budgetItems.budgetVersionId], references: [budgetVersions.id] }),
}));

export type SiteBudgetRow = typeof siteBudgets.$inferSelect;
export type BudgetVersionRow = typeof budgetVersions.$inferSelect;
export type BudgetItemRow = typeof budgetItems.$inferSelect;
export type PassThroughInvoiceRow = typeof passThroughInvoices.$inferSelect;
export type ExchangeRateRow = typeof exchangeRates.$inferSelect;
export type PaymentRecordedRow = typeof paymentsRecorded.$inferSelect;
