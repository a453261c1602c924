import { relations } from "drizzle-orm";
import { boolean, date, index, integer, jsonb, pgEnum, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import type { VisitSchedule } from "../../../lib/protocol/visit-schedule";
import { documents } from "./documents";
import { users } from "./people";
import { sites, studies } from "./studies";

export const protocolVersionStates = ["draft", "in_review", "returned", "approved", "released", "superseded"] as const;
export const protocolVersionStateEnum = pgEnum("protocol_version_state", protocolVersionStates);

export type SummaryOfChangesRow = { section: string; before: string; after: string; rationale: string };
export type ReviewComment = { at: string; byUserId: string; byName: string; text: string };

/**
 * A version of a study's protocol: ProseMirror JSON content plus the structured schedule of visits.
 * `revision` is the optimistic-concurrency counter: every save names the revision it was based on.
 * Released content is frozen and bound to `contentHash` (SHA-256 of RFC 8785 canonical JSON).
 */
export const protocolVersions = pgTable(
  "protocol_versions",
  {
    id: uuid().primaryKey().defaultRandom(),
    studyId: uuid().notNull().references(() => studies.id),
    parentId: uuid(),
    versionLabel: text().notNull(),
    /** Amendment number (1, 2, …); null for the first version. */
    amendmentNumber: integer(),
    state: protocolVersionStateEnum().notNull().default("draft"),
    title: text().notNull(),
    substantial: boolean(),
    substantialReason: text(),
    content: jsonb().notNull(),
    visitSchedule: jsonb().$type<VisitSchedule>().notNull().default([]),
    summaryOfChanges: jsonb().$type<SummaryOfChangesRow[]>().notNull().default([]),
    reviewComments: jsonb().$type<ReviewComment[]>().notNull().default([]),
    revision: integer().notNull().default(1),
    contentHash: text(),
    authorId: uuid().notNull().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    submittedAt: timestamp({ withTimezone: true }),
    approvedBy: uuid().references(() => users.id),
    approvedAt: timestamp({ withTimezone: true }),
    releasedBy: uuid().references(() => users.id),
    releasedAt: timestamp({ withTimezone: true }),
  },
  (t) => [uniqueIndex("protocol_versions_study_label_key").on(t.studyId, t.versionLabel), index("protocol_versions_study_idx").on(t.studyId)],
);

/**
 * A site's ethics-committee approval of a released version: the version is in force at the site
 * from `approvedOn` (a calendar date in the site's time zone) until a later approved version.
 */
export const siteVersionApprovals = pgTable(
  "site_version_approvals",
  {
    id: uuid().primaryKey().defaultRandom(),
    siteId: uuid().notNull().references(() => sites.id),
    versionId: uuid().notNull().references(() => protocolVersions.id),
    approvedOn: date({ mode: "string" }).notNull(),
    letterDocumentId: uuid().references(() => documents.id),
    recordedBy: uuid().references(() => users.id),
    recordedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("site_version_approvals_site_version_key").on(t.siteId, t.versionId)],
);

export const protocolVersionsRelations = relations(protocolVersions, ({ one, many }) => ({
  study: one(studies, { fields: [protocolVersions.studyId], references: [studies.id] }),
  author: one(users, { fields: [protocolVersions.authorId], references: [users.id] }),
  approvals: many(siteVersionApprovals),
}));
export const siteVersionApprovalsRelations = relations(siteVersionApprovals, ({ one }) => ({
  site: one(sites, { fields: [siteVersionApprovals.siteId], references: [sites.id] }),
  version: one(protocolVersions, { fields: [siteVersionApprovals.versionId], references: [protocolVersions.id] }),
}));

export type ProtocolVersion = typeof protocolVersions.$inferSelect;
export type SiteVersionApproval = typeof siteVersionApprovals.$inferSelect;
