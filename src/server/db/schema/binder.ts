import { relations } from "drizzle-orm";
import { boolean, index, integer, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { roleEnum, siteStatusEnum } from "./enums";
import { studies } from "./studies";

/**
 * The study's list of essential documents each site must hold (the binder checklist). A type is
 * held once per site, or once per person holding one of `appliesToRoles` at the site.
 */
export const binderDocumentTypes = pgTable(
  "binder_document_types",
  {
    id: uuid().primaryKey().defaultRandom(),
    studyId: uuid().notNull().references(() => studies.id),
    /** Stable short name, e.g. "cv", "gcp_training"; also the documents' purpose. */
    code: text().notNull(),
    name: text().notNull(),
    holder: text({ enum: ["site", "person"] }).notNull(),
    /** For per-person types: whose (e.g. investigator, coordinator). */
    appliesToRoles: roleEnum().array().notNull().default([]),
    /** The site status from which the document is required; null = kept when available, never required. */
    requiredFrom: siteStatusEnum(),
    expires: boolean().notNull().default(false),
    /** Usual validity, used to propose an expiry date from the issue date. */
    validityMonths: integer(),
    /** Where the requirement comes from (standard and clause). */
    reference: text().notNull().default(""),
    sortOrder: integer().notNull().default(0),
    retiredAt: timestamp({ withTimezone: true }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("binder_document_types_study_code_key").on(t.studyId, t.code), index("binder_document_types_study_idx").on(t.studyId)],
);

export const binderDocumentTypesRelations = relations(binderDocumentTypes, ({ one }) => ({
  study: one(studies, { fields: [binderDocumentTypes.studyId], references: [studies.id] }),
}));

export type BinderDocumentTypeRow = typeof binderDocumentTypes.$inferSelect;
