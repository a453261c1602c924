import { describe, expect, it } from "vitest";
import { addDays as dfAddDays, endOfQuarter, format } from "date-fns";
import { formatMinor } from "@/lib/money";
import { computePaymentSchedule, type EarnedLine, type PaymentSchedule } from "@/lib/payment-schedule";
import { budget, site, snapshot } from "./fixtures";

function line(schedule: PaymentSchedule, key: string): EarnedLine {
  const l = schedule.lines.find((x) => x.key === key);
  if (!l) throw new Error(`no line ${key}`);
  return l;
}

const subject = (id: string, siteId: string, extra: Record<string, string> = {}) => ({ id, siteId, code: `S-${id}`, screenedOn: "2026-01-05", ...extra });

describe("a visit fee with overhead and holdback", () => {
  // REFERENCES.md worked example (common practice rates): fee EUR 1,234.56, overhead 25%, holdback 10%.
  const s = computePaymentSchedule(
    snapshot({
      asOf: "2026-06-30",
      sites: [site({ id: "fr1", activatedOn: "2026-01-10" })],
      budgetVersions: [budget({ id: "b1", siteId: "fr1", visitFees: { V1: 123456n, V2: 33333n }, overheadBps: 2500, holdbackBps: 1000 })],
      subjects: [subject("a", "fr1", { enrolledOn: "2026-02-01" })],
      visits: [
        { id: "v1", subjectId: "a", visitCode: "V1", serviceDate: "2026-03-10", status: "done" },
        { id: "v2", subjectId: "a", visitCode: "V2", serviceDate: "2026-03-11", status: "done" },
        { id: "v3", subjectId: "a", visitCode: "V2", serviceDate: "2026-03-12", status: "missed" },
      ],
    }),
  );

  it("prices each line once: 1,234.56 + 308.64 − 154.32 = 1,388.88", () => {
    const l = line(s, "visit:v1");
    // overhead = 1234.56 × 0.25 = 308.64; holdback = (1234.56 + 308.64) × 0.10 = 154.32; net = 1388.88
    expect([l.grossMinor, l.overheadMinor, l.holdbackMinor, l.netMinor]).toEqual([123456n, 30864n, 15432n, 138888n]);
    expect(formatMinor(l.netMinor, l.currency)).toBe("1,388.88 EUR");
  });

  it("rounds half away from zero on each component", () => {
    const l = line(s, "visit:v2");
    // overhead = 333.33 × 0.25 = 83.3325 → 83.33; holdback = (333.33 + 83.33) × 0.10 = 41.666 → 41.67;
    // net = 333.33 + 83.33 − 41.67 = 374.99
    expect([l.grossMinor, l.overheadMinor, l.holdbackMinor, l.netMinor]).toEqual([33333n, 8333n, 4167n, 37499n]);
  });

  it("earns nothing for a missed visit and traces each line", () => {
    expect(s.lines.some((l) => l.key === "visit:v3")).toBe(false);
    const l = line(s, "visit:v1");
    expect(l).toMatchObject({ serviceDate: "2026-03-10", triggerDate: "2026-03-10", trigger: "visit_completed", budgetVersionId: "b1", source: { event: "visit", id: "v1", subjectCode: "S-a", visitCode: "V1" } });
    // totals are sums of lines: 1388.88 + 374.99 = 1763.87 net; 154.32 + 41.67 = 195.99 held back
    expect(s.sites[0]).toMatchObject({ netMinor: 176387n, heldBackMinor: 19599n, earnedMinor: 123456n + 30864n + 33333n + 8333n });
  });
});

describe("a budget amendment splits one subject's visits by service date", () => {
  const s = computePaymentSchedule(
    snapshot({
      asOf: "2026-06-30",
      sites: [site({ id: "de1", activatedOn: "2026-01-10" })],
      budgetVersions: [
        budget({ id: "b1", siteId: "de1", versionNumber: 1, effectiveFrom: "2026-01-01", visitFees: { M1: 50000n, M3: 50000n }, overheadBps: 2000 }),
        // Amendment effective from the ethics approval date at the site.
        budget({ id: "b2", siteId: "de1", versionNumber: 2, effectiveFrom: "2026-04-15", visitFees: { M1: 50000n, M3: 60000n, M6: 70000n }, overheadBps: 2000 }),
      ],
      subjects: [subject("a", "de1", { enrolledOn: "2026-01-20" })],
      visits: [
        { id: "m1", subjectId: "a", visitCode: "M1", serviceDate: "2026-02-20", status: "done" },
        { id: "m3", subjectId: "a", visitCode: "M3", serviceDate: "2026-04-14", status: "done" },
        { id: "m3b", subjectId: "a", visitCode: "M3", serviceDate: "2026-04-15", status: "done" },
        { id: "m6", subjectId: "a", visitCode: "M6", serviceDate: "2026-03-30", status: "done" },
      ],
    }),
  );
  it("applies version 1 the day before the amendment and version 2 from its effective date", () => {
    // 500.00 × 1.20 = 600.00 under version 1; 600.00 × 1.20 = 720.00 under version 2
    expect(line(s, "visit:m3")).toMatchObject({ budgetVersionNumber: 1, grossMinor: 50000n, overheadMinor: 10000n, netMinor: 60000n });
    expect(line(s, "visit:m3b")).toMatchObject({ budgetVersionNumber: 2, grossMinor: 60000n, overheadMinor: 12000n, netMinor: 72000n });
  });
  it("reports a visit whose code has no fee in the version then in force", () => {
    expect(s.pending).toContainEqual(expect.objectContaining({ key: "visit:m6", reason: "no_fee_for_visit_code" }));
  });
});

describe("screen-failure cap: one paid per 4 enrolled (common practice ratio)", () => {
  const base = {
    sites: [site({ id: "uk1", currency: "GBP", timeZone: "Europe/London", activatedOn: "2026-01-02" })],
    budgetVersions: [budget({ id: "b1", siteId: "uk1", screenFailureFeeMinor: 20000n, screenFailureCap: { perEnrolled: 4 }, overheadBps: 1000 })],
    subjects: [
      subject("f1", "uk1", { screenFailedOn: "2026-01-15" }),
      ...["e1", "e2", "e3", "e4"].map((id, i) => subject(id, "uk1", { enrolledOn: `2026-02-0${i + 1}` })),
      subject("f2", "uk1", { screenFailedOn: "2026-03-03" }),
      ...["e5", "e6", "e7", "e8"].map((id, i) => subject(id, "uk1", { enrolledOn: `2026-05-1${i}` })),
    ],
    visits: [],
  };

  it("before more enrolment: the second failure is a zero-value over-cap line", () => {
    const s = computePaymentSchedule(snapshot({ ...base, asOf: "2026-04-30" }));
    // f1 (15 Jan, 0 enrolled: cap 0) waits; the 4th enrolment on 4 Feb lifts the cap to 1 → payable then.
    // 200.00 + 10% overhead = 220.00
    expect(line(s, "screen-failure:f1")).toMatchObject({ overCap: false, triggerDate: "2026-02-04", capLiftedBySubjectId: "e4", serviceDate: "2026-01-15", netMinor: 22000n, cycle: { label: "2026-02" } });
    // f2 on 3 Mar: 4 enrolled allow 1, already used → over the cap
    expect(line(s, "screen-failure:f2")).toMatchObject({ overCap: true, netMinor: 0n, cappedFeeMinor: 20000n, state: "not_payable" });
  });

  it("after more enrolment: the 8th enrolled subject lifts it into that enrolment's cycle", () => {
    const s = computePaymentSchedule(snapshot({ ...base, asOf: "2026-06-30" }));
    // e8 enrolled 13 May → 8 enrolled allow 2 paid failures
    expect(line(s, "screen-failure:f2")).toMatchObject({ overCap: false, triggerDate: "2026-05-13", capLiftedBySubjectId: "e8", netMinor: 22000n, cycle: { label: "2026-05" }, budgetVersionId: "b1" });
  });
});

describe("quarterly cycle, net 45, across a year end (date arithmetic checked against date-fns)", () => {
  const s = computePaymentSchedule(
    snapshot({
      asOf: "2027-02-15",
      sites: [site({ id: "se1", currency: "SEK", timeZone: "Europe/Stockholm", activatedOn: "2026-11-20" })],
      budgetVersions: [budget({ id: "b1", siteId: "se1", startupFeeMinor: 2500000n, cycle: "quarterly", netDays: 45 })],
    }),
  );
  it("falls in 2026-Q4 and is due 2027-02-14", () => {
    const reference = format(dfAddDays(endOfQuarter(new Date(2026, 10, 20)), 45), "yyyy-MM-dd");
    expect(reference).toBe("2027-02-14");
    const l = line(s, "startup:se1");
    expect(l.cycle).toEqual({ cycle: "quarterly", label: "2026-Q4", start: "2026-10-01", end: "2026-12-31" });
    expect(l.dueDate).toBe(reference);
  });
  it("is overdue the day after the due date, outstanding on it", () => {
    expect(line(s, "startup:se1").state).toBe("overdue");
    const onDue = computePaymentSchedule(snapshot({ asOf: "2027-02-14", sites: [site({ id: "se1", currency: "SEK", activatedOn: "2026-11-20" })], budgetVersions: [budget({ id: "b1", siteId: "se1", startupFeeMinor: 2500000n, cycle: "quarterly", netDays: 45 })] }));
    expect(line(onDue, "startup:se1").state).toBe("outstanding");
  });
});

describe("a JPY site (no minor unit)", () => {
  const s = computePaymentSchedule(
    snapshot({
      asOf: "2026-09-30T12:00:00Z",
      sites: [site({ id: "jp1", currency: "JPY", timeZone: "Asia/Tokyo", activatedOn: "2026-04-01" })],
      budgetVersions: [budget({ id: "b1", siteId: "jp1", visitFees: { V1: 12342n }, overheadBps: 2500, holdbackBps: 1000 })],
      subjects: [subject("a", "jp1", { enrolledOn: "2026-05-01" })],
      visits: [{ id: "v1", subjectId: "a", visitCode: "V1", serviceDate: "2026-06-01", status: "done" }],
    }),
  );
  it("rounds to whole yen", () => {
    // overhead = 12,342 × 0.25 = 3,085.5 → 3,086 (half away from zero); holdback = 15,428 × 0.10 = 1,542.8 → 1,543;
    // net = 12,342 + 3,086 − 1,543 = 13,885
    const l = line(s, "visit:v1");
    expect([l.overheadMinor, l.holdbackMinor, l.netMinor]).toEqual([3086n, 1543n, 13885n]);
    expect(formatMinor(l.netMinor, "JPY")).toBe("13,885 JPY");
    expect(s.sites[0]?.asOf).toBe("2026-09-30"); // 12:00 UTC is 21:00 in Tokyo, same day
  });
});

describe("triggers, payments, pass-through costs, milestones and close-out", () => {
  const sites = [site({ id: "us1", currency: "USD", timeZone: "America/New_York", activatedOn: "2026-01-05", closedOutOn: "2026-10-15" }), site({ id: "ch1", currency: "CHF", timeZone: "Europe/Zurich", activatedOn: "2026-02-01" })];
  const budgetVersions = [
    budget({
      id: "u1",
      siteId: "us1",
      startupFeeMinor: 500000n,
      milestoneFees: [
        { kind: "first_implant", amountMinor: 100000n },
        { kind: "nth_enrolled", n: 2, amountMinor: 200000n },
        { kind: "close_out", amountMinor: 300000n },
      ],
      visitFees: { V1: 100000n },
      overheadBps: 3000,
      holdbackBps: 1000,
      trigger: "data_entered",
    }),
    budget({ id: "c1", siteId: "ch1", visitFees: { V1: 80000n }, overheadBps: 2500, holdbackBps: 500, trigger: "monitor_verified" }),
  ];
  const subjects = [
    subject("a", "us1", { enrolledOn: "2026-02-01", implantedOn: "2026-02-10" }),
    subject("b", "us1", { enrolledOn: "2026-03-01" }),
    subject("c", "ch1", { enrolledOn: "2026-03-01" }),
  ];
  const visits = [
    { id: "x1", subjectId: "a", visitCode: "V1", serviceDate: "2026-03-20", status: "done" as const, dataEnteredOn: "2026-04-02" },
    { id: "x2", subjectId: "b", visitCode: "V1", serviceDate: "2026-04-20", status: "done" as const },
    { id: "y1", subjectId: "c", visitCode: "V1", serviceDate: "2026-04-20", status: "done" as const, dataEnteredOn: "2026-04-21" },
    { id: "y2", subjectId: "c", visitCode: "V1", serviceDate: "2026-05-20", status: "done" as const, verifiedOn: "2026-06-03" },
  ];
  const s = computePaymentSchedule(
    snapshot({
      asOf: "2026-11-30",
      sites,
      budgetVersions,
      subjects,
      visits,
      passThroughInvoices: [{ id: "irb1", siteId: "us1", approvedOn: "2026-01-20", amountMinor: 250000n, description: "Ethics committee review fee" }],
      payments: [
        { siteId: "us1", lineKey: "startup:us1", amountMinor: 585000n, paidOn: "2026-02-20" },
        { siteId: "us1", lineKey: "visit:x1", amountMinor: 50000n, paidOn: "2026-05-20" },
        { siteId: "us1", lineKey: "pass-through:irb1", amountMinor: 260000n, paidOn: "2026-03-01" },
        { siteId: "us1", lineKey: "visit:nope", amountMinor: 1n, paidOn: "2026-03-01" },
        // Paid to us1 under the key of a ch1 line: it settles nothing at ch1.
        { siteId: "us1", lineKey: "visit:y2", amountMinor: 2n, paidOn: "2026-03-02" },
      ],
      inPaymentRun: ["visit:y2"],
    }),
  );

  it("earns a data-entry-triggered visit on its entry date, and holds back one without data", () => {
    expect(line(s, "visit:x1")).toMatchObject({ triggerDate: "2026-04-02", trigger: "data_entered", cycle: { label: "2026-04" } });
    expect(s.pending).toContainEqual(expect.objectContaining({ key: "visit:x2", reason: "awaiting_data_entry" }));
    expect(line(s, "visit:y2")).toMatchObject({ triggerDate: "2026-06-03", trigger: "monitor_verified", inPaymentRun: true });
    expect(s.pending).toContainEqual(expect.objectContaining({ key: "visit:y1", reason: "awaiting_verification" }));
  });

  it("applies payments fully, partly and beyond the net", () => {
    // start-up 5,000.00 + 30% = 6,500.00; holdback 650.00; net 5,850.00 — paid in full
    expect(line(s, "startup:us1")).toMatchObject({ netMinor: 585000n, paidMinor: 585000n, state: "paid" });
    // visit 1,000.00 + 300.00 − 130.00 = 1,170.00; 500.00 paid, 670.00 left; April cycle ends 2026-04-30, + 30 days = due 2026-05-30
    expect(line(s, "visit:x1")).toMatchObject({ netMinor: 117000n, paidMinor: 50000n, outstandingMinor: 67000n, partiallyPaid: true, state: "overdue", dueDate: "2026-05-30" });
    // pass-through at cost: 2,500.00, no overhead, nothing withheld; 2,600.00 paid → 100.00 unapplied
    expect(line(s, "pass-through:irb1")).toMatchObject({ overheadMinor: 0n, holdbackMinor: 0n, netMinor: 250000n, paidMinor: 250000n, unappliedMinor: 10000n });
    expect(s.unmatchedPayments).toEqual([
      { siteId: "us1", lineKey: "visit:nope", amountMinor: 1n, paidOn: "2026-03-01", reason: "no_such_line" },
      { siteId: "us1", lineKey: "visit:y2", amountMinor: 2n, paidOn: "2026-03-02", reason: "no_such_line" },
    ]);
    expect(line(s, "visit:y2")).toMatchObject({ paidMinor: 0n, lastPaidOn: null });
  });

  it("pays milestones at their event dates", () => {
    expect(line(s, "milestone:us1:first_implant")).toMatchObject({ triggerDate: "2026-02-10" });
    expect(line(s, "milestone:us1:enrolled-2")).toMatchObject({ triggerDate: "2026-03-01", source: { subjectId: "b", n: 2 } });
    expect(line(s, "milestone:us1:close_out")).toMatchObject({ triggerDate: "2026-10-15" });
  });

  it("releases at close-out exactly what was withheld", () => {
    const release = line(s, "holdback-release:us1");
    // withheld: start-up 650.00 + implant 130.00 + 2nd enrolled 260.00 + visit 130.00 + close-out 390.00 = 1,560.00
    expect(release).toMatchObject({ triggerDate: "2026-10-15", holdbackMinor: -156000n, netMinor: 156000n, grossMinor: 0n });
    const ledger = s.holdback.find((h) => h.siteId === "us1");
    expect(ledger).toMatchObject({ withheldMinor: 156000n, releasedMinor: 156000n, balanceMinor: 0n, releaseLineKey: "holdback-release:us1" });
  });

  it("keeps currencies apart and reconciles each", () => {
    expect(s.currencies.map((c) => c.currency)).toEqual(["CHF", "USD"]);
    for (const t of [...s.sites, ...s.currencies]) expect(t.earnedMinor).toBe(t.paidMinor + t.outstandingMinor + t.heldBackMinor);
    // CHF: 800.00 + 200.00 = 1,000.00 earned; 50.00 held back; 950.00 outstanding
    expect(s.currencies[0]).toMatchObject({ earnedMinor: 100000n, heldBackMinor: 5000n, outstandingMinor: 95000n, siteCount: 1 });
  });
});
