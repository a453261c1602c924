import { z } from "zod";

// Request bodies of the payments API, shared by route handlers and client forms.

const id = z.uuid({ message: "Not a valid id" });
const isoDate = z.iso.date({ message: "Use a date as YYYY-MM-DD" });

export const runParams = z.object({ runId: id });
export const transferParams = z.object({ transferId: id });
export const queryParams = z.object({ queryId: id });

export const payeeAccountBody = z.object({ siteId: id });

export const dueLinesQuery = z.object({
  cycle: z.string().trim().max(20).optional(),
  currency: z.string().trim().length(3).toUpperCase().optional(),
  siteId: id.optional(),
  asOf: isoDate.optional(),
});

export const createRunBody = z.object({
  cycle: z.string().trim().max(20).nullish(),
  currency: z.string().trim().length(3).toUpperCase().nullish(),
  siteIds: z.array(id).max(500).nullish(),
  lineKeys: z.array(z.string().min(1).max(200)).max(20_000).nullish(),
  note: z.string().trim().max(2000).optional(),
  asOf: isoDate.optional(),
});

export const approveRunBody = z.object({ contentHash: z.string().regex(/^[0-9a-f]{64}$/, "The run's content hash (64 hex digits) as shown when you reviewed it") });

export const confirmReceiptBody = z.object({
  transferId: id,
  receivedOn: isoDate,
  amount: z.string().trim().min(1, "Enter the amount received").max(40),
  bankReference: z.string().trim().min(1, "Enter the bank's reference").max(200),
});

export const raiseQueryBody = z.object({
  transferId: id.nullish(),
  lineKey: z.string().trim().min(1).max(200).nullish(),
  subject: z.string().trim().min(3, "Say in a few words what the query is about").max(200),
  message: z.string().trim().min(1, "Write the question").max(5000),
});

export const replyQueryBody = z.object({
  message: z.string().trim().min(1, "Write a reply").max(5000),
  resolve: z.boolean().default(false),
});

export const remittanceQuery = z.object({ format: z.enum(["pdf", "csv"]).default("pdf") });
export const reconciliationQuery = z.object({ asOf: isoDate.optional(), siteId: id.optional() });
