import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { listSitesForStudy } from "@/server/studies/queries";
import { enrolmentOverview } from "@/server/sites/enrolment-overview";
import { accessibleSiteIds, can, canSomewhere } from "@/lib/auth/authorize";
import { studyPath } from "@/lib/nav";
import { SiteStatusChip } from "@/components/site-status-chip";
import { EnrolmentChart } from "./_components/enrolment-chart";
import { SiteForm } from "./_components/site-form";

export const metadata: Metadata = { title: "Sites" };

export default async function SitesPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "sites.read", studyId)) notFound();
  const rows = await listSitesForStudy(db, { studyId, siteIds: accessibleSiteIds(actor, "sites.read", studyId) });
  const enrolment = canSomewhere(actor, "subjects.read", studyId) ? await enrolmentOverview(db, { studyId, siteIds: accessibleSiteIds(actor, "subjects.read", studyId) }) : null;
  const canManage = can(actor, "sites.manage", { studyId });
  return (
    <div className="space-y-6">
      <h1>Sites</h1>
      {canManage && <SiteForm studyId={studyId} />}
      <table className="table-dense" data-testid="sites-table">
        <thead>
          <tr>
            <th>Code</th>
            <th>Name</th>
            <th>Country</th>
            <th>Time zone</th>
            <th>Currency</th>
            <th className="text-right">Target enrolment</th>
            <th>Status</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((s) => (
            <tr key={s.id}>
              <td className="font-mono">
                <Link className="underline" href={studyPath(studyId, `sites/${s.id}`)}>
                  {s.code}
                </Link>
              </td>
              <td>{s.name}</td>
              <td>{s.country}</td>
              <td>{s.timeZone}</td>
              <td>{s.currency}</td>
              <td className="amount">{s.targetEnrolment}</td>
              <td>
                <SiteStatusChip status={s.status} />
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {enrolment && (
        <section className="card space-y-2" aria-labelledby="enrolment-heading">
          <h2 id="enrolment-heading">Enrolment overview</h2>
          <EnrolmentChart rows={enrolment} />
        </section>
      )}
    </div>
  );
}
