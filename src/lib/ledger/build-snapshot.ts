import type { BudgetVersion, MilestoneFee, PaymentScheduleSnapshot } from "@/lib/payment-schedule";

// Stored rows → the payment-schedule engine's snapshot. Pure, so the server loader, the demo seed
// and the benchmark build the same input from the same rows.

export interface BudgetVersionRowLike {
  id: string;
  siteId: string;
  versionNumber: number;
  effectiveFrom: string;
  screenFailureCapPerEnrolled: number | null;
  screenFailureCapMax: number | null;
  overheadBps: number;
  holdbackBps: number;
  cycle: "monthly" | "quarterly";
  netDays: number;
  trigger: BudgetVersion["trigger"];
}
export interface BudgetItemRowLike {
  kind: "startup" | "milestone" | "visit" | "screen_failure";
  milestone: MilestoneFee["kind"] | null;
  n: number | null;
  visitCode: string | null;
  amountMinor: bigint;
}

/** A stored version and its items as the engine's BudgetVersion. */
export function toEngineVersion(v: BudgetVersionRowLike, items: readonly BudgetItemRowLike[]): BudgetVersion {
  let startupFeeMinor = 0n;
  let screenFailureFeeMinor = 0n;
  const milestoneFees: MilestoneFee[] = [];
  const visitFees: Record<string, bigint> = {};
  for (const i of items) {
    if (i.kind === "startup") startupFeeMinor = i.amountMinor;
    else if (i.kind === "screen_failure") screenFailureFeeMinor = i.amountMinor;
    else if (i.kind === "visit" && i.visitCode) visitFees[i.visitCode] = i.amountMinor;
    else if (i.kind === "milestone" && i.milestone) milestoneFees.push({ kind: i.milestone, n: i.n, amountMinor: i.amountMinor });
  }
  const hasCap = v.screenFailureCapPerEnrolled != null || v.screenFailureCapMax != null;
  return {
    id: v.id,
    siteId: v.siteId,
    versionNumber: v.versionNumber,
    effectiveFrom: v.effectiveFrom,
    startupFeeMinor,
    milestoneFees,
    visitFees,
    screenFailureFeeMinor,
    screenFailureCap: hasCap ? { perEnrolled: v.screenFailureCapPerEnrolled, maxCount: v.screenFailureCapMax } : null,
    overheadBps: v.overheadBps,
    holdbackBps: v.holdbackBps,
    cycle: v.cycle,
    netDays: v.netDays,
    trigger: v.trigger,
  };
}

export interface SnapshotRows {
  asOf: string;
  sites: { id: string; code: string; currency: string; timeZone: string }[];
  /** First date of each lifecycle step per site. */
  siteSteps: { siteId: string; status: string; on: string }[];
  versions: (BudgetVersionRowLike & { items: readonly BudgetItemRowLike[] })[];
  invoices: { id: string; siteId: string; approvedOn: string; amountMinor: bigint; description: string }[];
  subjects: { id: string; siteId: string; code: string; status: string; consentDate: string; screeningDate: string | null; enrolmentDate: string | null; implantDate: string | null; endedOn: string | null }[];
  visits: { id: string; subjectId: string; visitCode: string; outcome: "done" | "missed"; actualDate: string | null; dataEnteredOn: string | null; verifiedOn: string | null }[];
  payments: { siteId: string; lineKey: string; amountMinor: bigint; paidOn: string }[];
}

export function buildSnapshot(rows: SnapshotRows): PaymentScheduleSnapshot {
  const stepOf = new Map<string, string>();
  for (const s of rows.siteSteps) {
    const k = `${s.siteId}:${s.status}`;
    const prev = stepOf.get(k);
    if (!prev || s.on < prev) stepOf.set(k, s.on);
  }
  const visits: PaymentScheduleSnapshot["visits"] = [];
  for (const v of rows.visits) {
    // A missed visit or one without a date earns nothing.
    if (!v.actualDate) continue;
    visits.push({ id: v.id, subjectId: v.subjectId, visitCode: v.visitCode, serviceDate: v.actualDate, status: v.outcome, dataEnteredOn: v.dataEnteredOn, verifiedOn: v.verifiedOn });
  }
  return {
    asOf: rows.asOf,
    sites: rows.sites.map((s) => ({
      id: s.id,
      code: s.code,
      currency: s.currency,
      timeZone: s.timeZone,
      activatedOn: stepOf.get(`${s.id}:open`) ?? null,
      enrolmentClosedOn: stepOf.get(`${s.id}:enrolment_closed`) ?? null,
      closedOutOn: stepOf.get(`${s.id}:closed_out`) ?? null,
    })),
    budgetVersions: rows.versions.map((v) => toEngineVersion(v, v.items)),
    passThroughInvoices: rows.invoices.map((i) => ({ id: i.id, siteId: i.siteId, approvedOn: i.approvedOn, amountMinor: i.amountMinor, description: i.description })),
    subjects: rows.subjects.map((s) => ({
      id: s.id,
      siteId: s.siteId,
      code: s.code,
      screenedOn: s.screeningDate ?? s.consentDate,
      screenFailedOn: s.status === "screen_failed" ? (s.endedOn ?? s.screeningDate ?? s.consentDate) : null,
      enrolledOn: s.enrolmentDate,
      implantedOn: s.implantDate,
    })),
    visits,
    payments: rows.payments,
  };
}
