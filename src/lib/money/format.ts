import { minorUnits } from "./currencies";

export interface FormatMoneyOptions {
  /** Group thousands with "," (default true). */
  grouping?: boolean;
  /** Append the currency code (default true): "1,234.56 EUR". */
  withCode?: boolean;
}

/** The amount in major units as text, exact (no floats): 123456n EUR → "1,234.56". */
export function formatMinor(amountMinor: bigint, currency: string, options: FormatMoneyOptions = {}): string {
  const { grouping = true, withCode = true } = options;
  const digits = minorUnits(currency);
  const negative = amountMinor < 0n;
  const text = (negative ? -amountMinor : amountMinor).toString().padStart(digits + 1, "0");
  let whole = text.slice(0, text.length - digits);
  const fraction = text.slice(text.length - digits);
  if (grouping) whole = whole.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
  const number = `${negative ? "-" : ""}${whole}${digits > 0 ? `.${fraction}` : ""}`;
  return withCode ? `${number} ${currency}` : number;
}
