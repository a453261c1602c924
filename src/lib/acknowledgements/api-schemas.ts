import { z } from "zod";
import { acknowledgementStates } from "./state";

// Schemas shared by the acknowledgement and adoption routes and their client forms.

const id = z.uuid({ message: "Not a valid id" });

export const matrixQuery = z.object({
  siteId: id.optional(),
  versionId: id.optional(),
  state: z.enum(acknowledgementStates).optional(),
});
export type MatrixQuery = z.infer<typeof matrixQuery>;

export const signBody = z.object({
  versionId: id,
  siteId: id,
  password: z.string().min(1, "Enter your password to sign").max(200),
});
export type SignBody = z.infer<typeof signBody>;

export const signaturePageQuery = z.object({ versionId: id, siteId: id });

export const recordApprovalBody = z.object({
  siteId: id,
  versionId: id,
  approvedOn: z.iso.date({ message: "Give the date as YYYY-MM-DD" }),
  letterDocumentId: id,
});
export type RecordApprovalBody = z.infer<typeof recordApprovalBody>;

export const adoptionQuery = z.object({ siteId: id.optional() });

/** Study setting: days an investigator has to acknowledge a released version (site calendar days). */
export const ackSettingsBody = z.object({
  ackDeadlineDays: z.coerce.number().int("Whole days only").min(1, "At least 1 day").max(365, "At most 365 days"),
});
