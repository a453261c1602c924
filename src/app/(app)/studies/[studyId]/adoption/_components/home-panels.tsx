import Link from "next/link";
import { db } from "@/server/db/client";
import { listAdoptionMatrix } from "@/server/adoption/list-adoption";
import { accessibleSiteIds, type Actor } from "@/lib/auth/authorize";

// Home panel for coordinators: released versions their site's ethics committee has not yet approved.
export async function PendingApprovalsPanel({ studyId, actor }: { studyId: string; actor: Actor }) {
  const matrix = await listAdoptionMatrix(db, { studyId, siteIds: accessibleSiteIds(actor, "adoption.record", studyId) });
  const labels = new Map(matrix.versions.map((v) => [v.id, v.versionLabel]));
  const pending = matrix.sites.flatMap((s) => s.cells.filter((c) => c.pending).map((c) => ({ site: s.siteCode, label: labels.get(c.versionId) ?? "?", inForce: s.inForceVersionLabel })));
  if (pending.length === 0) return <p className="text-sm">Every released version is approved at your site.</p>;
  return (
    <div className="space-y-2 text-sm" data-testid="home-pending-approvals">
      <ul>
        {pending.map((p) => (
          <li key={`${p.site}:${p.label}`}>
            Site <span className="font-mono">{p.site}</span>: version {p.label} awaits ethics approval (in force: {p.inForce ?? "none"})
          </li>
        ))}
      </ul>
      <Link href={`/studies/${studyId}/adoption`}>Record an approval</Link>
    </div>
  );
}
