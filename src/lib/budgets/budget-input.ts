import { z } from "zod";
import { moneyAmountSchema } from "@/lib/money";
import { milestoneKinds, paymentTriggers } from "@/lib/payment-schedule";

// What a budget version form (and the API) sends: amounts in major units as typed ("1,234.56"),
// parsed into minor units of the site's currency; rates as percentages with up to two decimals,
// stored as basis points.

const isoDate = z.iso.date({ message: "Use a date as YYYY-MM-DD" });

export const milestoneLabels: Record<(typeof milestoneKinds)[number], string> = {
  site_activated: "Site activated",
  first_implant: "First subject implanted",
  nth_enrolled: "N subjects enrolled",
  close_out: "Site closed out",
};

export const triggerLabels: Record<(typeof paymentTriggers)[number], string> = {
  visit_completed: "Visit completed",
  data_entered: "Visit data entered",
  monitor_verified: "Visit verified by the monitor",
};

export const cycleLabels = { monthly: "Monthly", quarterly: "Quarterly" } as const;

/** "25", "25.5" or "7.25" (%) → basis points; exact, no floats. */
export function percentToBps(text: string): number | null {
  const m = /^\s*(\d{1,4})(?:\.(\d{1,2}))?\s*%?\s*$/.exec(text);
  if (!m) return null;
  return Number(m[1]) * 100 + Number((m[2] ?? "").padEnd(2, "0"));
}

/** 2550 → "25.5" */
export function bpsToPercent(bps: number): string {
  const whole = Math.trunc(bps / 100);
  const frac = String(bps % 100).padStart(2, "0").replace(/0+$/, "");
  return frac ? `${whole}.${frac}` : String(whole);
}

const percent = (max: number, label: string) =>
  z.string().transform((text, ctx) => {
    const bps = percentToBps(text);
    if (bps === null) {
      ctx.addIssue({ code: "custom", message: `Enter ${label} as a percentage, e.g. 25 or 7.5` });
      return z.NEVER;
    }
    if (bps > max) {
      ctx.addIssue({ code: "custom", message: `${label[0]!.toUpperCase()}${label.slice(1)} cannot exceed ${bpsToPercent(max)}%` });
      return z.NEVER;
    }
    return bps;
  });

/** The fields of one budget version, for a site whose currency is known. */
export function budgetVersionInputSchema(currency: string) {
  const money = moneyAmountSchema(currency, { min: 0n });
  return z
    .object({
      /** Omitted when the version follows a protocol version: then the site's approval date of it. */
      effectiveFrom: isoDate.nullish(),
      protocolVersionId: z.uuid({ message: "Not a valid id" }).nullish(),
      reason: z.string().trim().max(500, "At most 500 characters").default(""),
      startupFee: money,
      milestones: z
        .array(
          z
            .object({ kind: z.enum(milestoneKinds), n: z.coerce.number().int().positive("N must be at least 1").nullish(), amount: money })
            .refine((m) => (m.kind === "nth_enrolled") === (m.n != null), { message: "Give N for an N-subjects-enrolled milestone, and only for it", path: ["n"] }),
        )
        .max(30),
      visitFees: z
        .array(z.object({ visitCode: z.string().trim().min(1, "Give the visit code").max(20).regex(/^[A-Z0-9][A-Z0-9_-]{0,15}$/, "Visit code: capitals, digits, - or _, as in the schedule of visits"), amount: money }))
        .max(200),
      screenFailureFee: money,
      screenFailureCapPerEnrolled: z.coerce.number().int().positive("At least 1").max(1000).nullish(),
      screenFailureCapMax: z.coerce.number().int().min(0).max(100_000).nullish(),
      overheadPercent: percent(100_000, "overhead"),
      holdbackPercent: percent(10_000, "holdback"),
      cycle: z.enum(["monthly", "quarterly"]),
      netDays: z.coerce.number().int().min(0, "Net days cannot be negative").max(365, "At most 365 days"),
      trigger: z.enum(paymentTriggers),
    })
    .superRefine((v, ctx) => {
      if (!v.effectiveFrom && !v.protocolVersionId) ctx.addIssue({ code: "custom", path: ["effectiveFrom"], message: "Give the date from which this version applies, or the protocol version it follows" });
      const seen = new Set<string>();
      v.visitFees.forEach((f, i) => {
        if (seen.has(f.visitCode)) ctx.addIssue({ code: "custom", path: ["visitFees", i, "visitCode"], message: `Visit ${f.visitCode} has a fee already` });
        seen.add(f.visitCode);
      });
      const ms = new Set<string>();
      v.milestones.forEach((m, i) => {
        const k = `${m.kind}:${m.n ?? ""}`;
        if (ms.has(k)) ctx.addIssue({ code: "custom", path: ["milestones", i, "kind"], message: "This milestone is listed twice" });
        ms.add(k);
      });
    });
}
export type BudgetVersionInput = z.infer<ReturnType<typeof budgetVersionInputSchema>>;
/** The raw form values (strings for amounts and percentages). */
export type BudgetVersionForm = z.input<ReturnType<typeof budgetVersionInputSchema>>;
