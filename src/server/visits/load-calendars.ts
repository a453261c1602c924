import "server-only";
import { asc, eq, inArray } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { sites, subjects, visitRecords, type Site, type Subject } from "@/server/db/schema";
import { listVersionsInForceAtSites, type VersionInForceAtSite } from "@/server/protocol/in-force";
import { todayAtSite } from "@/server/sites/site-today";
import { computeSubjectCalendar, type RecordedVisit, type SubjectCalendar } from "@/lib/visits/subject-calendar";

// Loads what the visit-calendar library needs for a set of subjects (three queries whatever the
// number of subjects) and computes each calendar as of today at the subject's site.

export const DUE_SOON_DAYS = 14;

export type SubjectWithCalendar = { subject: Subject; site: Site; calendar: SubjectCalendar; versions: VersionInForceAtSite[] };

type Filter = { siteIds: readonly string[]; subjectIds?: undefined } | { subjectIds: readonly string[]; siteIds?: undefined };

export async function loadCalendars(tx: Tx, filter: Filter & { now?: Date; asOf?: string }): Promise<SubjectWithCalendar[]> {
  const ids = filter.siteIds ?? filter.subjectIds;
  if (ids.length === 0) return [];
  const where = filter.siteIds ? inArray(subjects.siteId, [...filter.siteIds]) : inArray(subjects.id, [...filter.subjectIds!]);
  const recordsQuery = tx
    .select({
      subjectId: visitRecords.subjectId,
      visitCode: visitRecords.visitCode,
      versionId: visitRecords.versionId,
      status: visitRecords.outcome,
      actualDate: visitRecords.actualDate,
      dataEnteredOn: visitRecords.dataEnteredOn,
      verifiedOn: visitRecords.verifiedOn,
    })
    .from(visitRecords)
    .innerJoin(subjects, eq(subjects.id, visitRecords.subjectId))
    .where(where);
  // By site, every query can start at once; by subject, the sites are known only from the subjects.
  let subjectRows: Subject[];
  let siteRows: Site[];
  let versionsBySite: Map<string, VersionInForceAtSite[]>;
  let recordRows: Awaited<typeof recordsQuery>;
  if (filter.siteIds) {
    const siteIds = [...filter.siteIds];
    [subjectRows, siteRows, versionsBySite, recordRows] = await Promise.all([
      tx.select().from(subjects).where(where).orderBy(asc(subjects.code)),
      tx.select().from(sites).where(inArray(sites.id, siteIds)),
      listVersionsInForceAtSites(tx, { siteIds }),
      recordsQuery,
    ]);
  } else {
    subjectRows = await tx.select().from(subjects).where(where).orderBy(asc(subjects.code));
    if (subjectRows.length === 0) return [];
    const siteIds = [...new Set(subjectRows.map((s) => s.siteId))];
    [siteRows, versionsBySite, recordRows] = await Promise.all([tx.select().from(sites).where(inArray(sites.id, siteIds)), listVersionsInForceAtSites(tx, { siteIds }), recordsQuery]);
  }
  if (subjectRows.length === 0) return [];
  const siteById = new Map(siteRows.map((s) => [s.id, s]));
  const recordsBySubject = new Map<string, RecordedVisit[]>();
  for (const { subjectId, ...r } of recordRows) {
    const list = recordsBySubject.get(subjectId);
    if (list) list.push(r);
    else recordsBySubject.set(subjectId, [r]);
  }
  const now = filter.now ?? new Date();
  const todayBySite = new Map(siteRows.map((s) => [s.id, filter.asOf ?? todayAtSite(s.timeZone, now)]));
  const noVersions: VersionInForceAtSite[] = [];
  return subjectRows.map((subject) => {
    const versions = versionsBySite.get(subject.siteId) ?? noVersions;
    const calendar = computeSubjectCalendar({
      subjectCode: subject.code,
      status: subject.status,
      endedOn: subject.endedOn,
      anchors: { consentDate: subject.consentDate, enrolmentDate: subject.enrolmentDate, implantDate: subject.implantDate },
      versions,
      recordedVisits: recordsBySubject.get(subject.id) ?? [],
      asOf: todayBySite.get(subject.siteId)!,
      dueSoonDays: DUE_SOON_DAYS,
    });
    return { subject, site: siteById.get(subject.siteId)!, calendar, versions };
  });
}
