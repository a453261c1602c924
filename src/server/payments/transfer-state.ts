import "server-only";
import { and, eq, inArray, ne, sql } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { paymentRunLines, paymentRuns, paymentsRecorded, paymentTransfers, sites, type PaymentTransferRow } from "@/server/db/schema";
import { recordAudit } from "@/server/audit/record-audit";
import { lineStateFor, nextTransferState, type TransferState } from "@/lib/payments/states";
import { localDate } from "@/lib/payment-schedule";
import { enqueueRemittanceMail, enqueueFailureMail } from "./remittance";

/**
 * Move a transfer (locked FOR UPDATE here) to an observed state, with its lines, unless the
 * observation is stale: a final state is never left, an earlier step never undoes a later one.
 */
export async function observeTransferState(
  tx: Tx,
  {
    transferId,
    observed,
    stripeTransferId,
    failureCode,
    failureMessage,
    source,
  }: { transferId: string; observed: TransferState; stripeTransferId?: string | null; failureCode?: string | null; failureMessage?: string | null; source: string },
): Promise<{ changed: boolean; transfer: PaymentTransferRow }> {
  const [t] = await tx.select().from(paymentTransfers).where(eq(paymentTransfers.id, transferId)).for("update").limit(1);
  if (!t) throw new Error(`transfer ${transferId} not found`);
  const next = nextTransferState(t.state, observed);
  const idPatch = !t.stripeTransferId && stripeTransferId ? { stripeTransferId } : {};
  if (!next) {
    if (Object.keys(idPatch).length) await tx.update(paymentTransfers).set({ ...idPatch, updatedAt: new Date() }).where(eq(paymentTransfers.id, t.id));
    return { changed: false, transfer: t };
  }
  const now = new Date();
  const [after] = await tx
    .update(paymentTransfers)
    .set({
      ...idPatch,
      state: next,
      leaseUntil: null,
      updatedAt: now,
      ...(next === "sent" ? { sentAt: now, lastError: null } : {}),
      ...(next === "paid" ? { paidAt: now, sentAt: t.sentAt ?? now, lastError: null } : {}),
      ...(next === "failed" || next === "reversed" ? { failedAt: now, failureCode: failureCode ?? null, failureMessage: failureMessage ?? null } : {}),
    })
    .where(eq(paymentTransfers.id, t.id))
    .returning();
  const reason = next === "failed" || next === "reversed" ? `${next === "failed" ? "Transfer failed" : "Transfer reversed"}${failureMessage ? `: ${failureMessage}` : failureCode ? `: ${failureCode}` : ""}` : null;
  await tx
    .update(paymentRunLines)
    .set({ state: lineStateFor(next), stateReason: reason, updatedAt: now })
    .where(and(eq(paymentRunLines.transferId, t.id), inArray(paymentRunLines.state, ["in_run", "sent", "paid"])));
  await syncRecordedPayments(tx, after!, next);
  await recordAudit(tx, null, {
    action: `payment.transfer.${next}`,
    entityType: "payment_transfer",
    entityId: t.id,
    studyId: t.studyId,
    siteId: t.siteId,
    before: { state: t.state },
    after: { state: next, stripeTransferId: after!.stripeTransferId, source, ...(reason ? { reason } : {}) },
  });
  if (next === "paid") await enqueueRemittanceMail(tx, { transferId: t.id });
  if (next === "failed" || next === "reversed") await enqueueFailureMail(tx, { transferId: t.id, reason: reason ?? next });
  // The run is sent once no transfer of it is still waiting to go out.
  const [{ waiting } = { waiting: 0 }] = await tx
    .select({ waiting: sql<number>`count(*)::int` })
    .from(paymentTransfers)
    .where(and(eq(paymentTransfers.runId, t.runId), inArray(paymentTransfers.state, ["queued", "sending"])));
  if (waiting === 0) await tx.update(paymentRuns).set({ state: "sent" }).where(and(eq(paymentRuns.id, t.runId), ne(paymentRuns.state, "sent"), eq(paymentRuns.state, "sending")));
  return { changed: true, transfer: after! };
}

/** The reference under which a transfer's lines are recorded as paid. */
export const recordedPaymentReference = (transferId: string) => `cairn-transfer:${transferId}`;

/**
 * The schedule reads paid lines from payments_recorded: a paid transfer records each of its lines
 * there (dated in the site's zone); a failure or reversal takes them out again, so the lines are due.
 */
async function syncRecordedPayments(tx: Tx, t: PaymentTransferRow, state: TransferState) {
  const reference = recordedPaymentReference(t.id);
  if (state === "failed" || state === "reversed") {
    await tx.delete(paymentsRecorded).where(eq(paymentsRecorded.reference, reference));
    return;
  }
  if (state !== "paid") return;
  const [site] = await tx.select({ timeZone: sites.timeZone }).from(sites).where(eq(sites.id, t.siteId)).limit(1);
  const paidOn = localDate((t.paidAt ?? new Date()).toISOString(), site?.timeZone ?? "UTC");
  const lines = await tx.select().from(paymentRunLines).where(eq(paymentRunLines.transferId, t.id));
  if (lines.length) await tx.insert(paymentsRecorded).values(lines.map((l) => ({ studyId: t.studyId, siteId: t.siteId, lineKey: l.lineKey, amountMinor: l.amountMinor, paidOn, reference })));
}
