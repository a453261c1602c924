import { minorUnits, roundHalfAwayFromZero } from "@/lib/money";

// Conversion of site-currency totals into the study's reporting currency with the rates sponsor
// finance entered. Exact: the rate is a decimal (up to 10 places) held as a scaled bigint, and
// each converted amount is rounded once, half away from zero.

export const RATE_SCALE_DIGITS = 10;
const RATE_SCALE = 10n ** BigInt(RATE_SCALE_DIGITS);

/** "0.0061234" → 61234000n (× 10^10); null when the text is not a positive decimal. */
export function parseRate(text: string): bigint | null {
  const m = /^\s*(\d{1,12})(?:\.(\d{1,10}))?\s*$/.exec(text);
  if (!m) return null;
  const scaled = BigInt(m[1]! + (m[2] ?? "").padEnd(RATE_SCALE_DIGITS, "0"));
  return scaled > 0n ? scaled : null;
}

/** amount (minor units of `from`) × rate → minor units of `to`, one rounding. */
export function convertMinor(amountMinor: bigint, from: string, to: string, rateScaled: bigint): bigint {
  const shift = minorUnits(to) - minorUnits(from);
  const numerator = amountMinor * rateScaled * (shift > 0 ? 10n ** BigInt(shift) : 1n);
  const denominator = RATE_SCALE * (shift < 0 ? 10n ** BigInt(-shift) : 1n);
  return roundHalfAwayFromZero(numerator, denominator);
}

export interface RateEntry {
  currency: string;
  reportingCurrency: string;
  rate: string;
  rateDate: string;
}

/** The latest rate for each currency dated on or before `asOf` (rates entered later are ignored). */
export function ratesInForce(entries: readonly RateEntry[], reportingCurrency: string, asOf: string): Map<string, RateEntry> {
  const out = new Map<string, RateEntry>();
  for (const e of entries) {
    if (e.reportingCurrency !== reportingCurrency || e.rateDate > asOf) continue;
    const prev = out.get(e.currency);
    if (!prev || e.rateDate > prev.rateDate) out.set(e.currency, e);
  }
  return out;
}

export interface ConvertedAmount {
  currency: string;
  amountMinor: bigint;
  /** null when no rate was entered for the currency: the amount is left out of the total. */
  convertedMinor: bigint | null;
  rate: string | null;
  rateDate: string | null;
}

/** Convert per-currency amounts and add those that have a rate. */
export function convertTotals(
  amounts: readonly { currency: string; amountMinor: bigint }[],
  reportingCurrency: string,
  rates: Map<string, RateEntry>,
): { lines: ConvertedAmount[]; totalMinor: bigint; missing: string[] } {
  let totalMinor = 0n;
  const missing: string[] = [];
  const lines = amounts.map(({ currency, amountMinor }) => {
    if (currency === reportingCurrency) {
      totalMinor += amountMinor;
      return { currency, amountMinor, convertedMinor: amountMinor, rate: "1", rateDate: null };
    }
    const r = rates.get(currency);
    const scaled = r ? parseRate(r.rate) : null;
    if (!r || scaled === null) {
      missing.push(currency);
      return { currency, amountMinor, convertedMinor: null, rate: null, rateDate: null };
    }
    const convertedMinor = convertMinor(amountMinor, currency, reportingCurrency, scaled);
    totalMinor += convertedMinor;
    return { currency, amountMinor, convertedMinor, rate: r.rate, rateDate: r.rateDate };
  });
  return { lines, totalMinor, missing };
}
