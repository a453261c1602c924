import "server-only";
import type { BudgetVersion, MilestoneFee } from "@/lib/payment-schedule";
import type { BudgetItemRow, BudgetVersionRow } from "@/server/db/schema";

/** A stored version and its items as the engine's BudgetVersion. */
export function toEngineVersion(v: BudgetVersionRow, items: readonly BudgetItemRow[]): BudgetVersion {
  let startupFeeMinor = 0n;
  let screenFailureFeeMinor = 0n;
  const milestoneFees: MilestoneFee[] = [];
  const visitFees: Record<string, bigint> = {};
  for (const i of items) {
    if (i.kind === "startup") startupFeeMinor = i.amountMinor;
    else if (i.kind === "screen_failure") screenFailureFeeMinor = i.amountMinor;
    else if (i.kind === "visit" && i.visitCode) visitFees[i.visitCode] = i.amountMinor;
    else if (i.kind === "milestone" && i.milestone) milestoneFees.push({ kind: i.milestone, n: i.n, amountMinor: i.amountMinor });
  }
  const hasCap = v.screenFailureCapPerEnrolled != null || v.screenFailureCapMax != null;
  return {
    id: v.id,
    siteId: v.siteId,
    versionNumber: v.versionNumber,
    effectiveFrom: v.effectiveFrom,
    startupFeeMinor,
    milestoneFees,
    visitFees,
    screenFailureFeeMinor,
    screenFailureCap: hasCap ? { perEnrolled: v.screenFailureCapPerEnrolled, maxCount: v.screenFailureCapMax } : null,
    overheadBps: v.overheadBps,
    holdbackBps: v.holdbackBps,
    cycle: v.cycle,
    netDays: v.netDays,
    trigger: v.trigger,
  };
}
