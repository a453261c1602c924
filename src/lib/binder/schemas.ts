import { z } from "zod";
import { roles } from "@/lib/auth/roles";
import { siteStatuses } from "@/lib/sites/site-status";
import { isCalendarDate } from "@/lib/visits/calendar-date";
import { itemStates } from "./readiness";

// Request shapes of the binder API, shared by routes and client components.

export const binderTypeCodeSchema = z.string().regex(/^[a-z][a-z0-9_]{1,48}$/, "Use 2–49 lower-case letters, digits or _ starting with a letter");
const calendarDate = z.string().refine(isCalendarDate, "Use a date written YYYY-MM-DD");

const typeFields = {
  name: z.string().trim().min(2, "Give the document type a name").max(160),
  holder: z.enum(["site", "person"]),
  appliesToRoles: z.array(z.enum(roles)).max(roles.length).default([]),
  requiredFrom: z.enum(siteStatuses).nullable(),
  expires: z.boolean(),
  validityMonths: z.number().int().min(1).max(240).nullable(),
  reference: z.string().trim().max(400).default(""),
  sortOrder: z.number().int().min(0).max(100_000).default(1000),
};

export const binderTypeInputSchema = z
  .object({ code: binderTypeCodeSchema, ...typeFields })
  .refine((t) => t.holder === "site" || t.appliesToRoles.length > 0, { path: ["appliesToRoles"], message: "Say whose document it is (one role or more)" })
  .refine((t) => t.expires || t.validityMonths === null, { path: ["validityMonths"], message: "Only a document that expires has a validity" });
export type BinderTypeInput = z.infer<typeof binderTypeInputSchema>;

export const binderTypePatchSchema = z
  .object({
    name: typeFields.name.optional(),
    holder: typeFields.holder.optional(),
    appliesToRoles: z.array(z.enum(roles)).max(roles.length).optional(),
    requiredFrom: typeFields.requiredFrom.optional(),
    expires: z.boolean().optional(),
    validityMonths: typeFields.validityMonths.optional(),
    reference: z.string().trim().max(400).optional(),
    sortOrder: z.number().int().min(0).max(100_000).optional(),
    retired: z.boolean().optional(),
  })
  .refine((p) => Object.keys(p).length > 0, "Change at least one field")
  .refine((p) => p.holder !== "person" || (p.appliesToRoles?.length ?? 1) > 0, { path: ["appliesToRoles"], message: "Say whose document it is (one role or more)" });
export type BinderTypePatch = z.infer<typeof binderTypePatchSchema>;

/** What a binder upload adds to an ordinary upload request. */
export const binderUploadSchema = z
  .object({
    documentTypeId: z.uuid("Unknown document type"),
    personId: z.uuid().nullable().default(null),
    issuedOn: calendarDate.nullable().default(null),
    expiresOn: calendarDate.nullable().default(null),
  })
  .refine((b) => !b.issuedOn || !b.expiresOn || b.expiresOn >= b.issuedOn, { path: ["expiresOn"], message: "The expiry date cannot be before the issue date" });
export type BinderUpload = z.infer<typeof binderUploadSchema>;

export const reviewDecisionSchema = z
  .object({ decision: z.enum(["accepted", "rejected"]), reason: z.string().trim().max(1000).default("") })
  .refine((r) => r.decision === "accepted" || r.reason.length >= 3, { path: ["reason"], message: "Say why the document is rejected, so the site can fix it" });

export const matrixQuerySchema = z.object({
  state: z.enum(itemStates).optional(),
  site: z.string().trim().max(20).optional(),
  format: z.enum(["json", "csv"]).default("json"),
});
