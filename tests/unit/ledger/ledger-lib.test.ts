import cc from "currency-codes";
import { describe, expect, it } from "vitest";
import { convertMinor, convertTotals, parseRate, ratesInForce } from "@/lib/ledger/convert";
import { statementCsv } from "@/lib/ledger/statement-csv";
import { bpsToPercent, percentToBps } from "@/lib/budgets/budget-input";
import { parseCsv } from "../../integration/budgets/csv";
import type { EarnedLine } from "@/lib/payment-schedule";

const digits = (code: string) => cc.code(code)!.digits;

describe("conversion into the reporting currency", () => {
  it("shifts by the minor units of each currency (ISO 4217 via currency-codes)", () => {
    // JPY has 0 minor units and EUR 2 (currency-codes): ¥500,000 × 0.0061 = EUR 3,050.00 = 305000 cents.
    expect([digits("JPY"), digits("EUR")]).toEqual([0, 2]);
    expect(convertMinor(500_000n, "JPY", "EUR", parseRate("0.0061")!)).toBe(305_000n);
    // KWD has 3 minor units: KWD 1.234 × 2.9876 = EUR 3.6866984 → 3.69 (one rounding).
    expect(digits("KWD")).toBe(3);
    expect(convertMinor(1234n, "KWD", "EUR", parseRate("2.9876")!)).toBe(369n);
  });

  it("rounds an exact half away from zero (computation rules; common practice)", () => {
    // EUR 0.01 × 150 = ¥1.5 → ¥2; and −¥1.5 → −¥2 (half-even would give 2 and −2 too, so also
    // EUR 0.01 × 250 = ¥2.5 → ¥3, where half-even would give ¥2).
    expect(convertMinor(1n, "EUR", "JPY", parseRate("150")!)).toBe(2n);
    expect(convertMinor(-1n, "EUR", "JPY", parseRate("150")!)).toBe(-2n);
    expect(convertMinor(1n, "EUR", "JPY", parseRate("250")!)).toBe(3n);
  });

  it("uses the latest rate dated on or before the as-of date, and leaves out a currency without one", () => {
    const entries = [
      { currency: "JPY", reportingCurrency: "EUR", rate: "0.0061", rateDate: "2026-06-30" },
      { currency: "JPY", reportingCurrency: "EUR", rate: "0.0065", rateDate: "2026-11-30" },
      { currency: "JPY", reportingCurrency: "EUR", rate: "0.0070", rateDate: "2027-01-05" },
    ];
    const rates = ratesInForce(entries, "EUR", "2026-12-01");
    expect(rates.get("JPY")?.rate).toBe("0.0065");
    const out = convertTotals(
      [
        { currency: "EUR", amountMinor: 100n },
        { currency: "JPY", amountMinor: 1000n },
        { currency: "GBP", amountMinor: 100n },
      ],
      "EUR",
      rates,
    );
    // ¥1,000 × 0.0065 = EUR 6.50 = 650 cents; plus EUR 1.00; GBP has no rate.
    expect(out.totalMinor).toBe(750n);
    expect(out.missing).toEqual(["GBP"]);
  });

  it("refuses rates that are not positive decimals with at most 10 places", () => {
    expect(parseRate("0")).toBeNull();
    expect(parseRate("-1")).toBeNull();
    expect(parseRate("1.12345678901")).toBeNull();
    expect(parseRate("1e3")).toBeNull();
  });
});

describe("percentages as basis points", () => {
  it("parses exactly, with at most two decimals", () => {
    expect(percentToBps("25")).toBe(2500);
    expect(percentToBps("7.5")).toBe(750);
    expect(percentToBps("7.25")).toBe(725);
    expect(percentToBps("7.255")).toBeNull();
    expect(bpsToPercent(2550)).toBe("25.5");
    expect(bpsToPercent(725)).toBe("7.25");
  });
});

describe("CSV statement", () => {
  it("quotes fields with commas or quotes (RFC 4180 §2) and ends rows with CRLF", () => {
    const line = {
      key: "pass-through:1",
      kind: "pass_through",
      source: { event: "invoice", id: "1", description: 'Ethics fee, "full" review' },
      serviceDate: "2026-01-10",
      triggerDate: "2026-01-10",
      cycle: { cycle: "monthly", label: "2026-01", start: "2026-01-01", end: "2026-01-31" },
      dueDate: "2026-03-02",
      budgetVersionNumber: 1,
      grossMinor: 120000n,
      overheadMinor: 0n,
      holdbackMinor: 0n,
      netMinor: 120000n,
      paidMinor: 0n,
      outstandingMinor: 120000n,
      state: "outstanding",
    } as unknown as EarnedLine;
    const text = statementCsv({ siteCode: "DE01", currency: "EUR", from: "2026-01-01", to: "2026-01-31", asOf: "2026-12-01", lines: [line] });
    expect(text.endsWith("\r\n")).toBe(true);
    expect(text).toContain('"Pass-through: Ethics fee, ""full"" review"');
    const rows = parseCsv(text);
    expect(rows[1]![2]).toBe('Pass-through: Ethics fee, "full" review');
    expect(rows[2]![rows[0]!.indexOf("Net")]).toBe("1200.00");
  });
});
