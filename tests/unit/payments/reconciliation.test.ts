import { describe, expect, it } from "vitest";
import { differenceInCalendarDays } from "date-fns";
import { agingBucketOf, reconcile, remittanceCsv } from "@/lib/payments";

describe("reconciliation rows", () => {
  const base = {
    todayBySite: new Map([["A", "2026-06-30"]]),
    earned: [
      { siteId: "A", currency: "EUR", netMinor: 100_00n },
      { siteId: "A", currency: "EUR", netMinor: 50_00n },
      { siteId: "A", currency: "EUR", netMinor: 30_00n },
      { siteId: "A", currency: "EUR", netMinor: 20_00n },
    ],
    inRun: [{ siteId: "A", currency: "EUR", amountMinor: 20_00n }],
    queries: [],
  };

  it("adds up: earned = not yet paid + in a run + sent + paid", () => {
    const [r] = reconcile({
      ...base,
      transfers: [
        { id: "t1", siteId: "A", currency: "EUR", amountMinor: 100_00n, state: "paid", paidOn: "2026-05-01", confirmation: { amountMinor: 100_00n, receivedOn: "2026-05-03" }, openQueries: 0 },
        { id: "t2", siteId: "A", currency: "EUR", amountMinor: 50_00n, state: "paid", paidOn: "2026-04-01", confirmation: null, openQueries: 0 },
        { id: "t3", siteId: "A", currency: "EUR", amountMinor: 30_00n, state: "failed", paidOn: null, confirmation: null, openQueries: 0 },
      ],
    });
    expect(r!.earnedMinor).toBe(200_00n);
    expect(r!.paidMinor).toBe(150_00n);
    expect(r!.confirmedMinor).toBe(100_00n);
    expect(r!.differenceMinor).toBe(0n);
    expect(r!.awaitingConfirmationMinor).toBe(50_00n);
    expect(r!.failedMinor).toBe(30_00n);
    expect(r!.notYetPaidMinor).toBe(30_00n); // the failed line is due again
    expect(r!.notYetPaidMinor + r!.inRunMinor + r!.sentMinor + r!.paidMinor).toBe(r!.earnedMinor);
    // Age from 2026-04-01 to 2026-06-30 counted with date-fns: 90 days → the 61–90 bucket.
    expect(differenceInCalendarDays(new Date(2026, 5, 30), new Date(2026, 3, 1))).toBe(90);
    expect(r!.aging["61–90 days"]).toEqual({ count: 1, amountMinor: 50_00n });
  });

  it("stops counting a failed payment once its lines are re-sent", () => {
    const failed = { id: "t3", siteId: "A", currency: "EUR", amountMinor: 30_00n, state: "failed" as const, paidOn: null, confirmation: null, openQueries: 0 };
    expect(reconcile({ ...base, transfers: [failed] })[0]!.failedMinor).toBe(30_00n);
    expect(reconcile({ ...base, transfers: [{ ...failed, resent: true }] })[0]!.failedMinor).toBe(0n);
  });

  it("shows the difference when the bank shows another amount", () => {
    const [r] = reconcile({
      ...base,
      transfers: [{ id: "t1", siteId: "A", currency: "EUR", amountMinor: 100_00n, state: "paid", paidOn: "2026-06-01", confirmation: { amountMinor: 99_50n, receivedOn: "2026-06-02" }, openQueries: 1 }],
    });
    expect(r!.differenceMinor).toBe(-50n);
  });

  it("buckets ages at 30, 60 and 90 days", () => {
    expect([0, 30, 31, 60, 61, 90, 91].map(agingBucketOf)).toEqual(["0–30 days", "0–30 days", "31–60 days", "31–60 days", "61–90 days", "61–90 days", "over 90 days"]);
  });
});

describe("remittance CSV (RFC 4180)", () => {
  it("quotes fields, uses CRLF, and totals exactly", () => {
    const csv = remittanceCsv(
      { studyCode: "S", siteCode: "JP01", runNumber: 3, transferReference: "tr_1", currency: "JPY", amountMinor: 150_000n, sentOn: "2026-06-01" },
      [
        { lineKey: "visit:1", kind: "visit", description: 'Visit M1, "late"', serviceDate: "2026-05-01", dueDate: "2026-06-30", amountMinor: 100_000n },
        { lineKey: "visit:2", kind: "visit", description: "Visit M3", serviceDate: "2026-05-02", dueDate: "2026-06-30", amountMinor: 50_000n },
      ],
    );
    const rows = csv.split("\r\n");
    expect(rows[1]).toBe('S,JP01,3,tr_1,visit:1,visit,"Visit M1, ""late""",2026-05-01,2026-06-30,JPY,100000');
    expect(rows[3]).toBe("S,JP01,3,tr_1,TOTAL,,,,,JPY,150000");
    expect(csv.endsWith("\r\n")).toBe(true);
  });
});

describe("study-wide totals by currency", () => {
  it("adds sites of one currency and keeps currencies apart", async () => {
    const { totalsByCurrency } = await import("@/lib/payments/reconciliation");
    const rows = reconcile({
      todayBySite: new Map(),
      earned: [
        { siteId: "A", currency: "EUR", netMinor: 100n },
        { siteId: "B", currency: "EUR", netMinor: 50n },
        { siteId: "C", currency: "JPY", netMinor: 7000n },
      ],
      inRun: [],
      transfers: [],
      queries: [],
    });
    const t = totalsByCurrency(rows);
    expect(t.map((r) => [r.currency, r.earnedMinor])).toEqual([
      ["EUR", 150n],
      ["JPY", 7000n],
    ]);
    expect(rows.find((r) => r.siteId === "A")!.earnedMinor).toBe(100n); // the site rows are left as they were
  });
});
