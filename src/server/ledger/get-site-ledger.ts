import "server-only";
import type { Tx } from "@/server/db/client";
import { computePaymentSchedule, type EarnedLine } from "@/lib/payment-schedule";
import { listBudgetVersions } from "@/server/budgets/queries";
import { loadScheduleSnapshot } from "./load-snapshot";

/** "now" as the engine's asOf (each site's local date of it), or a given date. */
export function asOfOrNow(asOf?: string | null): string {
  return asOf ?? new Date().toISOString();
}

/** A site's earned lines, cycles, totals, holdback ledger and events not yet earned. */
export async function getSiteLedger(tx: Tx, { studyId, siteId, asOf }: { studyId: string; siteId: string; asOf?: string | null }) {
  const { study, sites, snapshot } = await loadScheduleSnapshot(tx, { studyId, siteIds: [siteId], asOf: asOfOrNow(asOf) });
  const site = sites[0];
  if (!site) return null;
  const schedule = computePaymentSchedule(snapshot);
  const versions = await listBudgetVersions(tx, { siteIds: [siteId] });
  return {
    study,
    site,
    asOf: schedule.sites[0]?.asOf ?? schedule.asOf,
    totals: schedule.sites[0] ?? null,
    lines: schedule.lines,
    cycles: schedule.cycles,
    holdback: schedule.holdback[0] ?? null,
    pending: schedule.pending,
    unmatchedPayments: schedule.unmatchedPayments,
    budgetVersions: versions.map((v) => ({ id: v.id, versionNumber: v.versionNumber, effectiveFrom: v.effectiveFrom, cycle: v.cycle, netDays: v.netDays, trigger: v.trigger })),
  };
}
export type SiteLedger = NonNullable<Awaited<ReturnType<typeof getSiteLedger>>>;

/** Lines of a statement period: triggered (hence falling in a cycle) between from and to inclusive. */
export function linesInPeriod(lines: readonly EarnedLine[], { from, to, cycle }: { from?: string | null; to?: string | null; cycle?: string | null }): EarnedLine[] {
  return lines.filter((l) => (!from || l.triggerDate >= from) && (!to || l.triggerDate <= to) && (!cycle || l.cycle.label === cycle));
}
