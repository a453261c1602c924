// Request schemas of the protocol API, shared by the route handlers and the client pages.
import { z } from "zod";
import { summaryOfChangesSchema } from "./summary-of-changes";
import { visitScheduleSchema } from "./visit-schedule";

/** Upper bound of a stored document, as JSON text (a long protocol is well under 1 MB). */
export const MAX_CONTENT_CHARS = 4_000_000;

export const protocolDocInputSchema = z
  .object({ type: z.literal("doc"), content: z.array(z.unknown()).optional() })
  .loose()
  .refine((d) => JSON.stringify(d).length <= MAX_CONTENT_CHARS, "The document is too large to store");

export const createDraftSchema = z.object({ substantial: z.boolean() });

export const saveDraftSchema = z
  .object({
    /** The revision the edit was based on: a stale one gets a 409 with the current version. */
    baseRevision: z.number().int().min(1),
    title: z.string().trim().min(1).max(200).optional(),
    content: protocolDocInputSchema.optional(),
    visitSchedule: visitScheduleSchema.optional(),
    summaryOfChanges: summaryOfChangesSchema.optional(),
    substantial: z.boolean().optional(),
    substantialReason: z.string().trim().max(2000).optional(),
  })
  .refine((b) => Object.keys(b).length > 1, "Nothing to save");
export type SaveDraftInput = z.infer<typeof saveDraftSchema>;

export const transitionBodySchema = z.object({ comment: z.string().trim().max(5000).optional() });

export const compareQuerySchema = z.object({ from: z.uuid({ message: "Not a valid id" }), to: z.uuid({ message: "Not a valid id" }) });

export const pdfKinds = ["clean", "tracked", "summary", "package"] as const;
export const pdfQuerySchema = z.object({ kind: z.enum(pdfKinds).default("clean") });

export const versionParams = z.object({ versionId: z.uuid({ message: "Not a valid id" }) });
