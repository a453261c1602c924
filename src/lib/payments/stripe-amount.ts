import { minorUnits } from "@/lib/money";

// Stripe takes amounts as integers in "the smallest currency unit" — but its unit is not always the
// ISO 4217 minor unit. Stripe's currency documentation lists the zero-decimal currencies (sent as
// whole units), the three-decimal ones (sent in thousandths, last digit 0) and special cases.

/** Stripe's zero-decimal currencies (Stripe documentation, "Supported currencies", zero-decimal). */
export const STRIPE_ZERO_DECIMAL = new Set(["BIF", "CLP", "DJF", "GNF", "JPY", "KMF", "KRW", "MGA", "PYG", "RWF", "UGX", "VND", "VUV", "XAF", "XOF", "XPF"]);
/** Three-decimal currencies: amounts in thousandths whose last digit must be 0 (Stripe documentation). */
export const STRIPE_THREE_DECIMAL = new Set(["BHD", "JOD", "KWD", "OMR", "TND"]);
/** ISK has no minor unit in ISO 4217 but Stripe keeps a two-decimal representation ending in 00 (Stripe documentation, special cases; from memory). */
const STRIPE_TWO_DECIMAL_SPECIAL = new Set(["ISK"]);

export class StripeAmountError extends Error {}

/** Decimals of Stripe's integer amount for a currency. */
export function stripeDecimals(currency: string): number {
  const code = currency.toUpperCase();
  if (STRIPE_ZERO_DECIMAL.has(code)) return 0;
  if (STRIPE_TWO_DECIMAL_SPECIAL.has(code)) return 2;
  if (STRIPE_THREE_DECIMAL.has(code)) return 3;
  return 2;
}

/** ISO 4217 minor units → Stripe's integer amount. Never rounds: an amount Stripe cannot carry is refused. */
export function toStripeAmount(amountMinor: bigint, currency: string): bigint {
  const code = currency.toUpperCase();
  const iso = minorUnits(code);
  const shift = stripeDecimals(code) - iso;
  let amount: bigint;
  if (shift >= 0) amount = amountMinor * 10n ** BigInt(shift);
  else {
    const d = 10n ** BigInt(-shift);
    if (amountMinor % d !== 0n) throw new StripeAmountError(`${code} ${amountMinor} minor units cannot be sent: Stripe carries ${stripeDecimals(code)} decimals`);
    amount = amountMinor / d;
  }
  if (STRIPE_THREE_DECIMAL.has(code) && amount % 10n !== 0n) {
    throw new StripeAmountError(`${code} amounts sent through Stripe must end in 0 (got ${amount} thousandths)`);
  }
  return amount;
}

/** Stripe's integer amount → ISO 4217 minor units. */
export function fromStripeAmount(stripeAmount: bigint, currency: string): bigint {
  const code = currency.toUpperCase();
  const shift = stripeDecimals(code) - minorUnits(code);
  if (shift >= 0) {
    const d = 10n ** BigInt(shift);
    if (stripeAmount % d !== 0n) throw new StripeAmountError(`${code} amount ${stripeAmount} is not a whole number of ISO minor units`);
    return stripeAmount / d;
  }
  return stripeAmount * 10n ** BigInt(-shift);
}
