import "server-only";
import type { Tx } from "@/server/db/client";
import { addDays, computePaymentSchedule } from "@/lib/payment-schedule";
import { loadScheduleSnapshot } from "./load-snapshot";
import { asOfOrNow } from "./get-site-ledger";

export interface CashFlowMonth {
  month: string;
  paidMinor: bigint;
  /** Outstanding net by due month (overdue amounts stay in their past month). */
  dueMinor: bigint;
  projectedMinor: bigint;
  lowMinor: bigint;
  highMinor: bigint;
}

/**
 * The forward projection (12 months, Poisson–gamma enrolment with its 80% band) and, per currency,
 * a cash-flow series: paid by month of payment, outstanding by month due, projected by month earned.
 */
export async function getProjection(tx: Tx, { studyId, siteIds, asOf }: { studyId: string; siteIds: "all" | string[]; asOf?: string | null }) {
  const { sites, snapshot } = await loadScheduleSnapshot(tx, { studyId, siteIds, asOf: asOfOrNow(asOf), projection: true });
  const schedule = computePaymentSchedule(snapshot);
  const projection = schedule.projection!;
  const firstProjected = projection.currencies[0]?.months[0]?.month ?? projection.asOf.slice(0, 7);
  const startMonth = addDays(`${firstProjected}-01`, -365).slice(0, 7);
  const series = new Map<string, Map<string, CashFlowMonth>>();
  const cell = (currency: string, month: string) => {
    let byMonth = series.get(currency);
    if (!byMonth) series.set(currency, (byMonth = new Map()));
    let c = byMonth.get(month);
    if (!c) byMonth.set(month, (c = { month, paidMinor: 0n, dueMinor: 0n, projectedMinor: 0n, lowMinor: 0n, highMinor: 0n }));
    return c;
  };
  for (const l of schedule.lines) {
    if (l.paidMinor > 0n && l.lastPaidOn && l.lastPaidOn.slice(0, 7) >= startMonth) cell(l.currency, l.lastPaidOn.slice(0, 7)).paidMinor += l.paidMinor;
    if (l.outstandingMinor > 0n) cell(l.currency, l.dueDate.slice(0, 7) < startMonth ? startMonth : l.dueDate.slice(0, 7)).dueMinor += l.outstandingMinor;
  }
  for (const c of projection.currencies) {
    for (const m of c.months) {
      const x = cell(c.currency, m.month);
      x.projectedMinor += m.expectedNetMinor;
      x.lowMinor += m.lowNetMinor;
      x.highMinor += m.highNetMinor;
    }
  }
  const cashFlow = [...series.entries()]
    .sort(([a], [b]) => (a < b ? -1 : 1))
    .map(([currency, byMonth]) => ({ currency, months: [...byMonth.values()].sort((a, b) => (a.month < b.month ? -1 : 1)) }));
  return { asOf: schedule.asOf, sites: sites.map((s) => ({ id: s.id, code: s.code, currency: s.currency })), projection, cashFlow, firstProjectedMonth: firstProjected };
}
