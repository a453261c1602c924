import "server-only";
import { and, eq } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { exchangeRates } from "@/server/db/schema";
import { computePaymentSchedule, localDate } from "@/lib/payment-schedule";
import { convertTotals, ratesInForce } from "@/lib/ledger";
import { loadScheduleSnapshot } from "./load-snapshot";
import { asOfOrNow } from "./get-site-ledger";

const FIGURES = ["earnedMinor", "paidMinor", "outstandingMinor", "overdueMinor", "heldBackMinor"] as const;

/**
 * Totals by site and by currency, and each figure converted into the study's reporting currency
 * with the latest rate sponsor finance entered on or before the as-of date.
 */
export async function getStudySummary(tx: Tx, { studyId, siteIds, asOf }: { studyId: string; siteIds: "all" | string[]; asOf?: string | null }) {
  const when = asOfOrNow(asOf);
  const [{ study, sites, snapshot }, rateRows] = await Promise.all([
    loadScheduleSnapshot(tx, { studyId, siteIds, asOf: when }),
    tx.select().from(exchangeRates).where(and(eq(exchangeRates.studyId, studyId))),
  ]);
  // The response carries totals only: no line is kept (same totals as the full schedule).
  const schedule = computePaymentSchedule(snapshot, { lines: false });
  const siteById = new Map(sites.map((s) => [s.id, s]));
  const rateDate = localDate(when, "UTC");
  const rates = ratesInForce(rateRows, study.reportingCurrency, rateDate);
  const converted = Object.fromEntries(
    FIGURES.map((f) => [f, convertTotals(schedule.currencies.map((c) => ({ currency: c.currency, amountMinor: c[f] })), study.reportingCurrency, rates)]),
  ) as Record<(typeof FIGURES)[number], ReturnType<typeof convertTotals>>;
  return {
    study,
    asOf: schedule.asOf,
    reportingCurrency: study.reportingCurrency,
    sites: schedule.sites.map((t) => ({ ...t, code: siteById.get(t.siteId)?.code ?? "", name: siteById.get(t.siteId)?.name ?? "", status: siteById.get(t.siteId)?.status ?? "" })),
    currencies: schedule.currencies,
    converted,
    rates: [...rates.values()],
    pendingCount: schedule.pending.length,
  };
}
export type StudySummary = Awaited<ReturnType<typeof getStudySummary>>;
