import { relations } from "drizzle-orm";
import { date, index, integer, jsonb, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { siteStatusEnum } from "./enums";
import { users } from "./people";

export const studies = pgTable(
  "studies",
  {
    id: uuid().primaryKey().defaultRandom(),
    code: text().notNull(),
    title: text().notNull(),
    sponsorName: text().notNull(),
    /** ISO 4217 code used for converted study-wide totals. */
    reportingCurrency: text().notNull().default("EUR"),
    /** Days an investigator has to acknowledge a released protocol version. */
    ackDeadlineDays: integer().notNull().default(14),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("studies_code_key").on(t.code)],
);

export type SiteContact = { name: string; role: string; email: string; phone?: string };

export const sites = pgTable(
  "sites",
  {
    id: uuid().primaryKey().defaultRandom(),
    studyId: uuid().notNull().references(() => studies.id),
    code: text().notNull(),
    name: text().notNull(),
    /** ISO 3166-1 alpha-2. */
    country: text().notNull(),
    /** IANA time zone; the site's calendar dates are in this zone. */
    timeZone: text().notNull(),
    /** ISO 4217; the site's budget and payments are in this currency. */
    currency: text().notNull(),
    targetEnrolment: integer().notNull().default(0),
    status: siteStatusEnum().notNull().default("proposed"),
    contacts: jsonb().$type<SiteContact[]>().notNull().default([]),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("sites_study_code_key").on(t.studyId, t.code), index("sites_study_idx").on(t.studyId)],
);

/** Each lifecycle step with its date and who made it. */
export const siteStatusEvents = pgTable(
  "site_status_events",
  {
    id: uuid().primaryKey().defaultRandom(),
    siteId: uuid().notNull().references(() => sites.id),
    fromStatus: siteStatusEnum(),
    toStatus: siteStatusEnum().notNull(),
    /** Calendar date of the step in the site's time zone. */
    effectiveOn: date({ mode: "string" }).notNull(),
    actorId: uuid().references(() => users.id),
    at: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("site_status_events_site_idx").on(t.siteId)],
);

export const studiesRelations = relations(studies, ({ many }) => ({ sites: many(sites) }));
export const sitesRelations = relations(sites, ({ one, many }) => ({
  study: one(studies, { fields: [sites.studyId], references: [studies.id] }),
  statusEvents: many(siteStatusEvents),
}));

export type Study = typeof studies.$inferSelect;
export type Site = typeof sites.$inferSelect;
