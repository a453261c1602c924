import { dayNumber } from "@/lib/payment-schedule/calendar";

// The reconciliation both sides see, one row per site and currency: what was earned, what is in a
// run, sent, paid, confirmed by the site, queried and failed; what the site's confirmations differ
// from what was paid; and how long paid payments have waited for a confirmation.

export interface ReconEarnedLine {
  siteId: string;
  currency: string;
  /** What the site is owed for the line (net of holdback). */
  netMinor: bigint;
}

export interface ReconTransfer {
  id: string;
  siteId: string;
  currency: string;
  amountMinor: bigint;
  state: "queued" | "sending" | "sent" | "paid" | "failed" | "reversed";
  /** Site-local date Stripe confirmed the payment. */
  paidOn: string | null;
  confirmation: { amountMinor: bigint; receivedOn: string } | null;
  openQueries: number;
  /** A failed or reversed transfer whose lines are already in a new run: no longer counted as failed. */
  resent?: boolean;
}

export interface ReconQuery {
  siteId: string;
  currency: string;
  state: "open" | "answered" | "resolved";
  /** The amount the query is about (its line or its payment), 0 when it is general. */
  amountMinor: bigint;
}

export interface ReconRow {
  siteId: string;
  currency: string;
  earnedMinor: bigint;
  /** Lines frozen in a run not yet sent (prepared, approved, queued). */
  inRunMinor: bigint;
  /** Sent to Stripe, not yet confirmed paid by its event. */
  sentMinor: bigint;
  paidMinor: bigint;
  confirmedMinor: bigint;
  queriedMinor: bigint;
  failedMinor: bigint;
  /** Earned and not in a run, sent or paid. */
  notYetPaidMinor: bigint;
  /** Recorded as paid outside Cairn's runs. */
  paidElsewhereMinor: bigint;
  /** Paid and not yet confirmed by the site. */
  awaitingConfirmationMinor: bigint;
  /** Σ (confirmed − paid) over confirmed payments: not zero means the bank shows something else. */
  differenceMinor: bigint;
  aging: AgingBuckets;
}

export const agingBuckets = ["0–30 days", "31–60 days", "61–90 days", "over 90 days"] as const;
export type AgingBuckets = Record<(typeof agingBuckets)[number], { count: number; amountMinor: bigint }>;

const emptyAging = (): AgingBuckets => ({
  "0–30 days": { count: 0, amountMinor: 0n },
  "31–60 days": { count: 0, amountMinor: 0n },
  "61–90 days": { count: 0, amountMinor: 0n },
  "over 90 days": { count: 0, amountMinor: 0n },
});

export function agingBucketOf(days: number): (typeof agingBuckets)[number] {
  if (days <= 30) return "0–30 days";
  if (days <= 60) return "31–60 days";
  if (days <= 90) return "61–90 days";
  return "over 90 days";
}

export interface ReconInput {
  /** Local date per site ("YYYY-MM-DD") for aging. */
  todayBySite: Map<string, string>;
  earned: readonly ReconEarnedLine[];
  /** Lines of runs whose transfer is not created yet (run prepared or approved, transfer queued). */
  inRun: readonly { siteId: string; currency: string; amountMinor: bigint }[];
  transfers: readonly ReconTransfer[];
  queries: readonly ReconQuery[];
  /** Payments recorded outside Cairn's runs (entered by hand before runs existed). */
  paidElsewhere?: readonly { siteId: string; currency: string; amountMinor: bigint }[];
}

export function reconcile(input: ReconInput): ReconRow[] {
  const rows = new Map<string, ReconRow>();
  const row = (siteId: string, currency: string) => {
    const k = `${siteId}|${currency}`;
    let r = rows.get(k);
    if (!r) {
      r = {
        siteId,
        currency,
        earnedMinor: 0n,
        inRunMinor: 0n,
        sentMinor: 0n,
        paidMinor: 0n,
        confirmedMinor: 0n,
        queriedMinor: 0n,
        failedMinor: 0n,
        notYetPaidMinor: 0n,
        paidElsewhereMinor: 0n,
        awaitingConfirmationMinor: 0n,
        differenceMinor: 0n,
        aging: emptyAging(),
      };
      rows.set(k, r);
    }
    return r;
  };
  for (const l of input.earned) row(l.siteId, l.currency).earnedMinor += l.netMinor;
  for (const l of input.inRun) row(l.siteId, l.currency).inRunMinor += l.amountMinor;
  for (const t of input.transfers) {
    const r = row(t.siteId, t.currency);
    if (t.state === "queued" || t.state === "sending") r.inRunMinor += t.amountMinor;
    else if (t.state === "sent") r.sentMinor += t.amountMinor;
    else if (t.state === "paid") {
      r.paidMinor += t.amountMinor;
      if (t.confirmation) {
        r.confirmedMinor += t.confirmation.amountMinor;
        r.differenceMinor += t.confirmation.amountMinor - t.amountMinor;
      } else {
        r.awaitingConfirmationMinor += t.amountMinor;
        const today = input.todayBySite.get(t.siteId);
        if (today && t.paidOn) {
          const b = agingBucketOf(dayNumber(today) - dayNumber(t.paidOn));
          r.aging[b].count += 1;
          r.aging[b].amountMinor += t.amountMinor;
        }
      }
    } else if (!t.resent) r.failedMinor += t.amountMinor;
  }
  for (const p of input.paidElsewhere ?? []) row(p.siteId, p.currency).paidElsewhereMinor += p.amountMinor;
  for (const q of input.queries) if (q.state !== "resolved") row(q.siteId, q.currency).queriedMinor += q.amountMinor;
  for (const r of rows.values()) r.notYetPaidMinor = r.earnedMinor - r.inRunMinor - r.sentMinor - r.paidMinor - r.paidElsewhereMinor;
  return [...rows.values()].sort((a, b) => (a.siteId === b.siteId ? a.currency.localeCompare(b.currency) : a.siteId.localeCompare(b.siteId)));
}

/** Study-wide totals per currency (amounts in different currencies are never added together). */
export function totalsByCurrency(rows: readonly ReconRow[]): ReconRow[] {
  const out = new Map<string, ReconRow>();
  for (const r of rows) {
    const t = out.get(r.currency);
    if (!t) {
      out.set(r.currency, { ...r, siteId: "", aging: structuredClone(r.aging) });
      continue;
    }
    for (const k of ["earnedMinor", "inRunMinor", "sentMinor", "paidMinor", "confirmedMinor", "queriedMinor", "failedMinor", "notYetPaidMinor", "paidElsewhereMinor", "awaitingConfirmationMinor", "differenceMinor"] as const) t[k] += r[k];
    for (const b of agingBuckets) {
      t.aging[b].count += r.aging[b].count;
      t.aging[b].amountMinor += r.aging[b].amountMinor;
    }
  }
  return [...out.values()].sort((a, b) => a.currency.localeCompare(b.currency));
}
