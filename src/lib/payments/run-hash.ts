import { createHash } from "node:crypto";
import { canonicalJson } from "@/lib/canonical-json";

// A payment run's content hash: SHA-256 of the RFC 8785 canonical JSON of its lines, so what the
// approver approved is exactly what is sent. Amounts are decimal strings (JSON has no bigint).

export interface RunHashLine {
  lineKey: string;
  siteId: string;
  currency: string;
  amountMinor: bigint;
}

export function canonicalRunContent(runId: string, lines: readonly RunHashLine[]): string {
  const sorted = [...lines]
    .map((l) => ({ lineKey: l.lineKey, siteId: l.siteId, currency: l.currency, amountMinor: l.amountMinor.toString() }))
    .sort((a, b) => (a.siteId + "\u0000" + a.lineKey < b.siteId + "\u0000" + b.lineKey ? -1 : a.siteId + "\u0000" + a.lineKey > b.siteId + "\u0000" + b.lineKey ? 1 : 0));
  return canonicalJson({ run: runId, lines: sorted });
}

export function hashRunContent(runId: string, lines: readonly RunHashLine[]): string {
  return createHash("sha256").update(canonicalRunContent(runId, lines), "utf8").digest("hex");
}

/** Transfers group lines by site and currency; the sum of a group is what is sent. */
export function groupBySiteAndCurrency<T extends RunHashLine>(lines: readonly T[]): { siteId: string; currency: string; amountMinor: bigint; lines: T[] }[] {
  const groups = new Map<string, { siteId: string; currency: string; amountMinor: bigint; lines: T[] }>();
  for (const l of lines) {
    const k = `${l.siteId}|${l.currency}`;
    const g = groups.get(k) ?? { siteId: l.siteId, currency: l.currency, amountMinor: 0n, lines: [] };
    g.amountMinor += l.amountMinor;
    g.lines.push(l);
    groups.set(k, g);
  }
  return [...groups.values()];
}

/** The idempotency key of a transfer: the run, the site and the currency, nothing that varies per try. */
export function transferIdempotencyKey(runId: string, siteId: string, currency: string): string {
  return `cairn-transfer-${runId}-${siteId}-${currency.toLowerCase()}`;
}
