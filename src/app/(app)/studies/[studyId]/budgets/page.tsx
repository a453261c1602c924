import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { listStudyBudgets } from "@/server/budgets/queries";
import { accessibleSiteIds, canSomewhere } from "@/lib/auth/authorize";
import { studyPath } from "@/lib/nav";
import { bpsToPercent, cycleLabels, triggerLabels } from "@/lib/budgets";
import { StatusChip } from "@/components/status-chip";

export const metadata: Metadata = { title: "Budgets" };

export default async function BudgetsPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "budget.read", studyId)) notFound();
  const rows = await listStudyBudgets(db, { studyId, siteIds: accessibleSiteIds(actor, "budget.read", studyId) });
  return (
    <div className="space-y-4">
      <h1>Budgets</h1>
      <p className="governs">Each site&apos;s signed clinical trial agreement governs its payments; the budget here is Cairn&apos;s copy of its payment schedule.</p>
      <table className="table-dense" data-testid="budgets-table">
        <thead>
          <tr>
            <th>Site</th>
            <th>Currency</th>
            <th>Budget</th>
            <th>In effect from</th>
            <th className="text-right">Overhead</th>
            <th className="text-right">Holdback</th>
            <th>Cycle</th>
            <th>Trigger</th>
          </tr>
        </thead>
        <tbody>
          {rows.map(({ site, latest, versionCount }) => (
            <tr key={site.id}>
              <td>
                <Link className="underline" href={studyPath(studyId, `budgets/${site.id}`)}>
                  <span className="font-mono">{site.code}</span> {site.name}
                </Link>
              </td>
              <td>{site.currency}</td>
              <td>{latest ? <StatusChip tone="ok">Version {latest.versionNumber} of {versionCount}</StatusChip> : <StatusChip tone="attention">No budget yet</StatusChip>}</td>
              <td>{latest?.effectiveFrom ?? "—"}</td>
              <td className="amount">{latest ? `${bpsToPercent(latest.overheadBps)}%` : "—"}</td>
              <td className="amount">{latest ? `${bpsToPercent(latest.holdbackBps)}%` : "—"}</td>
              <td>{latest ? `${cycleLabels[latest.cycle]}, net ${latest.netDays} days` : "—"}</td>
              <td>{latest ? triggerLabels[latest.trigger] : "—"}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
