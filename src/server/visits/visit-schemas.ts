import "server-only";
import { z } from "zod";
import { idSchema } from "@/lib/api/schemas";

const isoDate = z.iso.date("Use a date as YYYY-MM-DD");
const visitCode = z
  .string()
  .trim()
  .regex(/^[A-Z0-9][A-Z0-9_-]{0,15}$/, "Visit code: 1–16 capitals, digits, '-' or '_'");

export const recordVisitSchema = z.strictObject({
  visitCode,
  outcome: z.enum(["done", "missed"]),
  /** The day the visit took place (required when done). */
  actualDate: isoDate.nullable().optional(),
  /** The day its data were entered in the study database. */
  dataEnteredOn: isoDate.nullable().optional(),
});
export type RecordVisitInput = z.infer<typeof recordVisitSchema>;

export const verifyVisitSchema = z.strictObject({ verifiedOn: isoDate });
export const visitParams = z.object({ subjectId: idSchema, visitCode });

export const siteVisitsQuery = z.object({
  weeks: z.coerce.number().int().min(1).max(26).default(4),
});

export const deviationCategories = ["visit out of window", "consent", "eligibility", "procedure not done", "device handling", "other"] as const;

export const createDeviationSchema = z.strictObject({
  category: z.enum(deviationCategories).refine((c) => c !== "visit out of window", "Out-of-window visits are recorded automatically"),
  occurredOn: isoDate,
  visitCode: visitCode.optional(),
  description: z.string().trim().min(10, "Describe what happened (at least 10 characters)").max(2000),
});
export type CreateDeviationInput = z.infer<typeof createDeviationSchema>;

export const resolveDeviationSchema = z.strictObject({ resolution: z.string().trim().min(5, "Say how it was resolved").max(2000) });

export const deviationListQuery = z.object({
  siteId: idSchema.optional(),
  status: z.enum(["open", "resolved"]).optional(),
  source: z.enum(["automatic", "manual"]).optional(),
  category: z.enum(deviationCategories).optional(),
  subject: z.string().trim().max(20).optional(),
  from: isoDate.optional(),
  to: isoDate.optional(),
  format: z.enum(["json", "csv"]).default("json"),
});
export type DeviationListQuery = z.infer<typeof deviationListQuery>;

export const createFeedTokenSchema = z.strictObject({ label: z.string().trim().max(80).default("") });
