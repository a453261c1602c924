import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { getPaymentRun } from "@/server/payments/runs";
import { accessibleSiteIds, can, canSomewhere } from "@/lib/auth/authorize";
import { idSchema } from "@/lib/api/schemas";
import { studyPath } from "@/lib/nav";
import { formatMinor } from "@/lib/money";
import { lineStateLabels, runStateLabels } from "@/lib/payments/labels";
import { PaymentChip } from "../_components/payment-chip";
import { RunActions } from "./_components/run-actions";
import { RunProgress } from "./_components/run-progress";
import { RaiseQuery } from "../../reconciliation/_components/raise-query";

export const metadata: Metadata = { title: "Payment run" };

export default async function PaymentRunPage({ params }: { params: Promise<{ studyId: string; runId: string }> }) {
  const { studyId, runId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "payments.read", studyId) || !idSchema.safeParse(runId).success) notFound();
  const siteIds = accessibleSiteIds(actor, "payments.read", studyId);
  const data = await getPaymentRun(db, { runId, siteIds }).catch(() => null);
  if (!data || data.run.studyId !== studyId) notFound();
  const { run, lines, transfers, sites } = data;
  const code = new Map(sites.map((s) => [s.id, s.code]));
  const totals = new Map<string, bigint>();
  for (const l of lines) totals.set(l.currency, (totals.get(l.currency) ?? 0n) + l.amountMinor);

  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link href={studyPath(studyId, "payment-runs")} className="underline">
          Payment runs
        </Link>
      </p>
      <div className="flex flex-wrap items-center gap-3">
        <h1>Run {run.number}</h1>
        <PaymentChip table={runStateLabels} state={run.state} />
      </div>
      <dl className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="text-muted">Prepared by</dt>
        <dd>
          {run.preparedByName} · {run.preparedAt.toISOString().slice(0, 16).replace("T", " ")} UTC
        </dd>
        <dt className="text-muted">Approved by</dt>
        <dd data-testid="approved-by">{run.approvedByName ? `${run.approvedByName} · ${run.approvedAt?.toISOString().slice(0, 16).replace("T", " ")} UTC` : "Not yet approved"}</dd>
        <dt className="text-muted">Content hash</dt>
        <dd className="break-all font-mono text-xs" data-testid="content-hash">
          {run.contentHash}
        </dd>
        <dt className="text-muted">Total</dt>
        <dd className="amount text-left">{[...totals].map(([c, m]) => formatMinor(m, c)).join(" · ")}</dd>
      </dl>
      <p className="governs">The lines and amounts are frozen: the hash above binds what the approver saw to what is sent. The signed agreement governs what is owed.</p>

      <RunActions
        runId={run.id}
        state={run.state}
        contentHash={run.contentHash}
        canApprove={can(actor, "payments.approve", { studyId }) && run.preparedBy !== actor.userId}
        isPreparer={run.preparedBy === actor.userId}
        canSend={can(actor, "payments.prepare", { studyId })}
      />

      <RunProgress
        runId={run.id}
        initial={transfers.map((t) => ({
          id: t.id,
          siteCode: t.siteCode,
          currency: t.currency,
          amountMinor: t.amountMinor.toString(),
          state: t.state,
          attempts: t.attempts,
          stripeTransferId: t.stripeTransferId,
          lastError: t.lastError,
          failureMessage: t.failureMessage,
        }))}
      />

      <section className="space-y-2" aria-labelledby="lines-heading">
        <h2 id="lines-heading">Lines ({lines.length})</h2>
        <div className="overflow-x-auto">
          <table className="table-dense" data-testid="run-lines">
            <thead>
              <tr>
                <th>Site</th>
                <th>Line</th>
                <th>Service date</th>
                <th>Cycle</th>
                <th>Due</th>
                <th>State</th>
                <th className="text-right">Amount</th>
                <th />
              </tr>
            </thead>
            <tbody>
              {lines.map((l) => (
                <tr key={l.id}>
                  <td className="font-mono">{code.get(l.siteId)}</td>
                  <td>
                    {l.description} <span className="font-mono text-xs text-muted">{l.lineKey}</span>
                  </td>
                  <td className="whitespace-nowrap">{l.serviceDate}</td>
                  <td className="whitespace-nowrap">{l.cycle}</td>
                  <td className="whitespace-nowrap">{l.dueDate}</td>
                  <td>
                    <PaymentChip table={lineStateLabels} state={l.state} /> {l.stateReason && <span className="text-xs text-muted">{l.stateReason}</span>}
                  </td>
                  <td className="amount">{formatMinor(l.amountMinor, l.currency)}</td>
                  <td>{l.state !== "in_run" && can(actor, "payments.query", { studyId, siteId: l.siteId }) && <RaiseQuery siteId={l.siteId} lineKey={l.lineKey} label="Query this line" />}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </section>
    </div>
  );
}
