import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { computePaymentSchedule, type BudgetVersion, type PaymentSchedule, type PaymentScheduleSnapshot, type RecordedVisit, type Site, type Subject } from "@/lib/payment-schedule";
import { addDays } from "@/lib/payment-schedule/calendar";
import type { ScheduleLine } from "@/lib/payment-schedule/line";
import { budget, site } from "./fixtures";

// Random small studies: budgets with amendments, caps, triggers, close-outs and random payments.
const DAY0 = "2025-01-01";
const day = (n: number) => addDays(DAY0, n);
const CURRENCIES = ["EUR", "JPY", "KWD", "USD"] as const;

const versionArb = fc.record({
  start: fc.integer({ min: -30, max: 400 }),
  fees: fc.array(fc.bigInt({ min: 0n, max: 5_000_000n }), { minLength: 3, maxLength: 3 }),
  startup: fc.bigInt({ min: 0n, max: 10_000_000n }),
  milestone: fc.bigInt({ min: 0n, max: 1_000_000n }),
  sf: fc.bigInt({ min: 0n, max: 500_000n }),
  perEnrolled: fc.option(fc.integer({ min: 1, max: 4 })),
  maxCount: fc.option(fc.integer({ min: 0, max: 3 })),
  overheadBps: fc.integer({ min: 0, max: 5000 }),
  holdbackBps: fc.integer({ min: 0, max: 2000 }),
  cycle: fc.constantFrom("monthly" as const, "quarterly" as const),
  netDays: fc.constantFrom(0, 30, 45, 60),
  trigger: fc.constantFrom("visit_completed" as const, "data_entered" as const, "monitor_verified" as const),
});

const subjectArb = fc.record({
  screened: fc.integer({ min: 0, max: 500 }),
  enrolAfter: fc.option(fc.integer({ min: 1, max: 30 })),
  visits: fc.array(
    fc.record({ code: fc.constantFrom("V1", "V2", "V3", "VX"), after: fc.integer({ min: 0, max: 300 }), done: fc.boolean(), entry: fc.option(fc.integer({ min: 0, max: 40 })), verify: fc.option(fc.integer({ min: 0, max: 90 })) }),
    { maxLength: 4 },
  ),
});

const siteArb = fc.record({
  currency: fc.constantFrom(...CURRENCIES),
  activated: fc.option(fc.integer({ min: 0, max: 200 })),
  closeOut: fc.option(fc.integer({ min: 300, max: 800 })),
  versions: fc.array(versionArb, { minLength: 1, maxLength: 2 }),
  subjects: fc.array(subjectArb, { maxLength: 8 }),
  invoice: fc.option(fc.record({ at: fc.integer({ min: 0, max: 600 }), amount: fc.bigInt({ min: 0n, max: 900_000n }) })),
});

const studyArb = fc.record({
  sites: fc.array(siteArb, { minLength: 1, maxLength: 3 }),
  asOf: fc.integer({ min: 100, max: 900 }),
  payments: fc.array(fc.record({ pick: fc.nat(), amount: fc.bigInt({ min: 0n, max: 3_000_000n }), at: fc.integer({ min: 0, max: 900 }) }), { maxLength: 12 }),
});

type Study = typeof studyArb extends fc.Arbitrary<infer T> ? T : never;

function buildSnapshot(study: Study): PaymentScheduleSnapshot {
  const sites: Site[] = [];
  const budgetVersions: BudgetVersion[] = [];
  const subjects: Subject[] = [];
  const visits: RecordedVisit[] = [];
  const keys: { siteId: string; lineKey: string }[] = [];
  study.sites.forEach((s, i) => {
    const id = `s${i}`;
    sites.push(site({ id, currency: s.currency, activatedOn: s.activated === null ? null : day(s.activated), closedOutOn: s.closeOut === null ? null : day(s.closeOut) }));
    keys.push(...[`startup:${id}`, `holdback-release:${id}`, `milestone:${id}:enrolled-1`].map((lineKey) => ({ siteId: id, lineKey })));
    s.versions.forEach((v, k) =>
      budgetVersions.push(
        budget({
          id: `${id}-b${k}`,
          siteId: id,
          versionNumber: k + 1,
          effectiveFrom: day(v.start),
          startupFeeMinor: v.startup,
          milestoneFees: [
            { kind: "first_implant", amountMinor: v.milestone },
            { kind: "nth_enrolled", n: 1 + k, amountMinor: v.milestone },
            { kind: "close_out", amountMinor: v.milestone },
          ],
          visitFees: { V1: v.fees[0] as bigint, V2: v.fees[1] as bigint, V3: v.fees[2] as bigint },
          screenFailureFeeMinor: v.sf,
          screenFailureCap: { perEnrolled: v.perEnrolled, maxCount: v.maxCount },
          overheadBps: v.overheadBps,
          holdbackBps: v.holdbackBps,
          cycle: v.cycle,
          netDays: v.netDays,
          trigger: v.trigger,
        }),
      ),
    );
    s.subjects.forEach((x, j) => {
      const sid = `${id}-p${j}`;
      const subj: Subject = { id: sid, siteId: id, code: `C${i}-${j}`, screenedOn: day(x.screened) };
      if (x.enrolAfter === null) subj.screenFailedOn = day(x.screened + 3);
      else {
        subj.enrolledOn = day(x.screened + x.enrolAfter);
        subj.implantedOn = day(x.screened + x.enrolAfter + 7);
      }
      subjects.push(subj);
      keys.push({ siteId: id, lineKey: `screen-failure:${sid}` });
      x.visits.forEach((v, k) => {
        const serviceDate = day(x.screened + v.after);
        const visit: RecordedVisit = { id: `${sid}-v${k}`, subjectId: sid, visitCode: v.code, serviceDate, status: v.done ? "done" : "missed" };
        if (v.entry !== null) visit.dataEnteredOn = addDays(serviceDate, v.entry);
        if (v.verify !== null) visit.verifiedOn = addDays(serviceDate, v.verify);
        visits.push(visit);
        keys.push({ siteId: id, lineKey: `visit:${visit.id}` });
      });
    });
  });
  const passThroughInvoices = study.sites.flatMap((s, i) => (s.invoice ? [{ id: `inv${i}`, siteId: `s${i}`, approvedOn: day(s.invoice.at), amountMinor: s.invoice.amount, description: "Ethics fee" }] : []));
  const payments = study.payments.map((p) => ({ ...(keys[p.pick % keys.length] as { siteId: string; lineKey: string }), amountMinor: p.amount, paidOn: day(p.at) }));
  return { asOf: day(study.asOf), sites, budgetVersions, subjects, visits, passThroughInvoices, payments, inPaymentRun: [] };
}

const RUNS = { numRuns: 300, seed: 7 };

describe("payment schedule properties (fast-check)", () => {
  it("totals always reconcile: earned = paid + outstanding + held back, for every line, site and currency", () => {
    fc.assert(
      fc.property(studyArb, (study) => {
        const s = computePaymentSchedule(buildSnapshot(study));
        for (const l of s.lines) {
          expect(l.grossMinor + l.overheadMinor - l.holdbackMinor).toBe(l.netMinor);
          expect(l.paidMinor + l.outstandingMinor).toBe(l.netMinor);
          expect(l.outstandingMinor >= 0n && l.paidMinor >= 0n).toBe(true);
        }
        for (const t of [...s.sites, ...s.currencies]) expect(t.earnedMinor).toBe(t.paidMinor + t.outstandingMinor + t.heldBackMinor);
        for (const t of s.sites) {
          const own = s.lines.filter((l) => l.siteId === t.siteId);
          expect(own.reduce((a, l) => a + l.netMinor, 0n)).toBe(t.netMinor);
          const cycles = s.cycles.filter((c) => c.siteId === t.siteId);
          expect(cycles.reduce((a, c) => a + c.outstandingMinor, 0n)).toBe(t.outstandingMinor);
        }
      }),
      RUNS,
    );
  });

  it("at close-out, holdback released equals holdback withheld", () => {
    fc.assert(
      fc.property(studyArb, (study) => {
        const snap = buildSnapshot(study);
        const s = computePaymentSchedule(snap);
        for (const h of s.holdback) {
          const closed = snap.sites.find((x) => x.id === h.siteId)?.closedOutOn;
          if (closed && closed <= snap.asOf) {
            expect(h.releasedMinor).toBe(h.withheldMinor);
            expect(h.balanceMinor).toBe(0n);
          } else expect(h.releasedMinor).toBe(0n);
          expect(h.byCycle.at(-1)?.balanceMinor ?? 0n).toBe(h.balanceMinor);
        }
      }),
      RUNS,
    );
  });

  it("lines come out by site (input order), then trigger date, then key", () => {
    fc.assert(
      fc.property(studyArb, (study) => {
        const snap = buildSnapshot(study);
        const lines = computePaymentSchedule(snap).lines;
        const siteOrder = new Map(snap.sites.map((s, i) => [s.id, i]));
        const expected = [...lines].sort(
          (a, b) => (siteOrder.get(a.siteId) as number) - (siteOrder.get(b.siteId) as number) || a.triggerDate.localeCompare(b.triggerDate) || (a.key < b.key ? -1 : a.key > b.key ? 1 : 0),
        );
        expect(lines.map((l) => l.key)).toEqual(expected.map((l) => l.key));
      }),
      RUNS,
    );
  });

  it("recomputing gives identical output (deep equal), also from a copy of the input", () => {
    fc.assert(
      fc.property(studyArb, (study) => {
        const snap = buildSnapshot(study);
        // Lines compared as the plain objects API responses carry (every field, read through the getters).
        const plain = (s: PaymentSchedule) => ({ ...s, lines: s.lines.map((l) => (l as ScheduleLine).toJSON()) });
        expect(plain(computePaymentSchedule(structuredClone(snap)))).toEqual(plain(computePaymentSchedule(snap)));
      }),
      { numRuns: 100, seed: 8 },
    );
  });

  it("totals only (lines: false) gives the same totals, cycles, holdback, pending and unmatched payments as the full schedule", () => {
    fc.assert(
      fc.property(studyArb, fc.boolean(), (study, inRun) => {
        const snap = buildSnapshot(study);
        const full = computePaymentSchedule(snap);
        const withRun = inRun ? { ...snap, inPaymentRun: full.lines.slice(0, 2).map((l) => l.key) } : snap;
        expect(computePaymentSchedule(withRun, { lines: false })).toEqual({ ...computePaymentSchedule(withRun), lines: [] });
      }),
      { numRuns: 200, seed: 11 },
    );
  });

  it("adding a payment never changes earned amounts", () => {
    fc.assert(
      fc.property(studyArb, fc.nat(), fc.bigInt({ min: 1n, max: 5_000_000n }), (study, pick, amount) => {
        const snap = buildSnapshot(study);
        const before = computePaymentSchedule(snap);
        if (before.lines.length === 0) return;
        const picked = before.lines[pick % before.lines.length] as { key: string; siteId: string };
        const key = picked.key;
        const after = computePaymentSchedule({ ...snap, payments: [...(snap.payments ?? []), { siteId: picked.siteId, lineKey: key, amountMinor: amount, paidOn: snap.asOf }] });
        const earned = (x: typeof before) => x.lines.map((l) => [l.key, l.grossMinor, l.overheadMinor, l.holdbackMinor, l.netMinor, l.triggerDate, l.budgetVersionId]);
        expect(earned(after)).toEqual(earned(before));
        expect(after.sites.map((t) => t.earnedMinor)).toEqual(before.sites.map((t) => t.earnedMinor));
        const paid = (x: typeof before) => x.lines.find((l) => l.key === key)!;
        expect(paid(after).paidMinor + paid(after).unappliedMinor).toBe(paid(before).paidMinor + paid(before).unappliedMinor + amount);
      }),
      RUNS,
    );
  });
});
