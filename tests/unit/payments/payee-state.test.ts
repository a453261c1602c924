import { describe, expect, it } from "vitest";
import { payeeStateOf } from "@/server/payments/payee-state";

// Stripe Connect account fields (Stripe API reference, Account: capabilities.transfers and
// requirements.disabled_reason; reason codes from memory) → Cairn's payee states.
describe("payee state from a Stripe account", () => {
  it("is verified only when the transfers capability is active", () => {
    expect(payeeStateOf({ capabilities: { transfers: "active" }, requirements: { disabled_reason: null } }).state).toBe("verified");
    expect(payeeStateOf({ capabilities: { transfers: "pending" }, requirements: { disabled_reason: "requirements.pending_verification" } }).state).toBe("pending");
    expect(payeeStateOf({ capabilities: {}, requirements: {} }).state).toBe("pending");
  });
  it("is restricted when requirements are past due, rejected when Stripe rejected it", () => {
    expect(payeeStateOf({ capabilities: { transfers: "inactive" }, requirements: { disabled_reason: "requirements.past_due" } })).toEqual({ state: "restricted", reason: "requirements.past_due" });
    expect(payeeStateOf({ capabilities: { transfers: "inactive" }, requirements: { disabled_reason: "rejected.other" } }).state).toBe("rejected");
  });
});
