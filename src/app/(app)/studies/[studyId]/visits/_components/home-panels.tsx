import Link from "next/link";
import { db } from "@/server/db/client";
import { listSitesForStudy } from "@/server/studies/queries";
import { enrolmentOverview } from "@/server/sites/enrolment-overview";
import { listSiteVisits } from "@/server/visits/site-visit-list";
import { accessibleSiteIds, type Actor } from "@/lib/auth/authorize";
import { studyPath } from "@/lib/nav";
import { VisitStateChip } from "../../subjects/_components/subject-status-chip";

/** Coordinators: overdue visits and those due within the coming week at their sites. */
export async function SiteWeekVisitsPanel({ studyId, actor }: { studyId: string; actor: Actor }) {
  const ids = accessibleSiteIds(actor, "visits.record", studyId);
  const sites = (await listSitesForStudy(db, { studyId, siteIds: ids })).filter((s) => s.status !== "proposed");
  const lists = await Promise.all(sites.map((s) => listSiteVisits(db, { siteId: s.id, weeks: 1 })));
  const rows = lists.flatMap((l) => l.visits.filter((v) => v.state === "overdue" || v.state === "due" || v.state === "upcoming").map((v) => ({ ...v, siteCode: l.site.code })));
  if (rows.length === 0) return <p className="text-sm">No visits due or overdue this week.</p>;
  return (
    <table className="table-dense" data-testid="panel-week-visits">
      <thead>
        <tr>
          <th>Subject</th>
          <th>Visit</th>
          <th>Window</th>
          <th>State</th>
        </tr>
      </thead>
      <tbody>
        {rows.slice(0, 15).map((v) => (
          <tr key={`${v.subjectId}-${v.visitCode}`}>
            <td>
              <Link className="font-mono underline" href={studyPath(studyId, `subjects/${v.subjectId}`)}>
                {v.subjectCode}
              </Link>
            </td>
            <td className="font-mono">{v.visitCode}</td>
            <td className="font-mono text-xs">
              {v.windowStart} – {v.windowEnd}
            </td>
            <td>
              <VisitStateChip state={v.state} />
            </td>
          </tr>
        ))}
        {rows.length > 15 && (
          <tr>
            <td colSpan={4}>
              <Link className="underline" href={studyPath(studyId, "visits")}>
                {rows.length - 15} more
              </Link>
            </td>
          </tr>
        )}
      </tbody>
    </table>
  );
}

/** Sponsor: enrolment against target and overdue visits by site. */
export async function EnrolmentBySitePanel({ studyId, actor }: { studyId: string; actor: Actor }) {
  const rows = (await enrolmentOverview(db, { studyId, siteIds: accessibleSiteIds(actor, "subjects.read", studyId) })).filter((r) => r.screened > 0 || r.target > 0);
  return (
    <table className="table-dense" data-testid="panel-enrolment">
      <thead>
        <tr>
          <th>Site</th>
          <th className="text-right">Enrolled / target</th>
          <th className="text-right">Overdue visits</th>
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={r.siteId}>
            <td className="font-mono">{r.code}</td>
            <td className="amount">
              {r.enrolled} / {r.target}
            </td>
            <td className="amount">{r.overdueVisits}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
