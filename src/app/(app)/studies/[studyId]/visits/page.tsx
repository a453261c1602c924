import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { listSitesForStudy } from "@/server/studies/queries";
import { listSiteVisits } from "@/server/visits/site-visit-list";
import { accessibleSiteIds, canSomewhere } from "@/lib/auth/authorize";
import { studyPath } from "@/lib/nav";
import { protocolGovernsNotice } from "@/lib/visits/ical";
import { VisitStateChip } from "../subjects/_components/subject-status-chip";
import { CalendarFeeds } from "./_components/calendar-feeds";
import { DeviationLog } from "./_components/deviation-log";

export const metadata: Metadata = { title: "Visits" };

export default async function VisitsPage({ params, searchParams }: { params: Promise<{ studyId: string }>; searchParams: Promise<{ siteId?: string; weeks?: string }> }) {
  const { studyId } = await params;
  const query = await searchParams;
  const { actor } = await getStudyContext(studyId);
  const canCalendar = canSomewhere(actor, "calendar.read", studyId);
  const canDeviations = canSomewhere(actor, "deviations.read", studyId);
  if (!canCalendar && !canDeviations) notFound();
  const calendarSites = canCalendar ? await listSitesForStudy(db, { studyId, siteIds: accessibleSiteIds(actor, "calendar.read", studyId) }) : [];
  const site = calendarSites.find((s) => s.id === query.siteId) ?? calendarSites.find((s) => s.status === "open") ?? calendarSites[0];
  const weeks = Math.min(26, Math.max(1, Number(query.weeks) || 4));
  const list = site ? await listSiteVisits(db, { siteId: site.id, weeks }) : null;
  const deviationSites = canDeviations ? await listSitesForStudy(db, { studyId, siteIds: accessibleSiteIds(actor, "deviations.read", studyId) }) : [];
  return (
    <div className="space-y-8">
      <h1>Visits</h1>
      {list && site && (
        <section className="space-y-3" aria-labelledby="plan-heading">
          <h2 id="plan-heading">
            Visits to plan at {site.code}, next {weeks} weeks
          </h2>
          <form className="flex flex-wrap items-end gap-2" method="get">
            <label className="field">
              <span>Site</span>
              <select className="input" name="siteId" defaultValue={site.id}>
                {calendarSites.map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.code} {s.name}
                  </option>
                ))}
              </select>
            </label>
            <label className="field">
              <span>Weeks ahead</span>
              <input className="input w-24" type="number" name="weeks" min={1} max={26} defaultValue={weeks} />
            </label>
            <button className="btn-secondary">Show</button>
          </form>
          <p className="text-sm">
            Today at the site: {list.asOf}. Overdue and due visits, then upcoming ones whose window opens by {list.horizon}.
          </p>
          <p className="governs">{protocolGovernsNotice}</p>
          <table className="table-dense" data-testid="site-visit-list">
            <thead>
              <tr>
                <th>Subject</th>
                <th>Visit</th>
                <th>Target</th>
                <th>Window</th>
                <th>State</th>
                <th>Version</th>
              </tr>
            </thead>
            <tbody>
              {list.visits.map((v) => (
                <tr key={`${v.subjectId}-${v.visitCode}`}>
                  <td>
                    <Link className="font-mono underline" href={studyPath(studyId, `subjects/${v.subjectId}`)}>
                      {v.subjectCode}
                    </Link>
                  </td>
                  <td>
                    <span className="font-mono">{v.visitCode}</span> {v.label}
                  </td>
                  <td className="font-mono">{v.targetDate}</td>
                  <td className="font-mono">
                    {v.windowStart} – {v.windowEnd}
                  </td>
                  <td>
                    <VisitStateChip state={v.state} />
                  </td>
                  <td>{v.versionLabel}</td>
                </tr>
              ))}
              {list.visits.length === 0 && (
                <tr>
                  <td colSpan={6}>Nothing due in this period.</td>
                </tr>
              )}
            </tbody>
          </table>
          <details className="card">
            <summary className="cursor-pointer font-semibold">Calendar subscription (iCalendar)</summary>
            <CalendarFeeds siteId={site.id} siteCode={site.code} />
          </details>
        </section>
      )}
      {canDeviations && (
        <section className="space-y-3" aria-labelledby="deviations-heading">
          <h2 id="deviations-heading">Deviation log</h2>
          <DeviationLog studyId={studyId} sites={deviationSites.map((s) => ({ id: s.id, code: s.code }))} />
        </section>
      )}
    </div>
  );
}
