import { applyRateBps } from "@/lib/money";
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

/** Prices by version and fee, computed once: most visits of a site share a handful of fees. */
export class PriceBook {
  private readonly withHoldback = new Map<BudgetVersion, Map<bigint, Amounts>>();
  private readonly withoutHoldback = new Map<BudgetVersion, Map<bigint, Amounts>>();

  private readonly visitsWithHoldback = new Map<BudgetVersion, Map<string, Amounts | null>>();

  /** The priced visit fee of a version (null when the version has no fee for the code), cached by code. */
  visit(version: BudgetVersion, visitCode: string, holdback: boolean): Amounts | null {
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

  price(version: BudgetVersion, feeMinor: bigint, holdback: boolean): Amounts {
    const book = holdback ? this.withHoldback : this.withoutHoldback;
    let byFee = book.get(version);
    if (!byFee) {
      byFee = new Map();
      book.set(version, byFee);
    }
    let amounts = byFee.get(feeMinor);
    if (!amounts) {
      amounts = priceFee(feeMinor, version.overheadBps, holdback ? version.holdbackBps : 0);
      byFee.set(feeMinor, amounts);
    }
    return amounts;
  }
}

/** Pass-through costs are reimbursed at cost: no overhead, nothing withheld (common practice). */
export function pricePassThrough(amountMinor: bigint): Amounts {
  return { grossMinor: amountMinor, overheadMinor: 0n, holdbackMinor: 0n, netMinor: amountMinor };
}
