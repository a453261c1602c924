import Link from "next/link";
import { db } from "@/server/db/client";
import { listFailedTransfers, listOpenPaymentQueries, listPaymentsToConfirm, listRunsAwaitingApproval } from "@/server/payments/home";
import { accessibleSiteIds, type Actor } from "@/lib/auth/authorize";
import { formatMinor } from "@/lib/money";
import { studyPath } from "@/lib/nav";
import { queryStateLabels } from "@/lib/payments/labels";
import { PaymentChip } from "./payment-chip";

// Home panels of the finance roles for payments: approvals, failures, receipts to confirm, queries.

export async function RunsAwaitingApprovalPanel({ studyId, actor }: { studyId: string; actor: Actor }) {
  const runs = await listRunsAwaitingApproval(db, { studyId });
  if (runs.length === 0) return <p className="text-sm">No run is waiting for approval.</p>;
  return (
    <ul className="space-y-1 text-sm" data-testid="runs-awaiting-approval">
      {runs.map((r) => (
        <li key={r.id}>
          <Link className="underline" href={studyPath(studyId, `payment-runs/${r.id}`)}>
            Run {r.number}
          </Link>{" "}
          — {r.lineCount} lines, prepared by {r.preparedByName}
          {r.preparedBy === actor.userId && <span className="text-muted"> (yours: someone else approves it)</span>}
        </li>
      ))}
    </ul>
  );
}

export async function FailedTransfersPanel({ studyId }: { studyId: string; actor: Actor }) {
  const rows = await listFailedTransfers(db, { studyId });
  if (rows.length === 0) return <p className="text-sm">No failed transfers.</p>;
  return (
    <ul className="space-y-1 text-sm">
      {rows.map((t) => (
        <li key={t.id}>
          <span className="font-mono">{t.siteCode}</span> {formatMinor(t.amountMinor, t.currency)} in{" "}
          <Link className="underline" href={studyPath(studyId, `payment-runs/${t.runId}`)}>
            run {t.runNumber}
          </Link>
          : {t.state}
          {t.failureMessage ? ` — ${t.failureMessage}` : ""}
        </li>
      ))}
    </ul>
  );
}

export async function PaymentsToConfirmPanel({ studyId, actor }: { studyId: string; actor: Actor }) {
  const rows = await listPaymentsToConfirm(db, { studyId, siteIds: accessibleSiteIds(actor, "payments.confirm", studyId) });
  if (rows.length === 0) return <p className="text-sm">No payment waits for your confirmation.</p>;
  return (
    <ul className="space-y-1 text-sm" data-testid="payments-to-confirm">
      {rows.map((p) => (
        <li key={p.id}>
          <span className="font-mono">{p.siteCode}</span> {formatMinor(p.amountMinor, p.currency)}, run {p.runNumber}, paid {p.paidAt?.toISOString().slice(0, 10)} —{" "}
          <Link className="underline" href={studyPath(studyId, "reconciliation")}>
            confirm receipt
          </Link>
        </li>
      ))}
    </ul>
  );
}

export async function OpenPaymentQueriesPanel({ studyId, actor }: { studyId: string; actor: Actor }) {
  const rows = await listOpenPaymentQueries(db, { studyId, siteIds: accessibleSiteIds(actor, "payments.read", studyId) });
  if (rows.length === 0) return <p className="text-sm">No open payment queries.</p>;
  return (
    <ul className="space-y-1 text-sm">
      {rows.map((q) => (
        <li key={q.id}>
          <span className="font-mono">{q.siteCode}</span>{" "}
          <Link className="underline" href={studyPath(studyId, "reconciliation")}>
            {q.subject}
          </Link>{" "}
          <PaymentChip table={queryStateLabels} state={q.state} />
        </li>
      ))}
    </ul>
  );
}
