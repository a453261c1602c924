import { relations } from "drizzle-orm";
import { date, index, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { roleEnum } from "./enums";
import { users } from "./people";
import { protocolVersions } from "./protocol";
import { sites, studies } from "./studies";

/**
 * A task asking one investigator at one site to acknowledge one protocol version, due on a
 * calendar date in the site's time zone. Created on release, or later for a newly joined
 * investigator (then for the version in force at the site). Whether it is done is read from
 * `electronic_signatures`, never stored twice.
 */
export const acknowledgementRequests = pgTable(
  "acknowledgement_requests",
  {
    id: uuid().primaryKey().defaultRandom(),
    studyId: uuid().notNull().references(() => studies.id),
    siteId: uuid().notNull().references(() => sites.id),
    versionId: uuid().notNull().references(() => protocolVersions.id),
    userId: uuid().notNull().references(() => users.id),
    /** "release": asked when the version was released; "joined": asked on joining the site later. */
    reason: text({ enum: ["release", "joined"] }).notNull(),
    /** The version this person last acknowledged at the site, for the redline link (null: none). */
    compareToVersionId: uuid().references(() => protocolVersions.id),
    requestedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    /** Last calendar day (site's time zone) on which the acknowledgement is on time. */
    dueOn: date({ mode: "string" }).notNull(),
  },
  (t) => [
    uniqueIndex("acknowledgement_requests_version_site_user_key").on(t.versionId, t.siteId, t.userId),
    index("acknowledgement_requests_study_site_idx").on(t.studyId, t.siteId),
    index("acknowledgement_requests_user_idx").on(t.userId),
  ],
);

/**
 * An electronic signature acknowledging a protocol version (21 CFR Part 11 §11.50 as the model:
 * printed name, date and time, meaning). Append-only: a trigger in the migrations rejects UPDATE
 * and DELETE. One per version, signer and site: a second acknowledgement is refused.
 */
export const electronicSignatures = pgTable(
  "electronic_signatures",
  {
    id: uuid().primaryKey().defaultRandom(),
    requestId: uuid().notNull().references(() => acknowledgementRequests.id),
    studyId: uuid().notNull().references(() => studies.id),
    siteId: uuid().notNull().references(() => sites.id),
    versionId: uuid().notNull().references(() => protocolVersions.id),
    signerId: uuid().notNull().references(() => users.id),
    /** Copied at signing so the record reads on its own (§11.50(a)(1)). */
    printedName: text().notNull(),
    signerEmail: text().notNull(),
    role: roleEnum().notNull(),
    siteCode: text().notNull(),
    versionLabel: text().notNull(),
    meaning: text().notNull(),
    /** SHA-256 of the released content, checked equal to protocol_versions.content_hash at signing (§11.70). */
    contentHash: text().notNull(),
    signedAt: timestamp({ withTimezone: true }).notNull(),
    siteTimeZone: text().notNull(),
    /** The same instant as local wall time at the site, with its UTC offset, e.g. "2026-03-29 10:15:00 +02:00". */
    signedAtSiteLocal: text().notNull(),
  },
  (t) => [
    uniqueIndex("electronic_signatures_version_signer_site_key").on(t.versionId, t.signerId, t.siteId),
    uniqueIndex("electronic_signatures_request_key").on(t.requestId),
    index("electronic_signatures_study_site_idx").on(t.studyId, t.siteId),
  ],
);

export const acknowledgementRequestsRelations = relations(acknowledgementRequests, ({ one }) => ({
  site: one(sites, { fields: [acknowledgementRequests.siteId], references: [sites.id] }),
  version: one(protocolVersions, { fields: [acknowledgementRequests.versionId], references: [protocolVersions.id] }),
  user: one(users, { fields: [acknowledgementRequests.userId], references: [users.id] }),
}));
export const electronicSignaturesRelations = relations(electronicSignatures, ({ one }) => ({
  request: one(acknowledgementRequests, { fields: [electronicSignatures.requestId], references: [acknowledgementRequests.id] }),
  signer: one(users, { fields: [electronicSignatures.signerId], references: [users.id] }),
}));

export type AcknowledgementRequest = typeof acknowledgementRequests.$inferSelect;
export type ElectronicSignature = typeof electronicSignatures.$inferSelect;
