import { applyRateBps } from "@/lib/money";
import type { PricedAmounts } from "./line";
import type { Amounts } from "./result";
import type { BudgetVersion } from "./snapshot";

// Each line is rounded once per component, half away from zero (computation rules):
// overhead = round(fee × overhead), holdback = round((fee + overhead) × holdback),
// net = fee + overhead − holdback.
export function priceFee(feeMinor: bigint, overheadBps: number, holdbackBps: number): Amounts {
  const overheadMinor = applyRateBps(feeMinor, overheadBps);
  const holdbackMinor = applyRateBps(feeMinor + overheadMinor, holdbackBps);
  return { grossMinor: feeMinor, overheadMinor, holdbackMinor, netMinor: feeMinor + overheadMinor - holdbackMinor };
}

/** The amounts with their numbers, converted once per priced fee rather than once per line. */
export function withNumbers(a: Amounts): PricedAmounts {
  // A literal, not a spread: every priced fee gets the same object shape.
  return {
    grossMinor: a.grossMinor,
    overheadMinor: a.overheadMinor,
    holdbackMinor: a.holdbackMinor,
    netMinor: a.netMinor,
    gross: Number(a.grossMinor),
    overhead: Number(a.overheadMinor),
    holdback: Number(a.holdbackMinor),
    net: Number(a.netMinor),
  };
}

/** Prices by version and fee, computed once: most visits of a site share a handful of fees. */
export class PriceBook {
  private readonly withHoldback = new Map<BudgetVersion, Map<bigint, PricedAmounts>>();
  private readonly withoutHoldback = new Map<BudgetVersion, Map<bigint, PricedAmounts>>();

  private readonly visitsWithHoldback = new Map<BudgetVersion, Map<string, PricedAmounts | null>>();

  /** The priced visit fee of a version (null when the version has no fee for the code), cached by code. */
  visit(version: BudgetVersion, visitCode: string, holdback: boolean): PricedAmounts | null {
    if (!holdback) {
      const fee = version.visitFees[visitCode];
      return fee === undefined ? null : this.price(version, fee, false);
    }
    let byCode = this.visitsWithHoldback.get(version);
    if (!byCode) {
      byCode = new Map();
      this.visitsWithHoldback.set(version, byCode);
    }
    let amounts = byCode.get(visitCode);
    if (amounts === undefined) {
      const fee = version.visitFees[visitCode];
      amounts = fee === undefined ? null : this.price(version, fee, true);
      byCode.set(visitCode, amounts);
    }
    return amounts;
  }

  price(version: BudgetVersion, feeMinor: bigint, holdback: boolean): PricedAmounts {
    const book = holdback ? this.withHoldback : this.withoutHoldback;
    let byFee = book.get(version);
    if (!byFee) {
      byFee = new Map();
      book.set(version, byFee);
    }
    let amounts = byFee.get(feeMinor);
    if (!amounts) {
      amounts = withNumbers(priceFee(feeMinor, version.overheadBps, holdback ? version.holdbackBps : 0));
      byFee.set(feeMinor, amounts);
    }
    return amounts;
  }
}

/** Pass-through costs are reimbursed at cost: no overhead, nothing withheld (common practice). */
export function pricePassThrough(amountMinor: bigint): PricedAmounts {
  return withNumbers({ grossMinor: amountMinor, overheadMinor: 0n, holdbackMinor: 0n, netMinor: amountMinor });
}
