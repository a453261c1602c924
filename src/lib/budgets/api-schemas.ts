import { z } from "zod";
import { currencyCodeSchema, moneyAmountSchema } from "@/lib/money";
import { parseRate } from "@/lib/ledger/convert";

// Query and body schemas of the budget and ledger routes, shared with the client.

const isoDate = z.iso.date({ message: "Use a date as YYYY-MM-DD" });

export const asOfQuery = z.object({ asOf: isoDate.optional() });

export const budgetVersionParams = z.object({ siteId: z.uuid({ message: "Not a valid id" }), versionNumber: z.coerce.number().int().positive("Versions are numbered from 1") });

export const statementQuery = z
  .object({
    from: isoDate.optional(),
    to: isoDate.optional(),
    cycle: z.string().regex(/^\d{4}-(\d{2}|Q[1-4])$/, "A cycle looks like 2026-03 or 2026-Q1").optional(),
    format: z.enum(["csv", "pdf"]).default("csv"),
    asOf: isoDate.optional(),
  })
  .refine((q) => !q.from || !q.to || q.from <= q.to, { message: "The period ends before it starts", path: ["to"] });

export const exchangeRateInput = z.object({
  currency: currencyCodeSchema,
  rate: z.string().trim().refine((t) => parseRate(t) !== null, "Enter a positive decimal rate with at most 10 decimals, e.g. 0.0061"),
  rateDate: isoDate,
  source: z.string().trim().max(200).default(""),
});

/** An approved pass-through invoice, its amount typed in major units of the site's currency. */
export const passThroughInvoiceInput = (currency: string) =>
  z.object({
    documentId: z.uuid({ message: "Choose the uploaded invoice" }),
    description: z.string().trim().min(3, "Say what the invoice is for").max(200),
    amount: moneyAmountSchema(currency, { min: 1n }),
    approvedOn: isoDate,
  });
