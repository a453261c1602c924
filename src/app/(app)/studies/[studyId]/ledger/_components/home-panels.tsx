import Link from "next/link";
import { db } from "@/server/db/client";
import { getStudySummary } from "@/server/ledger/get-study-summary";
import { accessibleSiteIds, type Actor } from "@/lib/auth/authorize";
import { formatMinor } from "@/lib/money";
import { studyPath } from "@/lib/nav";

// Home panels of the finance roles: what is due and overdue, from the same engine as the ledger.

/** Site finance: outstanding and overdue per site they look after. */
export async function SiteAmountsDue({ studyId, actor }: { studyId: string; actor: Actor }) {
  const summary = await getStudySummary(db, { studyId, siteIds: accessibleSiteIds(actor, "ledger.read", studyId) });
  if (summary.sites.length === 0) return <p className="text-sm">No site ledger to show.</p>;
  return (
    <div className="space-y-1 text-sm">
      <table className="table-dense">
        <thead>
          <tr>
            <th>Site</th>
            <th className="text-right">Outstanding</th>
            <th className="text-right">Overdue</th>
            <th className="text-right">Held back</th>
          </tr>
        </thead>
        <tbody>
          {summary.sites.map((s) => (
            <tr key={s.siteId}>
              <td>
                <Link className="underline" href={`${studyPath(studyId, "ledger")}?site=${s.siteId}`}>
                  {s.code}
                </Link>
              </td>
              <td className="amount">{formatMinor(s.outstandingMinor, s.currency)}</td>
              <td className="amount">{formatMinor(s.overdueMinor, s.currency)}</td>
              <td className="amount">{formatMinor(s.heldBackMinor, s.currency)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="governs">The signed agreement governs what is owed and when.</p>
    </div>
  );
}

/** Sponsor finance: totals due by currency across the study. */
export async function StudyAmountsDue({ studyId }: { studyId: string; actor: Actor }) {
  const summary = await getStudySummary(db, { studyId, siteIds: "all" });
  if (summary.currencies.length === 0) return <p className="text-sm">Nothing earned yet.</p>;
  return (
    <div className="space-y-1 text-sm">
      <table className="table-dense">
        <thead>
          <tr>
            <th>Currency</th>
            <th className="text-right">Outstanding</th>
            <th className="text-right">Overdue</th>
          </tr>
        </thead>
        <tbody>
          {summary.currencies.map((c) => (
            <tr key={c.currency}>
              <td>{c.currency}</td>
              <td className="amount">{formatMinor(c.outstandingMinor, c.currency)}</td>
              <td className="amount">{formatMinor(c.overdueMinor, c.currency)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p>
        <Link className="underline" href={studyPath(studyId, "ledger")}>
          Open the study summary
        </Link>
      </p>
      <p className="governs">The signed agreements govern what is owed and when.</p>
    </div>
  );
}
