import { z } from "zod";
import { SUPPORTED_CURRENCIES } from "./currencies";
import { MoneyParseError, parseMajorToMinor } from "./parse";

export const currencyCodeSchema = z.enum(SUPPORTED_CURRENCIES as [string, ...string[]], {
  error: "Choose a currency Cairn supports",
});

/** A form field holding an amount in major units for a known currency → bigint minor units. */
export function moneyAmountSchema(currency: string, options: { min?: bigint } = {}) {
  return z.string().transform((text, ctx) => {
    try {
      const minor = parseMajorToMinor(text, currency);
      if (options.min !== undefined && minor < options.min) {
        ctx.addIssue({ code: "custom", message: "The amount is below the minimum allowed" });
        return z.NEVER;
      }
      return minor;
    } catch (e) {
      ctx.addIssue({ code: "custom", message: e instanceof MoneyParseError ? e.message : "Not an amount" });
      return z.NEVER;
    }
  });
}

/** { amount: "1,234.56", currency: "EUR" } → { amountMinor: 123456n, currency: "EUR" }. */
export const moneyInputSchema = z
  .object({ amount: z.string(), currency: currencyCodeSchema })
  .transform((value, ctx) => {
    try {
      return { amountMinor: parseMajorToMinor(value.amount, value.currency), currency: value.currency };
    } catch (e) {
      ctx.addIssue({ code: "custom", path: ["amount"], message: e instanceof MoneyParseError ? e.message : "Not an amount" });
      return z.NEVER;
    }
  });
