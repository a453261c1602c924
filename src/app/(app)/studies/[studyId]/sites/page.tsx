import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { listSitesForStudy } from "@/server/studies/queries";
import { accessibleSiteIds, canSomewhere } from "@/lib/auth/authorize";
import { SiteStatusChip } from "@/components/site-status-chip";

export const metadata: Metadata = { title: "Sites" };

export default async function SitesPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "sites.read", studyId)) notFound();
  const rows = await listSitesForStudy(db, { studyId, siteIds: accessibleSiteIds(actor, "sites.read", studyId) });
  return (
    <div className="space-y-4">
      <h1>Sites</h1>
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
              <td className="font-mono">{s.code}</td>
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
    </div>
  );
}
