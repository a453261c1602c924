import { describe, expect, it } from "vitest";
import { computePaymentSchedule } from "@/lib/payment-schedule";
import { generateStudy } from "../../../scripts/bench/generate-study";

// The summary's fast path (no lines kept) against the full computation, on the benchmark's generated
// studies: amendments, caps, three triggers, close-outs, partial and excess payments, projection.
describe("totals-only schedule on generated studies", () => {
  it.each([3, 42])("seed %i: everything but the lines equals the full computation", (seed) => {
    const snap = generateStudy({ sites: 12, subjects: 600, visits: 9_000, seed });
    const full = computePaymentSchedule(snap);
    expect(full.lines.length).toBeGreaterThan(1_000);
    expect(full.unmatchedPayments.length + full.pending.length).toBeGreaterThan(0);
    expect(computePaymentSchedule(snap, { lines: false })).toEqual({ ...full, lines: [] });
  });
});
