import "server-only";
import { auditEvents } from "@/server/db/schema";
import type { Tx } from "@/server/db/client";
import type { Actor } from "@/lib/auth/authorize";

export type AuditEntry = {
  action: string;
  entityType: string;
  entityId: string;
  studyId?: string | null;
  siteId?: string | null;
  before?: unknown;
  after?: unknown;
};

/** JSON-safe copy: bigint money becomes a decimal string, Dates ISO strings. */
export function jsonSafe(value: unknown): unknown {
  if (value === undefined) return null;
  return JSON.parse(JSON.stringify(value, (_k, v) => (typeof v === "bigint" ? v.toString() : v)));
}

/** Append one audit event; call inside the transaction that makes the change. */
export async function recordAudit(tx: Tx, actor: Pick<Actor, "userId" | "name"> | null, entry: AuditEntry) {
  await tx.insert(auditEvents).values({
    actorId: actor?.userId ?? null,
    actorName: actor?.name ?? "system",
    action: entry.action,
    entityType: entry.entityType,
    entityId: entry.entityId,
    studyId: entry.studyId ?? null,
    siteId: entry.siteId ?? null,
    before: jsonSafe(entry.before),
    after: jsonSafe(entry.after),
  });
}
