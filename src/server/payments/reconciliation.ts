import "server-only";
import { and, desc, eq, inArray, isNull, notLike, sql } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { paymentConfirmations, paymentQueries, paymentRunLines, paymentRuns, paymentsRecorded, paymentTransfers, sites } from "@/server/db/schema";
import { localDate } from "@/lib/payment-schedule";
import { reconcile, type ReconTransfer } from "@/lib/payments/reconciliation";
import { loadPaymentSchedule } from "./due-lines";

const NO_SITE = "00000000-0000-4000-8000-000000000000";

/** Payments (transfers) of some sites, newest first, with their confirmation. */
export async function listSitePayments(tx: Tx, { studyId, siteIds }: { studyId: string; siteIds: "all" | string[] }) {
  const ids = siteIds === "all" ? undefined : inArray(paymentTransfers.siteId, siteIds.length ? siteIds : [NO_SITE]);
  return tx
    .select({
      id: paymentTransfers.id,
      siteId: paymentTransfers.siteId,
      siteCode: sites.code,
      runId: paymentTransfers.runId,
      runNumber: paymentRuns.number,
      currency: paymentTransfers.currency,
      amountMinor: paymentTransfers.amountMinor,
      state: paymentTransfers.state,
      stripeTransferId: paymentTransfers.stripeTransferId,
      failureMessage: paymentTransfers.failureMessage,
      sentAt: paymentTransfers.sentAt,
      paidAt: paymentTransfers.paidAt,
      confirmedOn: paymentConfirmations.receivedOn,
      confirmedMinor: paymentConfirmations.amountMinor,
      bankReference: paymentConfirmations.bankReference,
    })
    .from(paymentTransfers)
    .innerJoin(sites, eq(sites.id, paymentTransfers.siteId))
    .innerJoin(paymentRuns, eq(paymentRuns.id, paymentTransfers.runId))
    .leftJoin(paymentConfirmations, eq(paymentConfirmations.transferId, paymentTransfers.id))
    .where(and(eq(paymentTransfers.studyId, studyId), ids))
    .orderBy(desc(paymentTransfers.createdAt));
}

export async function getReconciliation(tx: Tx, { studyId, siteIds, asOf }: { studyId: string; siteIds: "all" | string[]; asOf: string }) {
  const { sites: siteRows, schedule } = await loadPaymentSchedule(tx, { studyId, siteIds, asOf });
  const ids = siteRows.map((s) => s.id);
  const inIds = (col: typeof paymentRunLines.siteId | typeof paymentQueries.siteId | typeof paymentsRecorded.siteId) => inArray(col, ids.length ? ids : [NO_SITE]);
  // One after another: a transaction's client runs one query at a time.
  const payments = await listSitePayments(tx, { studyId, siteIds: ids });
  const runLines = await tx
      .select({ siteId: paymentRunLines.siteId, currency: paymentRunLines.currency, amountMinor: paymentRunLines.amountMinor })
      .from(paymentRunLines)
      .where(and(eq(paymentRunLines.studyId, studyId), inIds(paymentRunLines.siteId), eq(paymentRunLines.state, "in_run"), isNull(paymentRunLines.transferId)));
  const queries = await tx
      .select({ siteId: paymentQueries.siteId, state: paymentQueries.state, transferId: paymentQueries.transferId, lineKey: paymentQueries.lineKey })
      .from(paymentQueries)
      .where(and(eq(paymentQueries.studyId, studyId), inIds(paymentQueries.siteId)));
  const recorded = await tx.select({ siteId: paymentsRecorded.siteId, amountMinor: paymentsRecorded.amountMinor }).from(paymentsRecorded).where(and(eq(paymentsRecorded.studyId, studyId), inIds(paymentsRecorded.siteId), notLike(paymentsRecorded.reference, "cairn-transfer:%")));
  const failedIds = payments.filter((p) => p.state === "failed" || p.state === "reversed").map((p) => p.id);
  const resent = new Set<string>();
  if (failedIds.length) {
    const rows = await tx.execute<{ id: string }>(
      sql`select distinct l1.transfer_id as id from payment_run_lines l1 join payment_run_lines l2 on l2.site_id = l1.site_id and l2.line_key = l1.line_key and l2.state in ('in_run', 'sent', 'paid') where l1.transfer_id in (${sql.join(failedIds.map((i) => sql`${i}::uuid`), sql`, `)})`,
    );
    for (const r of rows.rows) resent.add(r.id);
  }
  const siteOf = new Map(siteRows.map((s) => [s.id, s]));
  const todayBySite = new Map(siteRows.map((s) => [s.id, localDate(asOf, s.timeZone)]));
  const lineAmount = new Map<string, bigint>(schedule.lines.map((l) => [`${l.siteId}|${l.key}`, l.netMinor]));
  const transfers: ReconTransfer[] = payments.map((p) => ({
    id: p.id,
    siteId: p.siteId,
    currency: p.currency,
    amountMinor: p.amountMinor,
    state: p.state,
    paidOn: p.paidAt ? localDate(p.paidAt.toISOString(), siteOf.get(p.siteId)?.timeZone ?? "UTC") : null,
    confirmation: p.confirmedMinor != null && p.confirmedOn ? { amountMinor: p.confirmedMinor, receivedOn: p.confirmedOn } : null,
    openQueries: queries.filter((q) => q.transferId === p.id && q.state !== "resolved").length,
    resent: resent.has(p.id),
  }));
  const rows = reconcile({
    todayBySite,
    earned: schedule.lines.filter((l) => l.state !== "not_payable").map((l) => ({ siteId: l.siteId, currency: l.currency, netMinor: l.netMinor })),
    inRun: runLines,
    transfers,
    queries: queries.map((q) => {
      const t = q.transferId ? payments.find((p) => p.id === q.transferId) : undefined;
      const currency = t?.currency ?? siteOf.get(q.siteId)?.currency ?? "EUR";
      const amountMinor = t ? t.amountMinor : q.lineKey ? (lineAmount.get(`${q.siteId}|${q.lineKey}`) ?? 0n) : 0n;
      return { siteId: q.siteId, currency, state: q.state, amountMinor };
    }),
    paidElsewhere: recorded.map((r) => ({ siteId: r.siteId, currency: siteOf.get(r.siteId)?.currency ?? "EUR", amountMinor: r.amountMinor })),
  });
  return { asOf, sites: siteRows, rows, payments: payments.map((p) => ({ ...p, resent: resent.has(p.id) })) };
}
