import "server-only";
import { z } from "zod";
import { siteCodeSchema } from "@/lib/subjects/subject-code";
import { siteStatuses } from "@/lib/sites/site-status";
import { isValidTimeZone } from "./site-today";

// Input of the site forms and routes (create, edit, lifecycle step).

const contactSchema = z.object({
  name: z.string().trim().min(2, "Name the contact").max(120),
  role: z.string().trim().min(2, "Give the contact's role").max(80),
  email: z.string().trim().toLowerCase().email("Enter a valid e-mail address").max(254),
  phone: z.string().trim().max(40).optional(),
});

const siteFields = {
  name: z.string().trim().min(2, "Give the site's name").max(160),
  country: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z]{2}$/, "Country: ISO 3166-1 two-letter code, e.g. DE"),
  timeZone: z.string().trim().refine(isValidTimeZone, "Not a known IANA time zone, e.g. Europe/Berlin"),
  currency: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z]{3}$/, "Currency: ISO 4217 three-letter code, e.g. EUR"),
  targetEnrolment: z.coerce.number().int("Whole subjects only").min(0).max(10_000),
  contacts: z.array(contactSchema).max(20).default([]),
};

export const createSiteSchema = z.object({ code: siteCodeSchema, ...siteFields });
export type CreateSiteInput = z.infer<typeof createSiteSchema>;

export const updateSiteSchema = z.object(siteFields).partial().refine((v) => Object.keys(v).length > 0, "Change at least one field");
export type UpdateSiteInput = z.infer<typeof updateSiteSchema>;

export const siteStatusChangeSchema = z.object({
  to: z.enum(siteStatuses),
  /** Date of the step at the site; today at the site when left out. */
  effectiveOn: z.iso.date("Use a date as YYYY-MM-DD").optional(),
});
