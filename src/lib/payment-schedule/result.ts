import type { PoissonGammaFit } from "@/lib/forecast";
import type { CyclePeriod } from "./calendar";
import type { MilestoneKind, PaymentTrigger } from "./snapshot";

export type LineKind = "startup" | "milestone" | "visit" | "screen_failure" | "pass_through" | "holdback_release";

/**
 * paid: nothing left to pay; outstanding: some net unpaid, not yet past its due date; overdue:
 * unpaid after its due date; not_payable: a zero-value line (a screen failure over the cap).
 * A partial payment leaves the line outstanding or overdue with `partiallyPaid` set.
 */
export type LineState = "paid" | "outstanding" | "overdue" | "not_payable";

/** Where a line comes from: enough to find the event it was earned on. */
export interface LineSource {
  event: "site_activation" | "milestone" | "visit" | "screen_failure" | "invoice" | "close_out";
  /** Id of the source record: visit, subject, invoice or site. */
  id: string;
  subjectId?: string;
  subjectCode?: string;
  visitCode?: string;
  milestone?: MilestoneKind;
  /** For the N-subjects-enrolled milestone. */
  n?: number;
  description?: string;
}

/**
 * One earned line. The engine returns `ScheduleLine` objects (fields read through getters, `toJSON()`
 * for the plain object); anything else may build plain `EarnedLine` objects (statements, tests).
 */
export interface EarnedLine {
  /** Stable key derived from the source event; payments and payment runs refer to it. */
  readonly key: string;
  readonly siteId: string;
  readonly currency: string;
  readonly kind: LineKind;
  readonly source: LineSource;
  readonly serviceDate: string;
  readonly triggerDate: string;
  /** The trigger that made the line earned; "event_date" for milestones, fees and invoices. */
  readonly trigger: PaymentTrigger | "event_date";
  readonly budgetVersionId: string;
  readonly budgetVersionNumber: number;
  readonly grossMinor: bigint;
  readonly overheadMinor: bigint;
  readonly holdbackMinor: bigint;
  readonly netMinor: bigint;
  /** A screen failure beyond the cap: zero-value until later enrolment lifts the cap. */
  readonly overCap: boolean;
  /** The fee the line would carry without the cap (screen failures only, else null). */
  readonly cappedFeeMinor: bigint | null;
  /** Set when an enrolment lifted the cap: that enrolment's date and subject. */
  readonly capLiftedOn: string | null;
  readonly capLiftedBySubjectId: string | null;
  readonly cycle: CyclePeriod;
  readonly dueDate: string;
  readonly paidMinor: bigint;
  readonly outstandingMinor: bigint;
  /** Paid beyond the line's net: kept apart so the reconciliation stays exact. */
  readonly unappliedMinor: bigint;
  readonly lastPaidOn: string | null;
  readonly partiallyPaid: boolean;
  readonly inPaymentRun: boolean;
  readonly state: LineState;
}

export interface Amounts {
  grossMinor: bigint;
  overheadMinor: bigint;
  holdbackMinor: bigint;
  netMinor: bigint;
}

export interface CycleSummary extends Amounts {
  siteId: string;
  currency: string;
  cycle: CyclePeriod;
  dueDate: string;
  lineCount: number;
  paidMinor: bigint;
  outstandingMinor: bigint;
  overdueMinor: bigint;
}

/** Totals that reconcile: earned (gross + overhead) = paid + outstanding + held back. */
export interface Totals extends Amounts {
  currency: string;
  /** gross + overhead. */
  earnedMinor: bigint;
  holdbackWithheldMinor: bigint;
  holdbackReleasedMinor: bigint;
  /** Withheld and not yet released. */
  heldBackMinor: bigint;
  paidMinor: bigint;
  outstandingMinor: bigint;
  overdueMinor: bigint;
  unappliedMinor: bigint;
  lineCount: number;
}

export interface SiteTotals extends Totals {
  siteId: string;
  asOf: string;
}

export interface CurrencyTotals extends Totals {
  siteCount: number;
}

export interface HoldbackLedger {
  siteId: string;
  currency: string;
  withheldMinor: bigint;
  releasedMinor: bigint;
  balanceMinor: bigint;
  releaseLineKey: string | null;
  /** Withheld per cycle, with the running balance after each. */
  byCycle: { label: string; withheldMinor: bigint; releasedMinor: bigint; balanceMinor: bigint }[];
}

/** A recorded event that is not (yet) an earned line, with the reason. */
export interface PendingEvent {
  key: string;
  siteId: string;
  serviceDate: string;
  reason: "awaiting_data_entry" | "awaiting_verification" | "after_as_of" | "no_budget_in_effect" | "no_fee_for_visit_code" | "unknown_site" | "unknown_subject";
  detail: string;
}

export interface UnmatchedPayment {
  siteId: string;
  lineKey: string;
  amountMinor: bigint;
  paidOn: string;
  reason: "no_such_line" | "after_as_of";
}

export interface ProjectionMonthFigures {
  month: string;
  start: string;
  end: string;
  scheduledVisitCount: number;
  /** Calendar visits of enrolled subjects priced with the budget in force on their target date. */
  scheduled: Amounts;
  /** Expected from forecast enrolment (milestones and the visits of new subjects). */
  expectedEnrolments: number;
  forecastGrossMinor: bigint;
  forecastNetMinor: bigint;
  /** Standard deviation of the forecast net, in minor units (not rounded: a model figure). */
  forecastNetSd: number;
  /** scheduled net + forecast net, with the 80% band of the forecast part. */
  expectedNetMinor: bigint;
  lowNetMinor: bigint;
  highNetMinor: bigint;
}

export interface SiteProjection {
  siteId: string;
  currency: string;
  recruiting: boolean;
  /** Posterior mean enrolment rate, subjects per month. */
  enrolmentRatePerMonth: number;
  months: ProjectionMonthFigures[];
}

export interface CurrencyProjection {
  currency: string;
  months: ProjectionMonthFigures[];
}

export interface Projection {
  asOf: string;
  horizonMonths: number;
  fit: PoissonGammaFit | null;
  sites: SiteProjection[];
  currencies: CurrencyProjection[];
}

export interface PaymentSchedule {
  asOf: string;
  lines: EarnedLine[];
  cycles: CycleSummary[];
  sites: SiteTotals[];
  currencies: CurrencyTotals[];
  holdback: HoldbackLedger[];
  pending: PendingEvent[];
  unmatchedPayments: UnmatchedPayment[];
  projection: Projection | null;
}
