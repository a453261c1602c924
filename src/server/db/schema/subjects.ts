import { relations, sql } from "drizzle-orm";
import { date, index, integer, pgEnum, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { subjectStatuses } from "../../../lib/subjects/subject-states";
import { users } from "./people";
import { protocolVersions } from "./protocol";
import { sites, studies } from "./studies";

export const subjectStatusEnum = pgEnum("subject_status", subjectStatuses);
export const visitOutcomeEnum = pgEnum("visit_outcome", ["done", "missed"]);
export const deviationSourceEnum = pgEnum("deviation_source", ["automatic", "manual"]);
export const deviationStatusEnum = pgEnum("deviation_status", ["open", "resolved"]);

/**
 * A study subject, known by a pseudonymous code only (no names, no birth dates). Dates are calendar
 * dates in the site's time zone. `consentVersionId` is the protocol version in force at the site on
 * `consentDate`.
 */
export const subjects = pgTable(
  "subjects",
  {
    id: uuid().primaryKey().defaultRandom(),
    studyId: uuid().notNull().references(() => studies.id),
    siteId: uuid().notNull().references(() => sites.id),
    code: text().notNull(),
    status: subjectStatusEnum().notNull().default("screening"),
    consentDate: date({ mode: "string" }).notNull(),
    consentVersionId: uuid().notNull().references(() => protocolVersions.id),
    screeningDate: date({ mode: "string" }),
    enrolmentDate: date({ mode: "string" }),
    implantDate: date({ mode: "string" }),
    deviceSerial: text(),
    screenFailReason: text(),
    withdrawnReason: text(),
    /** Date of screen failure, withdrawal or completion. */
    endedOn: date({ mode: "string" }),
    createdBy: uuid().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("subjects_study_code_key").on(t.studyId, t.code), index("subjects_site_idx").on(t.siteId)],
);

/** Each status step of a subject, with its date, reason and who recorded it. */
export const subjectStatusEvents = pgTable(
  "subject_status_events",
  {
    id: uuid().primaryKey().defaultRandom(),
    subjectId: uuid().notNull().references(() => subjects.id),
    fromStatus: subjectStatusEnum(),
    toStatus: subjectStatusEnum().notNull(),
    effectiveOn: date({ mode: "string" }).notNull(),
    reason: text(),
    actorId: uuid().references(() => users.id),
    at: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("subject_status_events_subject_idx").on(t.subjectId)],
);

/** A visit recorded as done or missed, under the protocol version whose schedule it followed. */
export const visitRecords = pgTable(
  "visit_records",
  {
    id: uuid().primaryKey().defaultRandom(),
    subjectId: uuid().notNull().references(() => subjects.id),
    visitCode: text().notNull(),
    versionId: uuid().notNull().references(() => protocolVersions.id),
    outcome: visitOutcomeEnum().notNull(),
    actualDate: date({ mode: "string" }),
    dataEnteredOn: date({ mode: "string" }),
    verifiedOn: date({ mode: "string" }),
    verifiedBy: uuid().references(() => users.id),
    recordedBy: uuid().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("visit_records_subject_visit_key").on(t.subjectId, t.visitCode)],
);

/**
 * Protocol deviations. Automatic ones (a visit done outside its window) carry `key`; at most one
 * open deviation per key, enforced by a partial unique index.
 */
export const deviations = pgTable(
  "deviations",
  {
    id: uuid().primaryKey().defaultRandom(),
    studyId: uuid().notNull().references(() => studies.id),
    siteId: uuid().notNull().references(() => sites.id),
    subjectId: uuid().notNull().references(() => subjects.id),
    source: deviationSourceEnum().notNull(),
    key: text(),
    category: text().notNull(),
    visitCode: text(),
    versionId: uuid().references(() => protocolVersions.id),
    occurredOn: date({ mode: "string" }).notNull(),
    windowStart: date({ mode: "string" }),
    windowEnd: date({ mode: "string" }),
    daysOutside: integer(),
    description: text().notNull(),
    status: deviationStatusEnum().notNull().default("open"),
    resolvedAt: timestamp({ withTimezone: true }),
    resolution: text(),
    reportedBy: uuid().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex("deviations_open_key").on(t.key).where(sql`status = 'open' and key is not null`),
    index("deviations_study_idx").on(t.studyId, t.occurredOn),
    index("deviations_subject_idx").on(t.subjectId),
  ],
);

/** A per-user secret calendar-feed address for one site; only the SHA-256 of the token is stored. */
export const calendarFeedTokens = pgTable(
  "calendar_feed_tokens",
  {
    id: uuid().primaryKey().defaultRandom(),
    userId: uuid().notNull().references(() => users.id),
    studyId: uuid().notNull().references(() => studies.id),
    siteId: uuid().notNull().references(() => sites.id),
    tokenHash: text().notNull(),
    label: text().notNull().default(""),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    lastUsedAt: timestamp({ withTimezone: true }),
    revokedAt: timestamp({ withTimezone: true }),
  },
  (t) => [uniqueIndex("calendar_feed_tokens_hash_key").on(t.tokenHash), index("calendar_feed_tokens_user_idx").on(t.userId, t.siteId)],
);

export const subjectsRelations = relations(subjects, ({ one, many }) => ({
  site: one(sites, { fields: [subjects.siteId], references: [sites.id] }),
  visits: many(visitRecords),
  statusEvents: many(subjectStatusEvents),
}));
export const visitRecordsRelations = relations(visitRecords, ({ one }) => ({
  subject: one(subjects, { fields: [visitRecords.subjectId], references: [subjects.id] }),
}));
export const subjectStatusEventsRelations = relations(subjectStatusEvents, ({ one }) => ({
  subject: one(subjects, { fields: [subjectStatusEvents.subjectId], references: [subjects.id] }),
}));

export type Subject = typeof subjects.$inferSelect;
export type VisitRecord = typeof visitRecords.$inferSelect;
export type Deviation = typeof deviations.$inferSelect;
export type CalendarFeedToken = typeof calendarFeedTokens.$inferSelect;
