import "server-only";
import { eq } from "drizzle-orm";
import type Stripe from "stripe";
import { db } from "@/server/db/client";
import { paymentTransfers, stripeEvents } from "@/server/db/schema";
import { recordAudit } from "@/server/audit/record-audit";
import { observedFromEvent } from "@/lib/payments/states";
import { observeTransferState } from "./transfer-state";
import { applyAccountUpdate } from "./payee-accounts";

// Applies one verified Stripe event, once: the event id is stored first, so a repeat delivery finds
// it and changes nothing. Out-of-order events are harmless because states only move forward.

export type EventOutcome = "applied" | "duplicate" | "no_change" | "ignored" | "unknown_object";

export async function applyStripeEvent(event: Stripe.Event): Promise<EventOutcome> {
  return db.transaction(async (tx) => {
    const object = event.data.object as unknown as { id?: string; object?: string; metadata?: Record<string, string> };
    const inserted = await tx
      .insert(stripeEvents)
      .values({ id: event.id, type: event.type, stripeCreated: event.created, objectId: object.id ?? null, payload: event as unknown as Record<string, unknown> })
      .onConflictDoNothing()
      .returning({ id: stripeEvents.id });
    if (inserted.length === 0) return "duplicate";
    let outcome: EventOutcome = "ignored";
    if (event.type.startsWith("transfer.")) {
      const tr = event.data.object as Stripe.Transfer & { failure_code?: string; failure_message?: string };
      const byMeta = tr.metadata?.cairn_transfer_id;
      const [row] = byMeta && /^[0-9a-f-]{36}$/i.test(byMeta)
        ? await tx.select({ id: paymentTransfers.id }).from(paymentTransfers).where(eq(paymentTransfers.id, byMeta)).limit(1)
        : await tx.select({ id: paymentTransfers.id }).from(paymentTransfers).where(eq(paymentTransfers.stripeTransferId, tr.id)).limit(1);
      const observed = observedFromEvent(event.type, tr);
      if (!row) outcome = "unknown_object";
      else if (!observed) outcome = "ignored";
      else {
        const r = await observeTransferState(tx, {
          transferId: row.id,
          observed,
          stripeTransferId: tr.id,
          failureCode: tr.failure_code ?? (observed === "reversed" ? "reversed" : null),
          failureMessage: tr.failure_message ?? null,
          source: `stripe ${event.type} ${event.id}`,
        });
        outcome = r.changed ? "applied" : "no_change";
      }
    } else if (event.type === "account.updated") {
      const change = await applyAccountUpdate(tx, event.data.object as Stripe.Account);
      if (change) {
        await recordAudit(tx, null, { action: "payment.payee.state", entityType: "payee_account", entityId: change.after.id, studyId: change.after.studyId, siteId: change.after.siteId, before: { state: change.before.state }, after: { state: change.after.state, reason: change.after.stateReason, event: event.id } });
        outcome = "applied";
      } else outcome = "no_change";
    }
    await tx.update(stripeEvents).set({ outcome }).where(eq(stripeEvents.id, event.id));
    return outcome;
  });
}
