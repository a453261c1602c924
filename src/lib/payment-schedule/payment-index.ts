import type { ScheduleLine } from "./line";
import type { Payment } from "./snapshot";

const VISIT_PREFIX = "visit:";

/**
 * The study's payments, grouped by the site they were made to. A payment settles the line its key
 * names at its own site, never a line of another site. Each site's lookup tables are built when the
 * site is settled: a few hundred entries, looked up while still in the processor's cache (one table
 * over the whole study's payments was the engine's largest cost, every lookup a cache miss).
 */
export class PaymentIndex {
  /** Payment numbers (input order) per site. */
  private readonly bySite = new Map<string, number[]>();
  /** The previous payment with the same key at the same site, or −1. */
  private readonly next: Int32Array;
  /** 0 unmatched, 1 applied, 2 dated after the site's asOf. */
  private readonly state: Uint8Array;

  constructor(private readonly payments: readonly Payment[]) {
    this.next = new Int32Array(payments.length).fill(-1);
    this.state = new Uint8Array(payments.length);
    // Payments usually come site by site: the previous site's list is reused.
    let lastSite: string | null = null;
    let last: number[] | undefined;
    for (let i = 0; i < payments.length; i++) {
      const siteId = (payments[i] as Payment).siteId;
      if (siteId !== lastSite) {
        last = this.bySite.get(siteId);
        if (last === undefined) {
          last = [];
          this.bySite.set(siteId, last);
        }
        lastSite = siteId;
      }
      (last as number[]).push(i);
    }
  }

  /** The payments of one site, by line key and (visit lines) by visit id. */
  forSite(siteId: string): SitePayments {
    return new SitePayments(this.payments, this.bySite.get(siteId) ?? [], this.next, this.state);
  }

  /** Payments that reached no line, in input order. */
  unmatched(): { payment: Payment; reason: "no_such_line" | "after_as_of" }[] {
    const out: { payment: Payment; reason: "no_such_line" | "after_as_of" }[] = [];
    for (let i = 0; i < this.payments.length; i++) {
      if (this.state[i] !== 1) out.push({ payment: this.payments[i] as Payment, reason: this.state[i] === 2 ? "after_as_of" : "no_such_line" });
    }
    return out;
  }
}

/**
 * One site's payments chained by line key (latest first) so each line finds its own. Visit lines are
 * found by visit id rather than by their full key, which would be a freshly built string per line.
 */
export class SitePayments {
  private readonly byKey = new Map<string, number>();
  private readonly byVisitId = new Map<string, number>();

  constructor(
    private readonly payments: readonly Payment[],
    mine: readonly number[],
    private readonly next: Int32Array,
    private readonly state: Uint8Array,
  ) {
    for (let j = 0; j < mine.length; j++) {
      const i = mine[j] as number;
      const key = (payments[i] as Payment).lineKey;
      const isVisit = key.startsWith(VISIT_PREFIX);
      const index = isVisit ? this.byVisitId : this.byKey;
      const k = isVisit ? key.slice(VISIT_PREFIX.length) : key;
      const first = index.get(k);
      if (first !== undefined) next[i] = first;
      index.set(k, i);
    }
  }

  /**
   * Add the payments dated on or before asOf to the line, found by its key or, for a visit line, by
   * its visit id (paid may exceed net: the line clamps it).
   */
  applyTo(line: ScheduleLine, key: string | null, visitId: string | null, asOf: string): void {
    const first = visitId !== null ? this.byVisitId.get(visitId) : this.byKey.get(key as string);
    for (let i = first ?? -1; i >= 0; i = this.next[i] as number) {
      const p = this.payments[i] as Payment;
      if (p.paidOn > asOf) {
        this.state[i] = 2;
        continue;
      }
      this.state[i] = 1;
      line.applyPayment(p.amountMinor, p.paidOn);
    }
  }
}
