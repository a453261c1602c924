import { bigserial, index, jsonb, pgTable, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { users } from "./people";

/**
 * Append-only audit trail (21 CFR Part 11 §11.10(e) as the model): a trigger in the
 * migrations rejects UPDATE and DELETE. Written in the same transaction as the change.
 */
export const auditEvents = pgTable(
  "audit_events",
  {
    id: bigserial({ mode: "number" }).primaryKey(),
    at: timestamp({ withTimezone: true }).notNull().defaultNow(),
    actorId: uuid().references(() => users.id),
    /** Printed name at the time, so the record reads on its own. */
    actorName: text(),
    action: text().notNull(),
    entityType: text().notNull(),
    entityId: text().notNull(),
    studyId: uuid(),
    siteId: uuid(),
    before: jsonb(),
    after: jsonb(),
  },
  (t) => [
    index("audit_events_at_idx").on(t.at),
    index("audit_events_entity_idx").on(t.entityType, t.entityId),
    index("audit_events_study_site_idx").on(t.studyId, t.siteId),
  ],
);

export type AuditEvent = typeof auditEvents.$inferSelect;
