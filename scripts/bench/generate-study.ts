// Deterministic invented study for benchmarks: sites, budgets with one amendment, subjects, visits,
// payments and upcoming calendar visits. Same options → same snapshot (seeded PRNG, no clock).
import { addDays } from "../../src/lib/payment-schedule/calendar";
import { priceFee } from "../../src/lib/payment-schedule/pricing";
import type { BudgetVersion, PassThroughInvoice, Payment, PaymentScheduleSnapshot, RecordedVisit, Site, Subject } from "../../src/lib/payment-schedule/snapshot";
import { parsePaymentRow, parseVisitRow, paymentRowText, visitRowText } from "../../src/lib/ledger/snapshot-rows";
import { seededRandom } from "../lib/seeded-random";

export interface GenerateStudyOptions {
  sites?: number;
  subjects?: number;
  visits?: number;
  seed?: number;
  asOf?: string;
}

const prng = seededRandom;

const CURRENCIES: [string, string, bigint][] = [
  ["EUR", "Europe/Berlin", 1n],
  ["USD", "America/Chicago", 1n],
  ["GBP", "Europe/London", 1n],
  ["JPY", "Asia/Tokyo", 1n],
  ["CHF", "Europe/Zurich", 1n],
  ["SEK", "Europe/Stockholm", 10n],
  ["KWD", "Asia/Kuwait", 1n],
];
// Visit codes and their day offsets from enrolment (an invented follow-up schedule).
const VISITS: [string, number][] = [
  ["SCR", 0], ["IMP", 14], ["D01", 15], ["W01", 21], ["W02", 28], ["M01", 44], ["M02", 74], ["M03", 104],
  ["M06", 194], ["M09", 284], ["M12", 379], ["M15", 469], ["M18", 559], ["M24", 739], ["M30", 919],
  ["M36", 1099], ["M42", 1279], ["M48", 1459], ["M54", 1639], ["M60", 1819], ["M66", 1999], ["M72", 2179],
];

export function generateStudy(options: GenerateStudyOptions = {}): PaymentScheduleSnapshot {
  const { sites: siteCount = 200, subjects: subjectCount = 10_000, visits: visitTarget = 150_000, seed = 42, asOf = "2026-12-01" } = options;
  const rnd = prng(seed);
  const int = (lo: number, hi: number) => lo + Math.floor(rnd() * (hi - lo + 1));
  const sites: Site[] = [];
  const budgetVersions: BudgetVersion[] = [];
  const passThroughInvoices: PassThroughInvoice[] = [];
  const subjects: Subject[] = [];
  const visits: RecordedVisit[] = [];
  const payments: Payment[] = [];
  const scheduledVisits: { subjectId: string; visitCode: string; targetDate: string }[] = [];

  const versionsBySite = new Map<string, BudgetVersion[]>();
  for (let i = 0; i < siteCount; i++) {
    const [currency, timeZone, scale] = CURRENCIES[i % CURRENCIES.length] as [string, string, bigint];
    const unit = currency === "JPY" ? 150n : currency === "KWD" ? 300n : 100n * scale; // minor units per "euro"
    const id = uuidOf(1, i + 1);
    const activatedOn = addDays("2019-06-01", int(0, 540));
    const closedOutOn = i % 20 === 19 ? addDays(asOf, -int(10, 120)) : null;
    sites.push({ id, code: `S${String(i + 1).padStart(3, "0")}`, currency, timeZone, activatedOn, enrolmentClosedOn: closedOutOn, closedOutOn });
    const fees: Record<string, bigint> = {};
    for (const [code] of VISITS) fees[code] = BigInt(int(150, 900)) * unit;
    const common = {
      siteId: id,
      startupFeeMinor: 5000n * unit,
      milestoneFees: [
        { kind: "site_activated" as const, amountMinor: 1000n * unit },
        { kind: "first_implant" as const, amountMinor: 2000n * unit },
        { kind: "nth_enrolled" as const, n: 10, amountMinor: 1500n * unit },
        { kind: "nth_enrolled" as const, n: 50, amountMinor: 3000n * unit },
        { kind: "close_out" as const, amountMinor: 2500n * unit },
      ],
      screenFailureFeeMinor: 250n * unit,
      screenFailureCap: { perEnrolled: 4 },
      overheadBps: int(15, 30) * 100,
      holdbackBps: int(5, 10) * 100,
      cycle: i % 2 === 0 ? ("monthly" as const) : ("quarterly" as const),
      netDays: i % 3 === 0 ? 45 : 30,
      trigger: (["visit_completed", "data_entered", "monitor_verified"] as const)[i % 3] as BudgetVersion["trigger"],
    };
    const v1: BudgetVersion = { ...common, id: `${id}-b1`, versionNumber: 1, effectiveFrom: addDays(activatedOn, -30), visitFees: fees };
    const v2: BudgetVersion = { ...common, id: `${id}-b2`, versionNumber: 2, effectiveFrom: addDays(activatedOn, int(300, 700)), visitFees: { ...fees, M12: (fees.M12 as bigint) + 100n * unit } };
    budgetVersions.push(v1, v2);
    versionsBySite.set(id, [v1, v2]);
    passThroughInvoices.push({ id: `${id}-irb`, siteId: id, approvedOn: addDays(activatedOn, -10), amountMinor: 1200n * unit, description: "Ethics committee fee" });
  }

  // Enrolled subjects carry the visits; the rest are screen failures.
  const enrolledShare = 0.8;
  const enrolledCount = Math.round(subjectCount * enrolledShare);
  // Each enrolled subject has its calendar visits up to asOf, until the study holds visitTarget visits.
  let visitId = 0;
  for (let j = 0; j < subjectCount; j++) {
    const site = sites[j % siteCount] as Site & { activatedOn: string };
    const id = uuidOf(2, j + 1);
    const screenedOn = addDays(site.activatedOn, int(5, 600));
    const enrolled = j < enrolledCount;
    const subject: Subject = { id, siteId: site.id, code: `K-${String(j + 1).padStart(5, "0")}`, screenedOn };
    if (!enrolled) subject.screenFailedOn = addDays(screenedOn, int(1, 20));
    else {
      subject.enrolledOn = addDays(screenedOn, int(1, 20));
      subject.implantedOn = addDays(subject.enrolledOn, 14);
    }
    subjects.push(subject);
    if (!enrolled) continue;
    const versions = versionsBySite.get(site.id) as BudgetVersion[];
    for (let k = 0; k < VISITS.length; k++) {
      const [code, offset] = VISITS[k] as [string, number];
      const target = addDays(subject.enrolledOn as string, offset);
      if (visitId >= visitTarget || target > asOf) {
        if (target > asOf) scheduledVisits.push({ subjectId: id, visitCode: code, targetDate: target });
        continue;
      }
      const serviceDate = addDays(target, int(-3, 3));
      const done = rnd() < 0.95;
      const visit: RecordedVisit = { id: uuidOf(3, ++visitId), subjectId: id, visitCode: code, serviceDate, status: done ? "done" : "missed" };
      if (done) {
        visit.dataEnteredOn = addDays(serviceDate, int(0, 14));
        if (rnd() < 0.85) visit.verifiedOn = addDays(visit.dataEnteredOn, int(5, 60));
      }
      visits.push(visit);
      // Pay most old visits at their net, as the sponsor would have.
      if (done && visit.verifiedOn && visit.verifiedOn < addDays(asOf, -120) && rnd() < 0.9) {
        const v = versions[1]!.effectiveFrom <= serviceDate ? versions[1]! : versions[0]!;
        const fee = v.visitFees[code] as bigint;
        payments.push({ siteId: subject.siteId, lineKey: `visit:${visit.id}`, amountMinor: priceFee(fee, v.overheadBps, v.holdbackBps).netMinor, paidOn: addDays(visit.verifiedOn, 60) });
      }
    }
  }
  return {
    asOf,
    sites,
    budgetVersions,
    passThroughInvoices,
    ...asLoaded(subjects, visits, payments),
    inPaymentRun: [],
    projection: { scheduledVisits, newSubjectVisitPlan: VISITS.slice(0, 8).map(([visitCode, dayOffset]) => ({ visitCode, dayOffset })), horizonMonths: 12 },
  };
}

/** Ids shaped like the database's (UUID text, 36 characters): kind and number in hexadecimal. */
function uuidOf(kind: number, n: number): string {
  const hex = n.toString(16).padStart(12, "0");
  return `${kind.toString(16).padStart(8, "0")}-0000-4000-8000-${hex}`;
}

/** A fresh string, as the database driver decodes one from the wire (not sharing another's memory). */
const fromWire = (s: string) => Buffer.from(s, "utf8").toString("utf8");

/**
 * Subjects, visits and payments as the server's loader hands them to the engine: in its order (by
 * site, visits by subject within a site; rows of one group in table order, i.e. by date), each row
 * decoded afresh and parsed by the loader's own row parsers. The engine's speed depends on that
 * layout in memory, so the benchmark builds it the way the server does.
 */
function asLoaded(subjects: readonly Subject[], visits: readonly RecordedVisit[], payments: readonly Payment[]): Pick<PaymentScheduleSnapshot, "subjects" | "visits" | "payments"> {
  const siteOfSubject = new Map(subjects.map((s) => [s.id, s.siteId]));
  // ORDER BY the given keys; ties in table order (by date, as rows were added over the years).
  const ordered = <T>(items: readonly T[], keys: (x: T) => string[], date: (x: T) => string) =>
    items
      .map((x, i) => ({ x, k: [...keys(x), date(x)], i }))
      .sort((a, b) => {
        for (let j = 0; j < a.k.length; j++) if (a.k[j] !== b.k[j]) return (a.k[j] as string) < (b.k[j] as string) ? -1 : 1;
        return a.i - b.i;
      })
      .map((e) => e.x);
  const loadedSubjects = ordered(subjects, (s) => [s.siteId, s.id], (s) => s.screenedOn).map(
    (s): Subject => ({
      id: fromWire(s.id),
      siteId: fromWire(s.siteId),
      code: fromWire(s.code),
      screenedOn: fromWire(s.screenedOn),
      screenFailedOn: s.screenFailedOn ? fromWire(s.screenFailedOn) : null,
      enrolledOn: s.enrolledOn ? fromWire(s.enrolledOn) : null,
      implantedOn: s.implantedOn ? fromWire(s.implantedOn) : null,
    }),
  );
  const loadedVisits = ordered(visits, (v) => [siteOfSubject.get(v.subjectId) as string, v.subjectId], (v) => v.serviceDate).map((v): RecordedVisit => {
    const row = parseVisitRow(fromWire(visitRowText({ id: v.id, subjectId: v.subjectId, versionId: "", outcome: v.status, actualDate: v.serviceDate, dataEnteredOn: v.dataEnteredOn ?? null, verifiedOn: v.verifiedOn ?? null, visitCode: v.visitCode })));
    // As buildSnapshot maps a visit row (src/lib/ledger/build-snapshot.ts).
    return { id: row.id, subjectId: row.subjectId, visitCode: row.visitCode, serviceDate: row.actualDate as string, status: row.outcome, dataEnteredOn: row.dataEnteredOn, verifiedOn: row.verifiedOn };
  });
  const loadedPayments = ordered(payments, (p) => [p.siteId], (p) => p.paidOn).map((p) => parsePaymentRow(fromWire(paymentRowText(p))));
  return { subjects: loadedSubjects, visits: loadedVisits, payments: loadedPayments };
}

/**
 * The same snapshot loaded again: fresh objects and strings for every subject, visit and payment, as
 * each request's loader makes them (nothing cached on them by an earlier computation, such as the
 * hash codes of their ids).
 */
export function reloaded(snapshot: PaymentScheduleSnapshot): PaymentScheduleSnapshot {
  return { ...snapshot, ...asLoaded(snapshot.subjects, snapshot.visits, snapshot.payments ?? []) };
}
