import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { paymentRunLines } from "@/server/db/schema";
import { loadScheduleSnapshot } from "@/server/ledger/load-snapshot";
import { computePaymentSchedule, type EarnedLine, type PaymentSchedule } from "@/lib/payment-schedule";

// The schedule as payments see it: the ledger's snapshot, plus what Cairn's own runs have paid
// (lines paid by a transfer count as payments of the line) and the lines frozen in live runs.

/**
 * Lines frozen in a live run and not yet paid: the engine marks them "in a payment run". Paid run
 * lines need nothing here: they are recorded in payments_recorded, which every loader reads.
 */
export async function linesInLiveRuns(tx: Tx, { studyId, siteIds }: { studyId: string; siteIds: readonly string[] }): Promise<string[]> {
  if (siteIds.length === 0) return [];
  const rows = await tx
    .select({ lineKey: paymentRunLines.lineKey })
    .from(paymentRunLines)
    .where(and(eq(paymentRunLines.studyId, studyId), inArray(paymentRunLines.siteId, [...siteIds]), inArray(paymentRunLines.state, ["in_run", "sent"])));
  return rows.map((r) => r.lineKey);
}

export async function loadPaymentSchedule(tx: Tx, { studyId, siteIds, asOf }: { studyId: string; siteIds: "all" | string[]; asOf: string }) {
  const loaded = await loadScheduleSnapshot(tx, { studyId, siteIds, asOf });
  const inPaymentRun = await linesInLiveRuns(tx, { studyId, siteIds: loaded.sites.map((s) => s.id) });
  const schedule: PaymentSchedule = computePaymentSchedule({ ...loaded.snapshot, inPaymentRun });
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
