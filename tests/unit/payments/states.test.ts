import { describe, expect, it } from "vitest";
import { isRetryableStripeError, nextTransferState, observedFromEvent, type TransferState } from "@/lib/payments/states";

// Common practice for at-least-once event delivery: apply events idempotently and never move back.
function applyAll(start: TransferState, observations: TransferState[]): TransferState {
  let s = start;
  for (const o of observations) s = nextTransferState(s, o) ?? s;
  return s;
}

function permutations<T>(xs: T[]): T[][] {
  if (xs.length <= 1) return [xs];
  return xs.flatMap((x, i) => permutations([...xs.slice(0, i), ...xs.slice(i + 1)]).map((p) => [x, ...p]));
}

describe("transfer state machine", () => {
  it("moves forward: queued → sending → sent → paid", () => {
    expect(applyAll("queued", ["sending", "sent", "paid"])).toBe("paid");
  });

  it("ignores a late 'sent' after 'paid' (the webhook may arrive before the API answer)", () => {
    expect(nextTransferState("paid", "sent")).toBeNull();
    expect(applyAll("sending", ["paid", "sent"])).toBe("paid");
  });

  it("ends failed whatever the order of created and failed events", () => {
    for (const order of permutations<TransferState>(["sent", "paid", "failed"])) expect(applyAll("sending", order), order.join(",")).toBe("failed");
  });

  it("ends reversed whatever the order, and never leaves a final state", () => {
    for (const order of permutations<TransferState>(["sent", "paid", "reversed", "paid"])) expect(applyAll("queued", order)).toBe("reversed");
    expect(nextTransferState("failed", "paid")).toBeNull();
    expect(nextTransferState("reversed", "failed")).toBeNull();
  });

  it("applies a duplicate once", () => {
    expect(nextTransferState("paid", "paid")).toBeNull();
  });

  it("reads Stripe events", () => {
    expect(observedFromEvent("transfer.created", { reversed: false })).toBe("paid");
    expect(observedFromEvent("transfer.failed", { reversed: true })).toBe("failed");
    expect(observedFromEvent("transfer.reversed", { reversed: true, amount: 100, amount_reversed: 100 })).toBe("reversed");
    expect(observedFromEvent("transfer.reversed", { reversed: false, amount: 100, amount_reversed: 40 })).toBeNull();
    expect(observedFromEvent("account.updated", {})).toBeNull();
  });

  it("retries server errors and lost answers, not refusals", () => {
    expect(isRetryableStripeError({ type: "StripeAPIError", statusCode: 500 })).toBe(true);
    expect(isRetryableStripeError({ type: "StripeConnectionError" })).toBe(true);
    expect(isRetryableStripeError({ type: "StripeInvalidRequestError", statusCode: 400, code: "insufficient_capabilities_for_transfer" })).toBe(false);
    expect(isRetryableStripeError({ type: "StripeIdempotencyError", statusCode: 400 })).toBe(false);
  });
});
