import "server-only";
import { asc, desc, eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { deviations, protocolVersions, subjectStatusEvents, users } from "@/server/db/schema";
import { notFound } from "@/server/api/errors";
import { loadCalendars } from "@/server/visits/load-calendars";
import { allowedNextStatuses } from "@/lib/subjects/subject-states";

/** A subject with its visit calendar, status history, deviations and consent version. */
export async function getSubjectDetail(tx: Tx, { subjectId, now }: { subjectId: string; now?: Date }) {
  const [loaded] = await loadCalendars(tx, { subjectIds: [subjectId], now });
  if (!loaded) throw notFound("That subject");
  const { subject, site, calendar, versions } = loaded;
  const [consentVersion, history, devs] = await Promise.all([
    tx.select({ id: protocolVersions.id, versionLabel: protocolVersions.versionLabel }).from(protocolVersions).where(eq(protocolVersions.id, subject.consentVersionId)),
    tx
      .select({ fromStatus: subjectStatusEvents.fromStatus, toStatus: subjectStatusEvents.toStatus, effectiveOn: subjectStatusEvents.effectiveOn, reason: subjectStatusEvents.reason, at: subjectStatusEvents.at, actorName: users.name })
      .from(subjectStatusEvents)
      .leftJoin(users, eq(users.id, subjectStatusEvents.actorId))
      .where(eq(subjectStatusEvents.subjectId, subjectId))
      .orderBy(asc(subjectStatusEvents.effectiveOn), asc(subjectStatusEvents.at)),
    tx.select().from(deviations).where(eq(deviations.subjectId, subjectId)).orderBy(desc(deviations.occurredOn)),
  ]);
  return {
    subject,
    site: { id: site.id, code: site.code, name: site.name, timeZone: site.timeZone, status: site.status },
    consentVersion: consentVersion[0] ?? null,
    versionsAtSite: versions.map((v) => ({ versionId: v.versionId, versionLabel: v.versionLabel, inForceFrom: v.inForceFrom })),
    calendar,
    history,
    deviations: devs,
    nextStatuses: allowedNextStatuses(subject.status),
  };
}
export type SubjectDetail = Awaited<ReturnType<typeof getSubjectDetail>>;
