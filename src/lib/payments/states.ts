// The fate of a transfer and its lines. A transfer is queued, then sending (claimed by a worker),
// sent (Stripe answered with a transfer), paid (Stripe's event confirmed it), or failed / reversed.
// Events may arrive twice or out of order: a final state is never left, and a later step is never
// undone by an earlier one arriving late.

export const transferStates = ["queued", "sending", "sent", "paid", "failed", "reversed"] as const;
export type TransferState = (typeof transferStates)[number];
export const lineStates = ["in_run", "sent", "paid", "failed", "reversed"] as const;
export type LineState = (typeof lineStates)[number];

const rank: Record<TransferState, number> = { queued: 0, sending: 1, sent: 2, paid: 3, failed: 4, reversed: 4 };
export const isFinalTransferState = (s: TransferState) => s === "failed" || s === "reversed";

/** The state after an observation, or null when the observation changes nothing. */
export function nextTransferState(current: TransferState, observed: TransferState): TransferState | null {
  if (current === observed) return null;
  if (isFinalTransferState(current)) return null;
  // A failure or a reversal ends any live transfer, even one already paid.
  if (isFinalTransferState(observed)) return observed;
  return rank[observed] > rank[current] ? observed : null;
}

/** The lines of a transfer follow it. */
export function lineStateFor(transfer: TransferState): LineState {
  switch (transfer) {
    case "queued":
    case "sending":
      return "in_run";
    default:
      return transfer;
  }
}

/** A Stripe event about a transfer, read as the state it shows. */
export function observedFromEvent(type: string, object: { reversed?: boolean; amount?: number; amount_reversed?: number }): TransferState | null {
  switch (type) {
    case "transfer.failed":
      return "failed";
    case "transfer.reversed":
      return object.reversed || (object.amount != null && object.amount_reversed === object.amount) ? "reversed" : null;
    case "transfer.created":
    case "transfer.updated":
      if (object.reversed) return "reversed";
      return "paid";
    default:
      return null;
  }
}

/** Whether a Stripe error is worth retrying under the same idempotency key. */
export function isRetryableStripeError(err: { type?: string; statusCode?: number; code?: string }): boolean {
  if (err.type === "StripeConnectionError" || err.type === "StripeAPIError" || err.type === "StripeRateLimitError") return true;
  if (err.type === "StripeIdempotencyError") return false;
  if (err.statusCode != null) return err.statusCode >= 500 || err.statusCode === 429 || err.statusCode === 409;
  // No answer at all (a timeout, a dropped connection): we do not know, so try again with the same key.
  return true;
}

/** Back-off before the next attempt: 2 s, 4 s, 8 s … capped at 5 minutes. */
export function retryDelayMs(attempts: number): number {
  return Math.min(300_000, 1000 * 2 ** Math.max(1, Math.min(attempts, 12)));
}
