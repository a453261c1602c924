import { describe, expect, it } from "vitest";
import cc from "currency-codes";
import {
  MINOR_UNITS,
  SUPPORTED_CURRENCIES,
  allocateLargestRemainder,
  applyRateBps,
  formatMinor,
  minorUnits,
  moneyAmountSchema,
  moneyInputSchema,
  parseMajorToMinor,
  roundHalfAwayFromZero,
  roundHalfEven,
} from "@/lib/money";

describe("minor units (ISO 4217, checked against the currency-codes package)", () => {
  it("lists at least the currencies Cairn promises", () => {
    for (const c of ["EUR", "USD", "GBP", "CHF", "JPY", "KRW", "SEK", "NOK", "DKK", "PLN", "CZK", "HUF", "CAD", "AUD", "KWD", "BHD", "JOD", "OMR", "TND", "ISK", "CLP"]) {
      expect(SUPPORTED_CURRENCIES).toContain(c);
    }
  });
  it.each(SUPPORTED_CURRENCIES)("%s matches currency-codes digits", (code) => {
    // Source: ISO 4217 list one, as published in the npm package currency-codes (field `digits`).
    expect(MINOR_UNITS[code]).toBe(cc.code(code)?.digits);
  });
  it("names the ISO 4217 cases called out in REFERENCES.md", () => {
    expect(minorUnits("JPY")).toBe(0);
    expect(minorUnits("EUR")).toBe(2);
    expect(minorUnits("KWD")).toBe(3);
    expect(() => minorUnits("XXX")).toThrow(/not supported/);
  });
});

describe("roundHalfAwayFromZero", () => {
  it("rounds exact halves away from zero in both signs", () => {
    expect(roundHalfAwayFromZero(5n, 2n)).toBe(3n); // 2.5 → 3
    expect(roundHalfAwayFromZero(-5n, 2n)).toBe(-3n); // −2.5 → −3
    expect(roundHalfAwayFromZero(5n, -2n)).toBe(-3n);
    expect(roundHalfAwayFromZero(15n, 10n)).toBe(2n); // 1.5 → 2
    expect(roundHalfAwayFromZero(-15n, 10n)).toBe(-2n);
    expect(roundHalfAwayFromZero(25n, 10n)).toBe(3n); // 2.5 → 3 (half-even would give 2)
  });
  it("rounds non-halves to nearest", () => {
    expect(roundHalfAwayFromZero(149n, 100n)).toBe(1n);
    expect(roundHalfAwayFromZero(-149n, 100n)).toBe(-1n);
    expect(roundHalfAwayFromZero(151n, 100n)).toBe(2n);
    expect(roundHalfAwayFromZero(-151n, 100n)).toBe(-2n);
  });
  it("refuses division by zero", () => {
    expect(() => roundHalfAwayFromZero(1n, 0n)).toThrow(/zero/);
  });
});

describe("applyRateBps", () => {
  it("REFERENCES.md worked example: EUR 1,234.56 + 25% overhead, 10% holdback (common practice)", () => {
    const fee = 123456n;
    const overhead = applyRateBps(fee, 2500); // 1234.56 × 0.25 = 308.64 exactly
    expect(overhead).toBe(30864n);
    expect(fee + overhead).toBe(154320n); // 1,543.20
    const holdback = applyRateBps(fee + overhead, 1000n); // 1543.20 × 0.10 = 154.32
    expect(holdback).toBe(15432n);
    expect(fee + overhead - holdback).toBe(138888n); // net 1,388.88
  });
  it("REFERENCES.md half-up vs half-even: 10% of EUR 0.25 is 0.03 half-up, 0.02 half-even", () => {
    expect(applyRateBps(25n, 1000)).toBe(3n);
    expect(roundHalfEven(25n * 1000n, 10_000n)).toBe(2n);
    expect(applyRateBps(-25n, 1000)).toBe(-3n);
  });
  it("exact half cases in both signs", () => {
    expect(applyRateBps(1n, 5000)).toBe(1n); // 0.5 → 1
    expect(applyRateBps(-1n, 5000)).toBe(-1n); // −0.5 → −1
    expect(applyRateBps(3n, 5000)).toBe(2n); // 1.5 → 2
    expect(applyRateBps(-3n, 5000)).toBe(-2n);
  });
  it("refuses fractional basis points", () => {
    expect(() => applyRateBps(100n, 12.5)).toThrow(/whole number/);
  });
});

describe("allocateLargestRemainder", () => {
  it("REFERENCES.md: EUR 100.00 three ways = 33.34 + 33.33 + 33.33", () => {
    expect(allocateLargestRemainder(10000n, [1, 1, 1])).toEqual([3334n, 3333n, 3333n]);
  });
  it("always adds up, including negative totals", () => {
    const parts = allocateLargestRemainder(-10001n, [3, 2, 2]);
    expect(parts.reduce((a, b) => a + b, 0n)).toBe(-10001n);
    expect(parts).toEqual([-4286n, -2858n, -2857n]); // 4286.14, 2857.43, 2857.43 → leftover 1 to index 1
  });
  it("refuses empty or all-zero weights", () => {
    expect(() => allocateLargestRemainder(1n, [])).toThrow();
    expect(() => allocateLargestRemainder(1n, [0, 0])).toThrow(/zero/);
  });
});

describe("parseMajorToMinor and formatMinor", () => {
  it("parses by the currency's minor units", () => {
    expect(parseMajorToMinor("1,234.56", "EUR")).toBe(123456n);
    expect(parseMajorToMinor("1234.5", "EUR")).toBe(123450n);
    expect(parseMajorToMinor("-0.01", "EUR")).toBe(-1n);
    expect(parseMajorToMinor("15000", "JPY")).toBe(15000n);
    expect(parseMajorToMinor("1.234", "KWD")).toBe(1234n);
  });
  it("refuses too many decimals with a clear message", () => {
    expect(() => parseMajorToMinor("1.234", "EUR")).toThrow("EUR allows at most 2 decimals");
    expect(() => parseMajorToMinor("100.5", "JPY")).toThrow("JPY has no minor unit");
    expect(() => parseMajorToMinor("12,34.00", "EUR")).toThrow(/not an amount/);
    expect(() => parseMajorToMinor("abc", "EUR")).toThrow(/not an amount/);
  });
  it("formats with the right decimals and the code, exactly", () => {
    expect(formatMinor(123456n, "EUR")).toBe("1,234.56 EUR");
    expect(formatMinor(-5n, "EUR")).toBe("-0.05 EUR");
    expect(formatMinor(1500000n, "JPY")).toBe("1,500,000 JPY");
    expect(formatMinor(1234n, "KWD", { withCode: false })).toBe("1.234");
    expect(formatMinor(12345678901234567890n, "USD", { grouping: false })).toBe("123456789012345678.90 USD");
  });
  it("round-trips parse ∘ format", () => {
    for (const [a, c] of [[123456n, "EUR"], [-1n, "KWD"], [987654321n, "KRW"]] as const) {
      expect(parseMajorToMinor(formatMinor(a, c, { withCode: false }), c)).toBe(a);
    }
  });
});

describe("zod money schemas", () => {
  it("turns a form value into minor units", () => {
    expect(moneyInputSchema.parse({ amount: "12.50", currency: "GBP" })).toEqual({ amountMinor: 1250n, currency: "GBP" });
    expect(moneyAmountSchema("JPY").parse("3000")).toBe(3000n);
  });
  it("reports too many decimals on the amount field", () => {
    const r = moneyInputSchema.safeParse({ amount: "12.505", currency: "GBP" });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0]?.path).toEqual(["amount"]);
    expect(r.error?.issues[0]?.message).toMatch(/at most 2 decimals/);
    expect(moneyAmountSchema("EUR", { min: 0n }).safeParse("-1").success).toBe(false);
    expect(moneyInputSchema.safeParse({ amount: "1", currency: "XYZ" }).success).toBe(false);
  });
});
