import "server-only";
import { toCsv, type CsvValue } from "@/lib/csv";
import { and, desc, eq, gte, ilike, inArray, lte } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { deviations, protocolVersions, sites, subjects, users, type Deviation } from "@/server/db/schema";
import { conflict, notFound, unprocessable } from "@/server/api/errors";
import { loadSubjectForUpdate } from "@/server/subjects/load-subject";
import { todayAtSite } from "@/server/sites/site-today";
import type { Actor } from "@/lib/auth/authorize";
import type { CreateDeviationInput, DeviationListQuery } from "./visit-schemas";

/** The deviation log of a study, filtered, limited to the sites the caller may see. */
export async function listDeviations(tx: Tx, { studyId, siteIds, filter }: { studyId: string; siteIds: "all" | string[]; filter: Omit<DeviationListQuery, "format"> }) {
  if (siteIds !== "all" && siteIds.length === 0) return [];
  return tx
    .select({
      id: deviations.id,
      siteCode: sites.code,
      subjectId: deviations.subjectId,
      subjectCode: subjects.code,
      source: deviations.source,
      category: deviations.category,
      visitCode: deviations.visitCode,
      versionLabel: protocolVersions.versionLabel,
      occurredOn: deviations.occurredOn,
      windowStart: deviations.windowStart,
      windowEnd: deviations.windowEnd,
      daysOutside: deviations.daysOutside,
      description: deviations.description,
      status: deviations.status,
      resolution: deviations.resolution,
      resolvedAt: deviations.resolvedAt,
      reportedBy: users.name,
      createdAt: deviations.createdAt,
    })
    .from(deviations)
    .innerJoin(sites, eq(sites.id, deviations.siteId))
    .innerJoin(subjects, eq(subjects.id, deviations.subjectId))
    .leftJoin(protocolVersions, eq(protocolVersions.id, deviations.versionId))
    .leftJoin(users, eq(users.id, deviations.reportedBy))
    .where(
      and(
        eq(deviations.studyId, studyId),
        siteIds === "all" ? undefined : inArray(deviations.siteId, siteIds),
        filter.siteId ? eq(deviations.siteId, filter.siteId) : undefined,
        filter.status ? eq(deviations.status, filter.status) : undefined,
        filter.source ? eq(deviations.source, filter.source) : undefined,
        filter.category ? eq(deviations.category, filter.category) : undefined,
        filter.subject ? ilike(subjects.code, `%${filter.subject.replace(/[%_\\]/g, "\\$&")}%`) : undefined,
        filter.from ? gte(deviations.occurredOn, filter.from) : undefined,
        filter.to ? lte(deviations.occurredOn, filter.to) : undefined,
      ),
    )
    .orderBy(desc(deviations.occurredOn), sites.code, subjects.code)
    .limit(5000);
}
export type DeviationRow = Awaited<ReturnType<typeof listDeviations>>[number];

export function deviationsToCsv(rows: DeviationRow[]): string {
  const header = ["site", "subject", "source", "category", "visit", "protocol_version", "occurred_on", "window_start", "window_end", "days_outside", "status", "description", "resolution", "reported_by"];
  const at = (v: unknown) => (v instanceof Date ? v.toISOString() : (v as CsvValue));
  const data = rows.map((r) => [r.siteCode, r.subjectCode, r.source, r.category, r.visitCode, r.versionLabel, r.occurredOn, r.windowStart, r.windowEnd, r.daysOutside, r.status, r.description, r.resolution, r.reportedBy].map(at));
  return toCsv(header, data);
}

/** A deviation reported by the site or the monitor (anything but a visit out of window). */
export async function createManualDeviation(tx: Tx, { subjectId, input, actor, now = new Date() }: { subjectId: string; input: CreateDeviationInput; actor: Actor; now?: Date }): Promise<Deviation> {
  const { subject, site } = await loadSubjectForUpdate(tx, { subjectId });
  const today = todayAtSite(site.timeZone, now);
  if (input.occurredOn > today) throw unprocessable(`Not after today at the site (${today}).`, { occurredOn: [`Not after ${today}`] });
  if (input.occurredOn < subject.consentDate) throw unprocessable("A deviation concerning a subject happens on or after consent.", { occurredOn: [`On or after ${subject.consentDate}`] });
  const [row] = await tx
    .insert(deviations)
    .values({ studyId: subject.studyId, siteId: subject.siteId, subjectId, source: "manual", category: input.category, visitCode: input.visitCode ?? null, occurredOn: input.occurredOn, description: input.description, reportedBy: actor.userId })
    .returning();
  return row!;
}

export async function deviationScope(tx: Tx, { deviationId }: { deviationId: string }) {
  const [row] = await tx.select({ studyId: deviations.studyId, siteId: deviations.siteId }).from(deviations).where(eq(deviations.id, deviationId));
  if (!row) throw notFound("That deviation");
  return row;
}

/** Closes a manual deviation with what was done; automatic ones close when the visit is corrected. */
export async function resolveDeviation(tx: Tx, { deviationId, resolution, now = new Date() }: { deviationId: string; resolution: string; now?: Date }) {
  const [before] = await tx.select().from(deviations).where(eq(deviations.id, deviationId)).for("update");
  if (!before) throw notFound("That deviation");
  if (before.status === "resolved") throw conflict("This deviation is already resolved.");
  if (before.source === "automatic") throw conflict("A visit-window deviation is resolved by correcting the visit date; it stays on the record otherwise.");
  const [after] = await tx.update(deviations).set({ status: "resolved", resolution, resolvedAt: now, updatedAt: now }).where(eq(deviations.id, deviationId)).returning();
  return { before, after: after! };
}
