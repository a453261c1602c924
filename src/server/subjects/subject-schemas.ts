import "server-only";
import { z } from "zod";
import { subjectStatuses } from "@/lib/subjects/subject-states";

// Input of the subject forms and routes. Objects are strict: there is no field for a name or a
// birth date, and a request that sends one is refused rather than silently trimmed.

const isoDate = z.iso.date("Use a date as YYYY-MM-DD");
const serial = z
  .string()
  .trim()
  .regex(/^[A-Za-z0-9][A-Za-z0-9._/-]{0,39}$/, "Device serial: up to 40 letters, digits, '.', '_', '/' or '-'");

export const createSubjectSchema = z.strictObject({
  /** Left out: the next free number at the site (e.g. DE01-008). */
  subjectCode: z.string().trim().max(20).optional(),
  consentDate: isoDate,
  screeningDate: isoDate.optional(),
});
export type CreateSubjectInput = z.infer<typeof createSubjectSchema>;

export const updateSubjectSchema = z
  .strictObject({
    consentDate: isoDate,
    screeningDate: isoDate.nullable(),
    enrolmentDate: isoDate.nullable(),
    implantDate: isoDate.nullable(),
    deviceSerial: serial.nullable(),
  })
  .partial()
  .refine((v) => Object.keys(v).length > 0, "Change at least one field");
export type UpdateSubjectInput = z.infer<typeof updateSubjectSchema>;

export const subjectStatusChangeSchema = z.strictObject({
  to: z.enum(subjectStatuses),
  /** The date of the step at the site (enrolment date, implant date, end date); today when left out. */
  effectiveOn: isoDate.optional(),
  reason: z.string().trim().max(500).optional(),
  /** Required when moving to Implanted. */
  deviceSerial: serial.optional(),
});
export type SubjectStatusChangeInput = z.infer<typeof subjectStatusChangeSchema>;

export const subjectListQuery = z.object({
  siteId: z.uuid().optional(),
  status: z.enum(subjectStatuses).optional(),
});

export const importSubjectsSchema = z.strictObject({ csv: z.string().min(1, "The file is empty").max(5_000_000, "At most 5 MB per file") });
