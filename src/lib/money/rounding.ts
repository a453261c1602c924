// Integer-only rounding: every money figure is a bigint of minor units.

export const BPS_DENOMINATOR = 10_000n;

function abs(n: bigint): bigint {
  return n < 0n ? -n : n;
}

/**
 * numerator / denominator rounded to the nearest integer, exact halves away from zero
 * (the spreadsheet ROUND rule Cairn's computation rules fix for every money line).
 */
export function roundHalfAwayFromZero(numerator: bigint, denominator: bigint = 1n): bigint {
  if (denominator === 0n) throw new RangeError("Cannot divide an amount by zero");
  const negative = numerator < 0n !== denominator < 0n;
  const n = abs(numerator);
  const d = abs(denominator);
  const q = n / d;
  const r = n % d;
  const rounded = 2n * r >= d ? q + 1n : q;
  return negative ? -rounded : rounded;
}

/** Banker's rounding, kept only so tests and docs can show how it differs. */
export function roundHalfEven(numerator: bigint, denominator: bigint = 1n): bigint {
  if (denominator === 0n) throw new RangeError("Cannot divide an amount by zero");
  const negative = numerator < 0n !== denominator < 0n;
  const n = abs(numerator);
  const d = abs(denominator);
  const q = n / d;
  const twice = 2n * (n % d);
  const rounded = twice > d || (twice === d && q % 2n === 1n) ? q + 1n : q;
  return negative ? -rounded : rounded;
}

/** amount × rate (basis points) / 10 000, one exact rounding, half away from zero. */
export function applyRateBps(amountMinor: bigint, rateBps: number | bigint): bigint {
  if (typeof rateBps === "number" && !Number.isInteger(rateBps)) {
    throw new RangeError(`A rate in basis points must be a whole number, got ${rateBps}`);
  }
  return roundHalfAwayFromZero(amountMinor * BigInt(rateBps), BPS_DENOMINATOR);
}
