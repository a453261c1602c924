import "server-only";
import { and, eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { deviations } from "@/server/db/schema";
import type { AuditEntry } from "@/server/audit/record-audit";
import { reconcileDeviations, visitOutOfWindowCategory } from "@/lib/visits/deviations";
import { loadCalendars } from "./load-calendars";

type Audit = (entry: AuditEntry) => Promise<void>;

/**
 * After any change to a subject's dates or visits: open a deviation for each visit now done out of
 * its window (one per visit, guarded by a partial unique index), update those whose dates changed,
 * and resolve those that are back inside their window.
 */
export async function reconcileSubjectDeviations(tx: Tx, { subjectId, audit, now = new Date() }: { subjectId: string; audit: Audit; now?: Date }) {
  const [loaded] = await loadCalendars(tx, { subjectIds: [subjectId], now });
  if (!loaded) return { opened: 0, updated: 0, resolved: 0 };
  const { subject, calendar } = loaded;
  const open = await tx
    .select()
    .from(deviations)
    .where(and(eq(deviations.subjectId, subjectId), eq(deviations.source, "automatic"), eq(deviations.status, "open")));
  const changes = reconcileDeviations(
    open.map((d) => ({ id: d.id, key: d.key!, subjectCode: subject.code, status: d.status, daysOutside: d.daysOutside ?? 0, actualDate: d.occurredOn })),
    [calendar],
  );
  for (const d of changes.toOpen) {
    const [row] = await tx
      .insert(deviations)
      .values({
        studyId: subject.studyId,
        siteId: subject.siteId,
        subjectId,
        source: "automatic",
        key: d.key,
        category: visitOutOfWindowCategory,
        visitCode: d.visitCode,
        versionId: d.versionId,
        occurredOn: d.actualDate,
        windowStart: d.windowStart,
        windowEnd: d.windowEnd,
        daysOutside: d.daysOutside,
        description: d.description,
      })
      .returning();
    await audit({ action: "deviation.open", entityType: "deviation", entityId: row!.id, siteId: subject.siteId, after: row });
  }
  for (const { existing, deviation } of changes.toUpdate) {
    const before = open.find((o) => o.id === existing.id);
    const [row] = await tx
      .update(deviations)
      .set({ occurredOn: deviation.actualDate, windowStart: deviation.windowStart, windowEnd: deviation.windowEnd, daysOutside: deviation.daysOutside, description: deviation.description, updatedAt: now })
      .where(eq(deviations.id, existing.id))
      .returning();
    await audit({ action: "deviation.update", entityType: "deviation", entityId: existing.id, siteId: subject.siteId, before, after: row });
  }
  for (const { existing, reason } of changes.toResolve) {
    const before = open.find((o) => o.id === existing.id);
    const [row] = await tx.update(deviations).set({ status: "resolved", resolvedAt: now, resolution: reason, updatedAt: now }).where(eq(deviations.id, existing.id)).returning();
    await audit({ action: "deviation.resolve", entityType: "deviation", entityId: existing.id, siteId: subject.siteId, before, after: row });
  }
  return { opened: changes.toOpen.length, updated: changes.toUpdate.length, resolved: changes.toResolve.length };
}
