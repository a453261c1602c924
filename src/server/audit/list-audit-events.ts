import "server-only";
import { and, count, desc, eq, gte, ilike, lt, type SQL } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { auditEvents } from "@/server/db/schema";
import type { AuditQuery } from "@/lib/api/schemas";

export async function listAuditEvents(tx: Tx, { studyId, query }: { studyId: string; query: AuditQuery }) {
  const where: SQL[] = [eq(auditEvents.studyId, studyId)];
  if (query.action) where.push(ilike(auditEvents.action, `%${query.action}%`));
  if (query.entityType) where.push(eq(auditEvents.entityType, query.entityType));
  if (query.actor) where.push(ilike(auditEvents.actorName, `%${query.actor}%`));
  if (query.siteId) where.push(eq(auditEvents.siteId, query.siteId));
  if (query.from) where.push(gte(auditEvents.at, new Date(`${query.from}T00:00:00Z`)));
  if (query.to) where.push(lt(auditEvents.at, new Date(new Date(`${query.to}T00:00:00Z`).getTime() + 86_400_000)));
  const cond = and(...where);
  const [total] = await tx.select({ n: count() }).from(auditEvents).where(cond);
  const rows = await tx
    .select()
    .from(auditEvents)
    .where(cond)
    .orderBy(desc(auditEvents.id))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  return { rows, total: total?.n ?? 0, page: query.page, pageSize: query.pageSize };
}

export async function listRecentAuditEvents(tx: Tx, { studyId, limit }: { studyId: string; limit: number }) {
  return tx.select().from(auditEvents).where(eq(auditEvents.studyId, studyId)).orderBy(desc(auditEvents.id)).limit(limit);
}
