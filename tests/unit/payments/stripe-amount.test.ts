import { describe, expect, it } from "vitest";
import cc from "currency-codes";
import { SUPPORTED_CURRENCIES } from "@/lib/money";
import { STRIPE_ZERO_DECIMAL, StripeAmountError, fromStripeAmount, stripeDecimals, toStripeAmount } from "@/lib/payments/stripe-amount";

const isoDigits = (code: string) => {
  const c = cc.code(code);
  if (!c) throw new Error(`currency-codes has no ${code}`);
  return c.digits;
};

describe("Stripe amounts (Stripe documentation, Supported currencies: minor units in API amounts)", () => {
  it("sends JPY as whole yen: ISO 4217 gives JPY 0 digits and Stripe lists JPY as zero-decimal", () => {
    expect(isoDigits("JPY")).toBe(0); // ISO 4217 via currency-codes
    expect(STRIPE_ZERO_DECIMAL.has("JPY")).toBe(true); // Stripe's zero-decimal list
    // ¥150,000 is stored as 150000 minor units (no minor unit) and sent as amount=150000.
    expect(toStripeAmount(150_000n, "JPY")).toBe(150_000n);
  });

  it("sends EUR in cents: ISO 4217 gives EUR 2 digits", () => {
    expect(isoDigits("EUR")).toBe(2);
    // €1,388.88 (the REFERENCES worked example's net) = 138888 cents → amount=138888.
    expect(toStripeAmount(138_888n, "EUR")).toBe(138_888n);
  });

  it("agrees with ISO 4217 for every supported currency Stripe carries at its ISO precision", () => {
    for (const code of SUPPORTED_CURRENCIES) {
      if (code === "ISK") continue; // Stripe's special case below
      expect(stripeDecimals(code), code).toBe(isoDigits(code));
    }
  });

  it("keeps ISK's two-decimal representation ending in 00 (Stripe's special case; from memory)", () => {
    expect(isoDigits("ISK")).toBe(0);
    expect(toStripeAmount(12_345n, "ISK")).toBe(1_234_500n);
    expect(fromStripeAmount(1_234_500n, "ISK")).toBe(12_345n);
  });

  it("refuses a three-decimal amount whose last digit is not 0 rather than rounding it (Stripe documentation, three-decimal currencies)", () => {
    expect(isoDigits("KWD")).toBe(3);
    expect(toStripeAmount(12_340n, "KWD")).toBe(12_340n);
    expect(() => toStripeAmount(12_345n, "KWD")).toThrow(StripeAmountError);
  });

  it("round-trips every supported currency", () => {
    for (const code of SUPPORTED_CURRENCIES) {
      const minor = code === "KWD" || code === "BHD" || code === "JOD" || code === "OMR" || code === "TND" ? 1_000_010n : 1_000_001n;
      expect(fromStripeAmount(toStripeAmount(minor, code), code), code).toBe(minor);
    }
  });
});
