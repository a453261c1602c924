import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { paymentRunLines, paymentTransfers, sites } from "@/server/db/schema";
import { loadScheduleSnapshot } from "@/server/ledger/load-snapshot";
import { computePaymentSchedule, localDate, type EarnedLine, type PaymentSchedule } from "@/lib/payment-schedule";

// The schedule as payments see it: the ledger's snapshot, plus what Cairn's own runs have paid
// (lines paid by a transfer count as payments of the line) and the lines frozen in live runs.

/**
 * What Cairn's own runs add to the engine's input: lines paid by a transfer (as payments of the
 * line) and lines frozen in a live run. The ledger loader can add these to its snapshot too.
 */
export async function runPaymentsForSnapshot(tx: Tx, { studyId, siteIds }: { studyId: string; siteIds: readonly string[] }) {
  const live = siteIds.length
    ? await tx
        .select({ lineKey: paymentRunLines.lineKey, state: paymentRunLines.state, amountMinor: paymentRunLines.amountMinor, paidAt: paymentTransfers.paidAt, timeZone: sites.timeZone })
        .from(paymentRunLines)
        .innerJoin(sites, eq(sites.id, paymentRunLines.siteId))
        .leftJoin(paymentTransfers, eq(paymentTransfers.id, paymentRunLines.transferId))
        .where(and(eq(paymentRunLines.studyId, studyId), inArray(paymentRunLines.siteId, [...siteIds]), inArray(paymentRunLines.state, ["in_run", "sent", "paid"])))
    : [];
  return {
    payments: live.filter((l) => l.state === "paid").map((l) => ({ lineKey: l.lineKey, amountMinor: l.amountMinor, paidOn: localDate((l.paidAt ?? new Date()).toISOString(), l.timeZone) })),
    inPaymentRun: live.filter((l) => l.state !== "paid").map((l) => l.lineKey),
  };
}

export async function loadPaymentSchedule(tx: Tx, { studyId, siteIds, asOf }: { studyId: string; siteIds: "all" | string[]; asOf: string }) {
  const loaded = await loadScheduleSnapshot(tx, { studyId, siteIds, asOf });
  const runs = await runPaymentsForSnapshot(tx, { studyId, siteIds: loaded.sites.map((s) => s.id) });
  const snapshot = { ...loaded.snapshot, payments: [...(loaded.snapshot.payments ?? []), ...runs.payments], inPaymentRun: runs.inPaymentRun };
  const schedule: PaymentSchedule = computePaymentSchedule(snapshot);
  return { ...loaded, schedule };
}

export interface DueLine {
  key: string;
  siteId: string;
  currency: string;
  kind: string;
  description: string;
  serviceDate: string;
  dueDate: string;
  cycle: string;
  amountMinor: bigint;
  overdue: boolean;
}

function describeLine(l: EarnedLine): string {
  const s = l.source;
  if (s.description) return s.description;
  const who = s.subjectCode ? ` ${s.subjectCode}` : "";
  switch (l.kind) {
    case "visit":
      return `Visit ${s.visitCode ?? ""}${who}`.trim();
    case "milestone":
      return `Milestone ${s.milestone?.replaceAll("_", " ") ?? ""}${s.n ? ` (${s.n})` : ""}`.trim();
    case "startup":
      return "Start-up fee";
    case "screen_failure":
      return `Screen failure${who}`;
    case "pass_through":
      return "Pass-through cost";
    case "holdback_release":
      return "Holdback release";
  }
}

export function toDueLine(l: EarnedLine): DueLine {
  return {
    key: l.key,
    siteId: l.siteId,
    currency: l.currency,
    kind: l.kind,
    description: describeLine(l),
    serviceDate: l.serviceDate,
    dueDate: l.dueDate,
    cycle: l.cycle.label,
    amountMinor: l.outstandingMinor,
    overdue: l.state === "overdue",
  };
}

/** Lines with something left to pay that are in no live run, filtered by cycle, site and currency. */
export async function listDueLines(
  tx: Tx,
  { studyId, siteIds, asOf, cycle, currency }: { studyId: string; siteIds: "all" | string[]; asOf: string; cycle?: string | null; currency?: string | null },
): Promise<{ lines: DueLine[]; cycles: string[] }> {
  const { schedule } = await loadPaymentSchedule(tx, { studyId, siteIds, asOf });
  const payable = schedule.lines.filter((l) => l.outstandingMinor > 0n && !l.inPaymentRun && (l.state === "outstanding" || l.state === "overdue"));
  const cycles = [...new Set(payable.map((l) => l.cycle.label))].sort();
  const lines = payable.filter((l) => (!cycle || l.cycle.label === cycle) && (!currency || l.currency === currency)).map(toDueLine);
  return { lines, cycles };
}
