import "server-only";
import { and, asc, eq, lt, lte, or, sql } from "drizzle-orm";
import type Stripe from "stripe";
import { db } from "@/server/db/client";
import { paymentTransfers, type PaymentTransferRow } from "@/server/db/schema";
import { stripeClient } from "@/server/stripe/client";
import { isRetryableStripeError, retryDelayMs } from "@/lib/payments/states";
import { observeTransferState } from "./transfer-state";

// The worker job that sends queued transfers. Any number of workers may run: a transfer is claimed
// with SKIP LOCKED and a lease; a worker that dies between Stripe's answer and the database update
// leaves the lease to expire, and the next worker sends again under the same idempotency key, so
// Stripe answers with the transfer it already made.

export const MAX_SEND_ATTEMPTS = 10;
const DEFAULT_LEASE_MS = 60_000;

export type SendOptions = {
  stripe?: Stripe;
  limit?: number;
  runId?: string;
  leaseMs?: number;
  /** Retry immediately instead of backing off (tests). */
  noBackoff?: boolean;
  /** Test hook: runs after Stripe answered, before the database update (throw to simulate a crash). */
  afterStripeCall?: (t: PaymentTransferRow, stripeTransferId: string) => void | Promise<void>;
};

export type SendOutcome = { transferId: string; outcome: "sent" | "retry" | "failed" | "crashed"; detail?: string };

async function claim({ limit, runId, leaseMs }: { limit: number; runId?: string; leaseMs: number }): Promise<PaymentTransferRow[]> {
  return db.transaction(async (tx) => {
    const now = new Date();
    const rows = await tx
      .select()
      .from(paymentTransfers)
      .where(
        and(
          or(eq(paymentTransfers.state, "queued"), and(eq(paymentTransfers.state, "sending"), lt(paymentTransfers.leaseUntil, now))),
          lte(paymentTransfers.nextAttemptAt, now),
          runId ? eq(paymentTransfers.runId, runId) : undefined,
        ),
      )
      .orderBy(asc(paymentTransfers.nextAttemptAt))
      .limit(limit)
      .for("update", { skipLocked: true });
    const claimed: PaymentTransferRow[] = [];
    for (const r of rows) {
      const [c] = await tx
        .update(paymentTransfers)
        .set({ state: "sending", attempts: sql`${paymentTransfers.attempts} + 1`, leaseUntil: new Date(now.getTime() + leaseMs), updatedAt: now })
        .where(eq(paymentTransfers.id, r.id))
        .returning();
      claimed.push(c!);
    }
    return claimed;
  });
}

/** Look for the transfer at Stripe by its group and our id (when an answer was lost). */
async function findAtStripe(stripe: Stripe, t: PaymentTransferRow): Promise<Stripe.Transfer | null> {
  for await (const tr of stripe.transfers.list({ transfer_group: transferGroupOf(t.runId), limit: 100 })) {
    if (tr.metadata?.cairn_transfer_id === t.id) return tr;
  }
  return null;
}

export const transferGroupOf = (runId: string) => `cairn-run-${runId}`;

async function sendOne(stripe: Stripe, t: PaymentTransferRow, opts: SendOptions): Promise<SendOutcome> {
  let transfer: Stripe.Transfer;
  try {
    transfer = await stripe.transfers.create(
      {
        amount: Number(t.stripeAmount),
        currency: t.currency.toLowerCase(),
        destination: t.destinationAccountId,
        transfer_group: transferGroupOf(t.runId),
        description: `Cairn payment run ${t.runId}`,
        metadata: { cairn_transfer_id: t.id, cairn_run_id: t.runId, cairn_site_id: t.siteId, cairn_study_id: t.studyId },
      },
      { idempotencyKey: t.idempotencyKey },
    );
  } catch (err) {
    const e = err as { type?: string; statusCode?: number; code?: string; message?: string };
    const message = `${e.type ?? "Error"}${e.code ? ` ${e.code}` : ""}: ${e.message ?? String(err)}`;
    if (isRetryableStripeError(e)) {
      if (t.attempts >= MAX_SEND_ATTEMPTS) {
        // Out of attempts: settle what happened by asking Stripe, or keep trying if it cannot say.
        try {
          const found = await findAtStripe(stripe, t);
          if (found) return markSent(t, found.id, opts);
          await db.transaction((tx) => observeTransferState(tx, { transferId: t.id, observed: "failed", failureCode: "no_answer", failureMessage: `No answer from Stripe after ${t.attempts} attempts (${message})`, source: "worker" }));
          return { transferId: t.id, outcome: "failed", detail: message };
        } catch {
          /* Stripe still unreachable: retry later */
        }
      }
      await db
        .update(paymentTransfers)
        .set({ state: "queued", leaseUntil: null, lastError: message, nextAttemptAt: new Date(Date.now() + (opts.noBackoff ? 0 : retryDelayMs(t.attempts))), updatedAt: new Date() })
        .where(and(eq(paymentTransfers.id, t.id), eq(paymentTransfers.state, "sending")));
      return { transferId: t.id, outcome: "retry", detail: message };
    }
    // Refused by Stripe (not verified, insufficient balance …): nothing was created; the lines are due again.
    await db.transaction((tx) => observeTransferState(tx, { transferId: t.id, observed: "failed", failureCode: e.code ?? e.type ?? "declined", failureMessage: e.message ?? message, source: "worker" }));
    return { transferId: t.id, outcome: "failed", detail: message };
  }
  if (opts.afterStripeCall) {
    try {
      await opts.afterStripeCall(t, transfer.id);
    } catch {
      return { transferId: t.id, outcome: "crashed" };
    }
  }
  return markSent(t, transfer.id, opts);
}

async function markSent(t: PaymentTransferRow, stripeTransferId: string, _opts: SendOptions): Promise<SendOutcome> {
  await db.transaction((tx) => observeTransferState(tx, { transferId: t.id, observed: "sent", stripeTransferId, source: "worker" }));
  return { transferId: t.id, outcome: "sent" };
}

/** One pass: claim up to `limit` transfers and send each. Returns what happened to each. */
export async function sendQueuedTransfers(opts: SendOptions = {}): Promise<SendOutcome[]> {
  const stripe = opts.stripe ?? stripeClient();
  const claimed = await claim({ limit: opts.limit ?? 10, runId: opts.runId, leaseMs: opts.leaseMs ?? DEFAULT_LEASE_MS });
  const out: SendOutcome[] = [];
  for (const t of claimed) out.push(await sendOne(stripe, t, opts));
  return out;
}
