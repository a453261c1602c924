import "server-only";
import type { Tx } from "@/server/db/client";
import { listSitesForStudy } from "@/server/studies/queries";
import { loadCalendars } from "@/server/visits/load-calendars";
import type { SiteStatus } from "@/lib/sites/site-status";

export type SiteEnrolment = {
  siteId: string;
  code: string;
  name: string;
  status: SiteStatus;
  target: number;
  screened: number;
  screenFailed: number;
  enrolled: number;
  implanted: number;
  withdrawn: number;
  completed: number;
  overdueVisits: number;
  dueVisits: number;
};

/** Enrolment against target and visit backlog, per site the caller may see. */
export async function enrolmentOverview(tx: Tx, { studyId, siteIds, now }: { studyId: string; siteIds: "all" | string[]; now?: Date }): Promise<SiteEnrolment[]> {
  const siteRows = await listSitesForStudy(tx, { studyId, siteIds });
  const loaded = await loadCalendars(tx, { siteIds: siteRows.map((s) => s.id), now });
  const bySite = new Map<string, SiteEnrolment>(
    siteRows.map((s) => [
      s.id,
      { siteId: s.id, code: s.code, name: s.name, status: s.status, target: s.targetEnrolment, screened: 0, screenFailed: 0, enrolled: 0, implanted: 0, withdrawn: 0, completed: 0, overdueVisits: 0, dueVisits: 0 },
    ]),
  );
  for (const { subject, calendar } of loaded) {
    const row = bySite.get(subject.siteId)!;
    row.screened++;
    if (subject.status === "screen_failed") row.screenFailed++;
    if (subject.enrolmentDate) row.enrolled++;
    if (subject.implantDate) row.implanted++;
    if (subject.status === "withdrawn") row.withdrawn++;
    if (subject.status === "completed") row.completed++;
    for (const e of calendar.entries) {
      if (e.state === "overdue") row.overdueVisits++;
      else if (e.state === "due") row.dueVisits++;
    }
  }
  return [...bySite.values()];
}
