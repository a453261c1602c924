import { describe, expect, it } from "vitest";
import { computePaymentSchedule, paymentScheduleSnapshotSchema } from "@/lib/payment-schedule";
import { budget, site } from "./fixtures";

const valid = {
  asOf: "2026-12-01",
  sites: [site({ id: "s1", activatedOn: "2026-01-10" })],
  budgetVersions: [budget({ id: "b1", siteId: "s1", startupFeeMinor: 100000n, milestoneFees: [{ kind: "nth_enrolled", n: 5, amountMinor: 1n }] })],
  subjects: [],
  visits: [],
};

describe("snapshot schema", () => {
  it("accepts a valid snapshot, fills defaults, and the engine runs on the result", () => {
    const parsed = paymentScheduleSnapshotSchema.parse(valid);
    expect(parsed.payments).toEqual([]);
    expect(computePaymentSchedule(parsed).lines.map((l) => l.key)).toEqual(["startup:s1"]);
  });

  it("refuses negative amounts, unsupported currencies, malformed dates and an N-enrolled milestone without N", () => {
    const bad = (patch: (v: typeof valid) => unknown) => paymentScheduleSnapshotSchema.safeParse(patch(structuredClone(valid))).success;
    expect(bad((v) => ({ ...v, budgetVersions: [{ ...v.budgetVersions[0], startupFeeMinor: -1n }] }))).toBe(false);
    expect(bad((v) => ({ ...v, sites: [{ ...v.sites[0], currency: "XAU" }] }))).toBe(false);
    expect(bad((v) => ({ ...v, sites: [{ ...v.sites[0], activatedOn: "10/01/2026" }] }))).toBe(false);
    expect(bad((v) => ({ ...v, budgetVersions: [{ ...v.budgetVersions[0], milestoneFees: [{ kind: "nth_enrolled", amountMinor: 1n }] }] }))).toBe(false);
    expect(bad((v) => ({ ...v, budgetVersions: [{ ...v.budgetVersions[0], holdbackBps: 10_001 }] }))).toBe(false);
    expect(bad((v) => v)).toBe(true);
  });

  it("refuses a site twice and an unsupported currency at compute time", () => {
    expect(() => computePaymentSchedule({ ...valid, sites: [valid.sites[0]!, valid.sites[0]!] })).toThrow(/appears twice/);
    expect(() => computePaymentSchedule({ ...valid, sites: [{ ...valid.sites[0]!, currency: "XAU" }] })).toThrow(/not supported/);
  });
});
