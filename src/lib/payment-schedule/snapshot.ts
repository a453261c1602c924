import { z } from "zod";
import { SUPPORTED_CURRENCIES } from "@/lib/money";

// The input of the payment-schedule engine: everything it needs, loaded by the server beforehand.
// Amounts are bigint minor units of the site's currency; rates are basis points; dates are
// "YYYY-MM-DD" in the site's time zone.

const isoDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, "Use a date as YYYY-MM-DD");
const optionalDate = isoDate.nullish();
const amount = z.bigint().nonnegative("Amounts cannot be negative");
const bps = z.number().int().min(0).max(100_000);

export const paymentTriggers = ["visit_completed", "data_entered", "monitor_verified"] as const;
export type PaymentTrigger = (typeof paymentTriggers)[number];

export const milestoneKinds = ["site_activated", "first_implant", "nth_enrolled", "close_out"] as const;
export type MilestoneKind = (typeof milestoneKinds)[number];

export const siteSchema = z.object({
  id: z.string().min(1),
  code: z.string().min(1),
  currency: z.enum(SUPPORTED_CURRENCIES as [string, ...string[]]),
  timeZone: z.string().min(1),
  activatedOn: optionalDate,
  /** Recruitment stopped (enrolment closed); the forecast adds no new subjects after it. */
  enrolmentClosedOn: optionalDate,
  closedOutOn: optionalDate,
});

export const milestoneFeeSchema = z
  .object({ kind: z.enum(milestoneKinds), n: z.number().int().positive().nullish(), amountMinor: amount })
  .refine((m) => (m.kind === "nth_enrolled") === (m.n != null), "Give n for an N-subjects-enrolled milestone, and only for it");

export const screenFailureCapSchema = z.object({
  /** One paid screen failure per this many enrolled subjects. */
  perEnrolled: z.number().int().positive().nullish(),
  /** At most this many paid screen failures at the site. */
  maxCount: z.number().int().nonnegative().nullish(),
});

export const budgetVersionSchema = z.object({
  id: z.string().min(1),
  siteId: z.string().min(1),
  versionNumber: z.number().int().positive(),
  effectiveFrom: isoDate,
  startupFeeMinor: amount,
  milestoneFees: z.array(milestoneFeeSchema),
  visitFees: z.record(z.string(), amount),
  screenFailureFeeMinor: amount,
  screenFailureCap: screenFailureCapSchema.nullish(),
  overheadBps: bps,
  holdbackBps: bps.max(10_000),
  cycle: z.enum(["monthly", "quarterly"]),
  netDays: z.number().int().min(0).max(365),
  trigger: z.enum(paymentTriggers),
});

export const passThroughInvoiceSchema = z.object({
  id: z.string().min(1),
  siteId: z.string().min(1),
  approvedOn: isoDate,
  amountMinor: amount,
  description: z.string(),
});

export const subjectSchema = z.object({
  id: z.string().min(1),
  siteId: z.string().min(1),
  /** Pseudonymous code only. */
  code: z.string().min(1),
  screenedOn: isoDate,
  screenFailedOn: optionalDate,
  enrolledOn: optionalDate,
  implantedOn: optionalDate,
});

export const recordedVisitSchema = z.object({
  id: z.string().min(1),
  subjectId: z.string().min(1),
  visitCode: z.string().min(1),
  serviceDate: isoDate,
  status: z.enum(["done", "missed"]),
  dataEnteredOn: optionalDate,
  verifiedOn: optionalDate,
});

export const paymentSchema = z.object({
  /** The site the money was paid to: the payment settles that site's line with its key. */
  siteId: z.string().min(1),
  lineKey: z.string().min(1),
  amountMinor: amount,
  paidOn: isoDate,
});

export const projectionInputSchema = z.object({
  /** Upcoming visits on the calendars of enrolled subjects (not yet recorded). */
  scheduledVisits: z.array(z.object({ subjectId: z.string().min(1), visitCode: z.string().min(1), targetDate: isoDate })),
  /** Paid visits a newly enrolled subject is expected to have, by days after enrolment. */
  newSubjectVisitPlan: z.array(z.object({ visitCode: z.string().min(1), dayOffset: z.number().int().min(0) })).default([]),
  horizonMonths: z.number().int().min(1).max(60).default(12),
});

export const paymentScheduleSnapshotSchema = z.object({
  /** "YYYY-MM-DD" (taken as every site's local date) or a UTC timestamp (turned into each site's date). */
  asOf: z.string().min(10),
  sites: z.array(siteSchema),
  budgetVersions: z.array(budgetVersionSchema),
  passThroughInvoices: z.array(passThroughInvoiceSchema).default([]),
  subjects: z.array(subjectSchema),
  visits: z.array(recordedVisitSchema),
  payments: z.array(paymentSchema).default([]),
  /** Line keys in a payment run that is approved or sent but not yet settled. */
  inPaymentRun: z.array(z.string()).default([]),
  projection: projectionInputSchema.nullish(),
});

export type Site = z.infer<typeof siteSchema>;
export type MilestoneFee = z.infer<typeof milestoneFeeSchema>;
export type ScreenFailureCap = z.infer<typeof screenFailureCapSchema>;
export type BudgetVersion = z.infer<typeof budgetVersionSchema>;
export type PassThroughInvoice = z.infer<typeof passThroughInvoiceSchema>;
export type Subject = z.infer<typeof subjectSchema>;
export type RecordedVisit = z.infer<typeof recordedVisitSchema>;
export type Payment = z.infer<typeof paymentSchema>;
export type ProjectionInput = z.input<typeof projectionInputSchema>;
/** The engine's input; optional arrays may be left out. */
export type PaymentScheduleSnapshot = z.input<typeof paymentScheduleSnapshotSchema>;
