import { describe, expect, it } from "vitest";
import { parsePaymentRow, parseVisitRow, paymentRowText, visitRowText, US } from "@/lib/ledger/snapshot-rows";

// The loader's one-column rows: what PostgreSQL's concat_ws returns, parsed back field by field.
describe("snapshot rows", () => {
  it("parses a visit row as concat_ws writes it, empty dates as null", () => {
    const text = ["6f1c2e9a-0000-4000-8000-000000000001", "6f1c2e9a-0000-4000-8000-000000000002", "", "done", "2026-03-10", "2026-03-12", "", "M01"].join(US);
    expect(parseVisitRow(text)).toEqual({ id: "6f1c2e9a-0000-4000-8000-000000000001", subjectId: "6f1c2e9a-0000-4000-8000-000000000002", versionId: "", outcome: "done", actualDate: "2026-03-10", dataEnteredOn: "2026-03-12", verifiedOn: null, visitCode: "M01" });
  });

  it("keeps a visit code that contains the separator (the free-text field comes last)", () => {
    const row = { id: "v", subjectId: "s", versionId: "pv", outcome: "missed" as const, actualDate: "2026-01-02", dataEnteredOn: null, verifiedOn: "2026-01-09", visitCode: `odd${US}code` };
    expect(parseVisitRow(visitRowText(row))).toEqual(row);
  });

  it("round-trips a payment row, the amount as a bigint beyond 2^53", () => {
    const row = { siteId: "site-a", lineKey: "visit:6f1c2e9a-0000-4000-8000-000000000001", amountMinor: 9_007_199_254_740_993n, paidOn: "2026-02-28" };
    expect(paymentRowText(row)).toBe(`9007199254740993${US}2026-02-28${US}site-a${US}visit:6f1c2e9a-0000-4000-8000-000000000001`);
    expect(parsePaymentRow(paymentRowText(row))).toEqual(row);
  });
});
