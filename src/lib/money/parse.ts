import { isSupportedCurrency, minorUnits } from "./currencies";

export class MoneyParseError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "MoneyParseError";
  }
}

// Plain digits ("1234.56") or correctly grouped thousands ("1,234.56"); "." is the decimal mark.
const AMOUNT = /^([+-])?(\d{1,3}(?:,\d{3})+|\d+)(?:\.(\d+))?$/;

/** Parse an amount written in major units ("1,234.56") into minor units of the currency. */
export function parseMajorToMinor(input: string, currency: string): bigint {
  if (!isSupportedCurrency(currency)) throw new MoneyParseError(`Currency ${currency} is not supported`);
  const text = input.trim();
  const m = AMOUNT.exec(text);
  if (!m) throw new MoneyParseError(`"${input}" is not an amount: use digits with "." for decimals, e.g. 1234.56`);
  const [, sign, whole = "0", fraction = ""] = m;
  const digits = minorUnits(currency);
  if (fraction.length > digits) {
    throw new MoneyParseError(
      digits === 0
        ? `${currency} has no minor unit: enter a whole amount, not "${text}"`
        : `${currency} allows at most ${digits} decimals: "${text}" has ${fraction.length}`,
    );
  }
  const minor = BigInt(whole.replaceAll(",", "") + fraction.padEnd(digits, "0"));
  return sign === "-" ? -minor : minor;
}
