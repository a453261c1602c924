import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { getReconciliation } from "@/server/payments/reconciliation";
import { listPaymentQueries } from "@/server/payments/queries";
import { accessibleSiteIds, can, canSomewhere } from "@/lib/auth/authorize";
import { formatMinor } from "@/lib/money";
import { agingBuckets, totalsByCurrency, type ReconRow } from "@/lib/payments/reconciliation";
import { queryStateLabels, transferStateLabels } from "@/lib/payments/labels";
import { PaymentChip } from "../payment-runs/_components/payment-chip";
import { ConfirmReceipt } from "./_components/confirm-receipt";
import { RaiseQuery } from "./_components/raise-query";
import { QueryThread } from "./_components/query-thread";

export const metadata: Metadata = { title: "Reconciliation" };

// [figure, column label, what it means]
const FIGURES: [keyof ReconRow, string, string][] = [
  ["earnedMinor", "Earned", "Net of holdback, as Cairn computes it"],
  ["notYetPaidMinor", "Unpaid", "Earned and in no run"],
  ["inRunMinor", "In run", "In a run not yet sent"],
  ["sentMinor", "Sent", "Sent to Stripe, not yet confirmed by its event"],
  ["paidElsewhereMinor", "Paid earlier", "Recorded as paid outside Cairn's runs"],
  ["paidMinor", "Paid", "Paid through a run"],
  ["confirmedMinor", "Confirmed", "Confirmed by the site as received"],
  ["awaitingConfirmationMinor", "Unconfirmed", "Paid, not yet confirmed by the site"],
  ["queriedMinor", "Queried", "Under an open query"],
  ["failedMinor", "Failed", "Failed or reversed and not yet re-sent"],
  ["differenceMinor", "Difference", "Confirmed minus paid"],
];

function Figure({ row, k }: { row: ReconRow; k: keyof ReconRow }) {
  const v = row[k] as bigint;
  const flagged = (k === "differenceMinor" && v !== 0n) || (k === "failedMinor" && v !== 0n) || (k === "queriedMinor" && v !== 0n);
  return (
    <td className={`amount ${flagged ? "font-semibold text-brick" : ""}`} data-figure={k}>
      {formatMinor(v, row.currency, { withCode: false })}
      {flagged && <span className="ml-1 text-xs">{k === "differenceMinor" ? "differs" : "check"}</span>}
    </td>
  );
}

function FiguresTable({ rows, siteCode, testId }: { rows: ReconRow[]; siteCode: (id: string) => string; testId: string }) {
  return (
    <div className="overflow-x-auto">
      <table className="table-dense" data-testid={testId}>
        <thead>
          <tr>
            <th>Site</th>
            <th>Currency</th>
            {FIGURES.map(([, l, title]) => (
              <th key={l} className="text-right" title={title}>
                {l}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={`${r.siteId}|${r.currency}`} data-site={siteCode(r.siteId)}>
              <td className="whitespace-nowrap font-mono">{siteCode(r.siteId)}</td>
              <td>{r.currency}</td>
              {FIGURES.map(([k]) => (
                <Figure key={k} row={r} k={k} />
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export default async function ReconciliationPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "payments.read", studyId)) notFound();
  const siteIds = accessibleSiteIds(actor, "payments.read", studyId);
  const recon = await getReconciliation(db, { studyId, siteIds, asOf: new Date().toISOString() });
  const queries = await listPaymentQueries(db, { studyId, siteIds });
  const code = new Map(recon.sites.map((s) => [s.id, s.code]));
  const siteCode = (id: string) => code.get(id) ?? id;
  const studyWide = siteIds === "all";

  return (
    <div className="space-y-8">
      <h1>Reconciliation</h1>
      <p className="governs">
        Both sides see the same figures: what Cairn computed as earned, what was sent and paid through Stripe, and what the site confirmed on its bank statement. The signed clinical trial
        agreement governs what is owed.
      </p>

      {studyWide && (
        <section className="space-y-2" aria-labelledby="study-heading">
          <h2 id="study-heading">Study-wide by site and currency</h2>
          <FiguresTable rows={[...recon.rows].sort((a, b) => siteCode(a.siteId).localeCompare(siteCode(b.siteId)))} siteCode={siteCode} testId="recon-study" />
          <h3>Totals by currency</h3>
          <FiguresTable rows={totalsByCurrency(recon.rows)} siteCode={() => "All sites"} testId="recon-currency-totals" />
        </section>
      )}

      {recon.sites.map((site) => {
        const rows = recon.rows.filter((r) => r.siteId === site.id);
        const payments = recon.payments.filter((p) => p.siteId === site.id);
        const canConfirm = can(actor, "payments.confirm", { studyId, siteId: site.id });
        const canQuery = can(actor, "payments.query", { studyId, siteId: site.id });
        const aging = rows.flatMap((r) => agingBuckets.map((b) => ({ b, currency: r.currency, ...r.aging[b] }))).filter((a) => a.count > 0);
        return (
          <section key={site.id} className="space-y-2" aria-labelledby={`site-${site.id}`} data-testid={`recon-site-${site.code}`}>
            <h2 id={`site-${site.id}`}>
              <span className="font-mono">{site.code}</span> {site.name}
            </h2>
            {rows.length ? <FiguresTable rows={rows} siteCode={siteCode} testId={`recon-figures-${site.code}`} /> : <p className="text-sm">Nothing earned or paid yet.</p>}
            <p className="text-sm" data-testid={`aging-${site.code}`}>
              Unconfirmed payments by age: {aging.length === 0 ? "none" : aging.map((a) => `${a.b}: ${a.count} (${formatMinor(a.amountMinor, a.currency)})`).join(" · ")}
            </p>
            {payments.length > 0 && (
              <table className="table-dense" data-testid={`payments-${site.code}`}>
                <thead>
                  <tr>
                    <th>Run</th>
                    <th>State</th>
                    <th className="text-right">Amount</th>
                    <th>Paid</th>
                    <th>Confirmed</th>
                    <th>Remittance</th>
                    <th />
                  </tr>
                </thead>
                <tbody>
                  {payments.map((p) => (
                    <tr key={p.id}>
                      <td>Run {p.runNumber}</td>
                      <td>
                        <PaymentChip table={transferStateLabels} state={p.state} /> {p.failureMessage && <span className="text-xs text-muted">{p.failureMessage}</span>}
                        {p.resent && <span className="text-xs text-muted"> Lines re-sent in a later run.</span>}
                      </td>
                      <td className="amount">{formatMinor(p.amountMinor, p.currency)}</td>
                      <td>{p.paidAt ? p.paidAt.toISOString().slice(0, 10) : "—"}</td>
                      <td>
                        {p.confirmedOn ? (
                          <span className={p.confirmedMinor !== p.amountMinor ? "font-semibold text-brick" : ""}>
                            {p.confirmedOn} · {formatMinor(p.confirmedMinor!, p.currency)} · {p.bankReference}
                            {p.confirmedMinor !== p.amountMinor && " (differs)"}
                          </span>
                        ) : (
                          "—"
                        )}
                      </td>
                      <td className="text-sm">
                        {(p.state === "sent" || p.state === "paid") && (
                          <>
                            <a className="underline" href={`/api/v1/payments/${p.id}/remittance?format=pdf`}>
                              PDF
                            </a>{" "}
                            ·{" "}
                            <a className="underline" href={`/api/v1/payments/${p.id}/remittance?format=csv`}>
                              CSV
                            </a>
                          </>
                        )}
                      </td>
                      <td className="space-y-1">
                        {canConfirm && p.state === "paid" && !p.confirmedOn && (
                          <ConfirmReceipt siteId={site.id} transferId={p.id} currency={p.currency} amount={formatMinor(p.amountMinor, p.currency, { grouping: false, withCode: false })} />
                        )}
                        {canQuery && <RaiseQuery siteId={site.id} transferId={p.id} />}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            )}
          </section>
        );
      })}

      <section className="space-y-2" aria-labelledby="queries-heading">
        <h2 id="queries-heading">Queries</h2>
        {queries.length === 0 && <p className="text-sm">No queries.</p>}
        {queries.map((q) => (
          <article key={q.id} className="card space-y-2" data-testid="payment-query">
            <header className="flex flex-wrap items-center gap-2">
              <span className="font-mono">{q.siteCode}</span>
              <strong>{q.subject}</strong>
              <PaymentChip table={queryStateLabels} state={q.state} />
              {q.transferAmountMinor != null && q.currency && <span className="text-sm amount">{formatMinor(q.transferAmountMinor, q.currency)}</span>}
              {q.lineKey && <span className="font-mono text-xs">{q.lineKey}</span>}
            </header>
            <QueryThread
              queryId={q.id}
              state={q.state}
              canReply={can(actor, "payments.query", { studyId, siteId: q.siteId })}
              messages={q.messages.map((m) => ({ id: m.id, side: m.side, author: m.author, body: m.body, at: m.createdAt.toISOString().slice(0, 16).replace("T", " ") }))}
            />
          </article>
        ))}
      </section>
    </div>
  );
}
