import { bigint, date, index, pgTable, text, timestamp, uniqueIndex, uuid, type AnyPgColumn } from "drizzle-orm/pg-core";
import { binderDocumentTypes } from "./binder";
import { users } from "./people";
import { sites, studies } from "./studies";

/**
 * A stored file. The row is created when an upload URL is issued (state "pending"), completed
 * after the browser's PUT when the server has read the object back and checked its SHA-256.
 */
export const documents = pgTable(
  "documents",
  {
    id: uuid().primaryKey().defaultRandom(),
    studyId: uuid().notNull().references(() => studies.id),
    siteId: uuid().references(() => sites.id),
    /** What the file is for, e.g. "ethics_approval", "cv", "invoice". */
    purpose: text().notNull(),
    storageKey: text().notNull(),
    fileName: text().notNull(),
    contentType: text().notNull(),
    sizeBytes: bigint({ mode: "number" }).notNull(),
    /** SHA-256 (hex) declared by the uploader and verified against the stored object. */
    sha256: text().notNull(),
    state: text({ enum: ["pending", "stored", "rejected_checksum"] }).notNull().default("pending"),
    uploaderId: uuid().notNull().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    verifiedAt: timestamp({ withTimezone: true }),
    // Binder documents (essential documents of a site): type, whose, dates, versions and review.
    documentTypeId: uuid().references(() => binderDocumentTypes.id),
    /** For per-person types: the person the document belongs to. */
    personId: uuid().references(() => users.id),
    /** The earlier version this upload replaced (set when it is stored); the old one stays readable. */
    supersedesId: uuid().references((): AnyPgColumn => documents.id),
    issuedOn: date({ mode: "string" }),
    /** Last day the document is valid (site calendar date). */
    expiresOn: date({ mode: "string" }),
    reviewState: text({ enum: ["awaiting_review", "accepted", "rejected"] }),
    reviewReason: text(),
    reviewerId: uuid().references(() => users.id),
    reviewedAt: timestamp({ withTimezone: true }),
  },
  (t) => [
    uniqueIndex("documents_storage_key").on(t.storageKey),
    index("documents_study_site_idx").on(t.studyId, t.siteId),
    index("documents_site_type_idx").on(t.siteId, t.documentTypeId),
  ],
);

export type DocumentRow = typeof documents.$inferSelect;
