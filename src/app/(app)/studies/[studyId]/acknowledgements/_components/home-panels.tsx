import Link from "next/link";
import { db } from "@/server/db/client";
import { countByState, listAcknowledgementMatrix, listMyAcknowledgements } from "@/server/acknowledgements/list-matrix";
import { accessibleSiteIds, type Actor } from "@/lib/auth/authorize";
import { AckStatusChip } from "./ack-status-chip";

// Home panels: an investigator's own acknowledgements (pending first), the sponsor's overdue counts.

export async function MyAcknowledgementsPanel({ studyId, actor }: { studyId: string; actor: Actor }) {
  const rows = (await listMyAcknowledgements(db, { studyId, userId: actor.userId })).filter((r) => r.status.state !== "acknowledged");
  if (rows.length === 0) return <p className="text-sm">You have acknowledged every protocol version asked of you.</p>;
  return (
    <ul className="flex flex-col gap-2 text-sm" data-testid="home-my-acknowledgements">
      {rows.map((r) => (
        <li key={r.requestId} className="flex flex-wrap items-center gap-2">
          <AckStatusChip status={r.status} />
          <Link href={`/studies/${studyId}/acknowledgements/${r.requestId}`}>
            Acknowledge protocol version {r.versionLabel} ({r.siteCode})
          </Link>
        </li>
      ))}
    </ul>
  );
}

export async function OverdueAcknowledgementsPanel({ studyId, actor }: { studyId: string; actor: Actor }) {
  const rows = await listAcknowledgementMatrix(db, { studyId, siteIds: accessibleSiteIds(actor, "acknowledgement.read", studyId) });
  const counts = countByState(rows);
  const bySite = new Map<string, number>();
  for (const r of rows) if (r.status.state === "overdue") bySite.set(r.siteCode, (bySite.get(r.siteCode) ?? 0) + 1);
  return (
    <div className="space-y-2 text-sm" data-testid="home-overdue-acknowledgements">
      <p>
        <strong>{counts.overdue}</strong> overdue · {counts.pending} pending · {counts.acknowledged} acknowledged
      </p>
      {bySite.size > 0 && (
        <table className="table-dense">
          <tbody>
            {[...bySite.entries()].sort().map(([site, n]) => (
              <tr key={site}>
                <td className="font-mono">{site}</td>
                <td className="amount">{n} overdue</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <Link href={`/studies/${studyId}/acknowledgements?state=overdue`}>Open the compliance matrix</Link>
    </div>
  );
}
