import { relations } from "drizzle-orm";
import { boolean, index, pgTable, text, timestamp, uuid, uniqueIndex } from "drizzle-orm/pg-core";
import { roleEnum } from "./enums";
import { sites, studies } from "./studies";

export const users = pgTable(
  "users",
  {
    id: uuid().primaryKey().defaultRandom(),
    /** Stored lower-case; unique. */
    email: text().notNull(),
    /** Printed name, as it appears on electronic signatures. */
    name: text().notNull(),
    passwordHash: text(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    disabledAt: timestamp({ withTimezone: true }),
  },
  (t) => [uniqueIndex("users_email_key").on(t.email)],
);

/** Roles are held per study; site roles also per site (siteId null = study-wide). */
export const memberships = pgTable(
  "memberships",
  {
    id: uuid().primaryKey().defaultRandom(),
    userId: uuid().notNull().references(() => users.id),
    studyId: uuid().notNull().references(() => studies.id),
    siteId: uuid().references(() => sites.id),
    role: roleEnum().notNull(),
    grantedBy: uuid().references(() => users.id),
    grantedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    revokedBy: uuid().references(() => users.id),
    revokedAt: timestamp({ withTimezone: true }),
  },
  (t) => [index("memberships_user_idx").on(t.userId), index("memberships_study_site_idx").on(t.studyId, t.siteId)],
);

/** Every sign-in attempt; throttling counts recent failures here (no in-memory state). */
export const signInAttempts = pgTable(
  "sign_in_attempts",
  {
    id: uuid().primaryKey().defaultRandom(),
    email: text().notNull(),
    ip: text(),
    succeeded: boolean().notNull(),
    at: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("sign_in_attempts_email_at_idx").on(t.email, t.at)],
);

/** Invitation links: only the SHA-256 of the token is stored. */
export const invitations = pgTable(
  "invitations",
  {
    id: uuid().primaryKey().defaultRandom(),
    userId: uuid().notNull().references(() => users.id),
    tokenHash: text().notNull(),
    expiresAt: timestamp({ withTimezone: true }).notNull(),
    usedAt: timestamp({ withTimezone: true }),
    createdBy: uuid().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("invitations_token_hash_key").on(t.tokenHash)],
);

export const usersRelations = relations(users, ({ many }) => ({ memberships: many(memberships) }));
export const membershipsRelations = relations(memberships, ({ one }) => ({
  user: one(users, { fields: [memberships.userId], references: [users.id] }),
  study: one(studies, { fields: [memberships.studyId], references: [studies.id] }),
  site: one(sites, { fields: [memberships.siteId], references: [sites.id] }),
}));

export type User = typeof users.$inferSelect;
export type Membership = typeof memberships.$inferSelect;
