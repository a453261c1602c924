import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { sites, type Subject } from "@/server/db/schema";
import { loadCalendars } from "@/server/visits/load-calendars";
import type { SubjectStatus } from "@/lib/subjects/subject-states";

export type SubjectSummary = Pick<Subject, "id" | "code" | "status" | "consentDate" | "enrolmentDate" | "implantDate" | "endedOn" | "siteId"> & {
  siteCode: string;
  nextVisit: { visitCode: string; targetDate: string | null; state: string } | null;
  overdue: number;
  outOfWindow: number;
};

/** Subjects at the given sites (or all of the study's sites), each with its next visit and counts. */
export async function listSubjects(tx: Tx, { studyId, siteIds, status, now }: { studyId: string; siteIds: "all" | string[]; status?: SubjectStatus; now?: Date }): Promise<SubjectSummary[]> {
  const siteRows = await tx
    .select({ id: sites.id })
    .from(sites)
    .where(and(eq(sites.studyId, studyId), siteIds === "all" ? undefined : inArray(sites.id, siteIds.length ? siteIds : ["00000000-0000-0000-0000-000000000000"])));
  const loaded = await loadCalendars(tx, { siteIds: siteRows.map((s) => s.id), now });
  return loaded
    .filter((l) => !status || l.subject.status === status)
    .map(({ subject, site, calendar }) => {
      const pending = calendar.entries.find((e) => e.state === "overdue" || e.state === "due" || e.state === "upcoming");
      return {
        id: subject.id,
        code: subject.code,
        status: subject.status,
        consentDate: subject.consentDate,
        enrolmentDate: subject.enrolmentDate,
        implantDate: subject.implantDate,
        endedOn: subject.endedOn,
        siteId: subject.siteId,
        siteCode: site.code,
        nextVisit: pending ? { visitCode: pending.visitCode, targetDate: pending.targetDate, state: pending.state } : null,
        overdue: calendar.entries.filter((e) => e.state === "overdue").length,
        outOfWindow: calendar.entries.filter((e) => e.state === "completed_out_of_window").length,
      };
    });
}
