import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { listPaymentRuns } from "@/server/payments/runs";
import { listPayeeAccounts } from "@/server/payments/payee-accounts";
import { accessibleSiteIds, can, canSomewhere } from "@/lib/auth/authorize";
import { studyPath } from "@/lib/nav";
import { formatMinor } from "@/lib/money";
import { runStateLabels } from "@/lib/payments/labels";
import { PaymentChip } from "./_components/payment-chip";
import { PayeeAccounts } from "./_components/payee-accounts";
import { PrepareRun } from "./_components/prepare-run";

export const metadata: Metadata = { title: "Payment runs" };

export default async function PaymentRunsPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "payments.read", studyId)) notFound();
  const siteIds = accessibleSiteIds(actor, "payments.read", studyId);
  const canPrepare = can(actor, "payments.prepare", { studyId });
  const [runs, accounts] = [await listPaymentRuns(db, { studyId, siteIds }), await listPayeeAccounts(db, { studyId, siteIds })];

  return (
    <div className="space-y-6">
      <h1>Payment runs</h1>
      <p className="governs">
        A run pays the lines Cairn computed as due. The signed clinical trial agreement, the approved protocol and the ethics committee&apos;s and regulators&apos; rules govern what is owed; a
        second sponsor finance person approves every run before it is sent.
      </p>

      <section className="space-y-2" aria-labelledby="runs-heading">
        <h2 id="runs-heading">Runs</h2>
        {runs.length === 0 ? (
          <p className="text-sm">No payment runs yet.</p>
        ) : (
          <div className="overflow-x-auto">
            <table className="table-dense" data-testid="runs-table">
              <thead>
                <tr>
                  <th>Run</th>
                  <th>State</th>
                  <th>Prepared by</th>
                  <th>Approved by</th>
                  <th className="text-right">Sites</th>
                  <th className="text-right">Lines</th>
                  <th className="text-right">Paid lines</th>
                  <th className="text-right">Failed lines</th>
                  <th className="text-right">Amounts</th>
                </tr>
              </thead>
              <tbody>
                {runs.map((r) => (
                  <tr key={r.id}>
                    <td>
                      <Link href={studyPath(studyId, `payment-runs/${r.id}`)} className="underline">
                        Run {r.number}
                      </Link>
                    </td>
                    <td>
                      <PaymentChip table={runStateLabels} state={r.state} />
                    </td>
                    <td>
                      {r.preparedBy} <span className="text-muted text-xs">{r.preparedAt.toISOString().slice(0, 10)}</span>
                    </td>
                    <td>{r.approvedBy ?? "—"}</td>
                    <td className="amount">{r.siteCount}</td>
                    <td className="amount">{r.lineCount}</td>
                    <td className="amount">{r.paidLines}</td>
                    <td className="amount">{r.failedLines}</td>
                    <td className="amount">{r.amounts.map((a) => formatMinor(a.amountMinor, a.currency)).join(" · ")}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>

      {canPrepare && <PrepareRun studyId={studyId} sites={accounts.map((a) => ({ id: a.siteId, code: a.siteCode, currency: a.currency }))} />}

      <PayeeAccounts
        studyId={studyId}
        canManage={canPrepare}
        accounts={accounts.map((a) => ({ siteId: a.siteId, siteCode: a.siteCode, siteName: a.siteName, currency: a.currency, stripeAccountId: a.stripeAccountId, state: a.state ?? "none", stateReason: a.stateReason }))}
      />
    </div>
  );
}
