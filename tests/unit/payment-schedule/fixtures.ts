import type { BudgetVersion, PaymentScheduleSnapshot, Site } from "@/lib/payment-schedule";

// Small builders for hand-written snapshots; every figure a test checks is set explicitly there.

export function site(over: Partial<Site> & { id: string }): Site {
  return { code: over.id.toUpperCase(), currency: "EUR", timeZone: "Europe/Paris", activatedOn: null, enrolmentClosedOn: null, closedOutOn: null, ...over };
}

export function budget(over: Partial<BudgetVersion> & { id: string; siteId: string }): BudgetVersion {
  return {
    versionNumber: 1,
    effectiveFrom: "2026-01-01",
    startupFeeMinor: 0n,
    milestoneFees: [],
    visitFees: {},
    screenFailureFeeMinor: 0n,
    screenFailureCap: null,
    overheadBps: 0,
    holdbackBps: 0,
    cycle: "monthly",
    netDays: 30,
    trigger: "visit_completed",
    ...over,
  };
}

export function snapshot(over: Partial<PaymentScheduleSnapshot>): PaymentScheduleSnapshot {
  return { asOf: "2026-12-01", sites: [], budgetVersions: [], subjects: [], visits: [], payments: [], inPaymentRun: [], passThroughInvoices: [], ...over };
}
