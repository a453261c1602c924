import { describe, expect, it } from "vitest";
import { computePaymentSchedule, type EarnedLine } from "@/lib/payment-schedule";
import { ScheduleLine } from "@/lib/payment-schedule/line";
import { generateStudy } from "../../../scripts/bench/generate-study";
import { budget, site, snapshot } from "./fixtures";

// The engine's lines keep references and read every field through getters; what leaves the server
// is their plain form. These checks hold that form to the EarnedLine contract.
const FIELDS: (keyof EarnedLine)[] = [
  "key", "siteId", "currency", "kind", "source", "serviceDate", "triggerDate", "trigger", "budgetVersionId", "budgetVersionNumber",
  "grossMinor", "overheadMinor", "holdbackMinor", "netMinor", "overCap", "cappedFeeMinor", "capLiftedOn", "capLiftedBySubjectId",
  "cycle", "dueDate", "paidMinor", "outstandingMinor", "unappliedMinor", "lastPaidOn", "partiallyPaid", "inPaymentRun", "state",
];

describe("schedule lines", () => {
  const snap = generateStudy({ sites: 20, subjects: 1_000, visits: 12_000, seed: 7 });
  const first = computePaymentSchedule(snap);
  // Added: lines in a run, a partial payment and one beyond the net (the generator pays in full).
  const unpaid = first.lines.filter((l) => l.kind === "visit" && l.paidMinor === 0n && l.netMinor > 1n);
  const [partly, beyond] = [unpaid[0] as EarnedLine, unpaid[1] as EarnedLine];
  const s = computePaymentSchedule({
    ...snap,
    inPaymentRun: first.lines.filter((_, i) => i % 50 === 0).map((l) => l.key),
    payments: [...(snap.payments ?? []), { siteId: partly.siteId, lineKey: partly.key, amountMinor: partly.netMinor / 2n, paidOn: partly.triggerDate }, { siteId: beyond.siteId, lineKey: beyond.key, amountMinor: beyond.netMinor + 100n, paidOn: beyond.triggerDate }],
  });

  // (Over-cap screen failures, state not_payable, are checked in worked-examples.test.ts.)
  it("covers every kind of line, state and payment case in the study", () => {
    const kinds = new Set(s.lines.map((l) => l.kind));
    expect([...kinds].sort()).toEqual(["holdback_release", "milestone", "pass_through", "screen_failure", "startup", "visit"]);
    expect(new Set(s.lines.map((l) => l.state))).toEqual(new Set(["paid", "outstanding", "overdue"]));
    expect(s.lines.some((l) => l.partiallyPaid)).toBe(true);
    expect(s.lines.some((l) => l.unappliedMinor > 0n)).toBe(true);
    expect(s.lines.some((l) => l.inPaymentRun)).toBe(true);
  });

  it("gives a plain object with every field of EarnedLine, equal to what the getters read", () => {
    expect(s.lines.every((l) => l instanceof ScheduleLine)).toBe(true);
    const plain = s.lines.map((l) => (l as ScheduleLine).toJSON());
    expect(plain.every((p) => Object.keys(p).join() === FIELDS.join())).toBe(true);
    expect(plain).toEqual(s.lines.map((l) => Object.fromEntries(FIELDS.map((f) => [f, l[f]]))));
  });

  it("serialises to JSON with every field (the API's bigint replacer), settled as the totals count it", () => {
    // Same replacer as jsonResponse in src/server/api/route.ts.
    const json = JSON.parse(JSON.stringify(s.lines, (_k, v) => (typeof v === "bigint" ? v.toString() : v))) as Record<string, unknown>[];
    expect(json).toHaveLength(s.lines.length);
    for (const [i, row] of json.entries()) {
      const l = s.lines[i] as EarnedLine;
      expect(Object.keys(row)).toEqual(FIELDS);
      expect(row.paidMinor).toBe(l.paidMinor.toString());
      expect(row.state).toBe(l.state);
      expect(row.source).toEqual(l.source);
      // Settled: what is paid never exceeds the net; the rest is outstanding or unapplied.
      expect(BigInt(row.paidMinor as string) + BigInt(row.outstandingMinor as string)).toBe(l.netMinor);
    }
    // The site totals are the sums of the serialised lines.
    for (const t of s.sites) {
      const mine = json.filter((r) => r.siteId === t.siteId);
      expect(mine.reduce((a, r) => a + BigInt(r.outstandingMinor as string), 0n)).toBe(t.outstandingMinor);
      expect(mine.reduce((a, r) => a + BigInt(r.paidMinor as string), 0n)).toBe(t.paidMinor);
      expect(mine.reduce((a, r) => a + BigInt(r.unappliedMinor as string), 0n)).toBe(t.unappliedMinor);
    }
  });

  it("cannot be changed by its readers", () => {
    const l = s.lines[0] as EarnedLine;
    expect(() => {
      (l as { netMinor: bigint }).netMinor = 1n;
    }).toThrow(TypeError);
  });

  it("orders lines by trigger date then key also when they are more than a century apart (the comparison path)", () => {
    const v = (id: string, serviceDate: string) => ({ id, subjectId: "a", visitCode: "V1", serviceDate, status: "done" as const });
    const out = computePaymentSchedule(
      snapshot({
        asOf: "2026-12-01",
        sites: [site({ id: "old1", activatedOn: "1901-03-01" })],
        budgetVersions: [budget({ id: "b1", siteId: "old1", effectiveFrom: "1900-01-01", startupFeeMinor: 100n, visitFees: { V1: 10n } })],
        subjects: [{ id: "a", siteId: "old1", code: "S-a", screenedOn: "1901-03-02", enrolledOn: "1901-03-02" }],
        visits: [v("z", "2026-05-05"), v("b", "1901-03-01"), v("y", "2026-05-05"), v("a", "1950-01-01")],
      }),
    );
    expect(out.lines.map((l) => l.key)).toEqual(["startup:old1", "visit:b", "visit:a", "visit:y", "visit:z"]);
  });

  it("stays exact beyond 2^53 minor units: payments, clamping and sums in bigints", () => {
    // 2^60 = 1,152,921,504,606,846,976: far past the doubles' exact integers (2^53).
    const big = 2n ** 60n;
    const v = (id: string) => ({ id, subjectId: "a", visitCode: "V1", serviceDate: "2026-03-10", status: "done" as const });
    const out = computePaymentSchedule(
      snapshot({
        asOf: "2026-12-01",
        sites: [site({ id: "x1", activatedOn: "2026-01-01" })],
        budgetVersions: [budget({ id: "b1", siteId: "x1", visitFees: { V1: big } })],
        subjects: [{ id: "a", siteId: "x1", code: "S-a", screenedOn: "2026-01-02", enrolledOn: "2026-01-03" }],
        visits: [v("p1"), v("p2"), v("p3")],
        payments: [
          { siteId: "x1", lineKey: "visit:p1", amountMinor: big + 5n, paidOn: "2026-04-01" },
          { siteId: "x1", lineKey: "visit:p2", amountMinor: 3n, paidOn: "2026-04-01" },
          { siteId: "x1", lineKey: "visit:p2", amountMinor: big - 4n, paidOn: "2026-04-02" },
          { siteId: "x1", lineKey: "visit:p3", amountMinor: 7n, paidOn: "2026-04-03" },
        ],
      }),
    );
    const [p1, p2, p3] = ["visit:p1", "visit:p2", "visit:p3"].map((k) => out.lines.find((l) => l.key === k) as EarnedLine);
    expect(p1).toMatchObject({ paidMinor: big, outstandingMinor: 0n, unappliedMinor: 5n, state: "paid", lastPaidOn: "2026-04-01" });
    expect(p2).toMatchObject({ paidMinor: big - 1n, outstandingMinor: 1n, partiallyPaid: true, state: "overdue", lastPaidOn: "2026-04-02" });
    expect(p3).toMatchObject({ paidMinor: 7n, outstandingMinor: big - 7n, unappliedMinor: 0n });
    const t = out.sites[0]!;
    expect(t).toMatchObject({ earnedMinor: 3n * big, paidMinor: 2n * big + 6n, outstandingMinor: big - 6n, unappliedMinor: 5n, heldBackMinor: 0n });
    expect(t.earnedMinor).toBe(t.paidMinor + t.outstandingMinor + t.heldBackMinor);
  });
});
