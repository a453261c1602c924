import { dateOrdinal } from "./calendar";
import type { ScheduleLine } from "./line";
import type { Payment } from "./snapshot";

const VISIT_PREFIX = "visit:";

/** One site's payments, in the order they came: compact arrays read while the site is settled. */
interface SiteBucket {
  /** Latest payment (local number) by visit id, for visit lines; by full key for the others. */
  byVisitId: Map<string, number>;
  byKey: Map<string, number>;
  /** The previous payment with the same key, or −1. */
  next: Int32Array;
  /** Payment date as yyyymmdd. */
  day: Int32Array;
  /** The amount as a number, NaN when it is not a safe integer (the bigint is then read). */
  amount: Float64Array;
  /** Position in the snapshot's payments. */
  position: Int32Array;
  /** 0 unmatched, 1 applied, 2 dated after the site's asOf. */
  state: Uint8Array;
  size: number;
}

/**
 * The study's payments, grouped by the site they were made to: a payment settles the line its key
 * names at its own site, never a line of another site.
 *
 * Built in two passes in input order — the order the loader allocated the objects in, so memory is
 * read front to back — into small per-site tables and typed arrays. Settling a site then reads only
 * those, still in the processor's cache, instead of chasing each payment's objects across the heap.
 */
export class PaymentIndex {
  private readonly buckets = new Map<string, SiteBucket>();

  constructor(
    private readonly payments: readonly Payment[],
    siteIds: readonly string[],
  ) {
    // Pass 1: each payment's site, and the count per site. The snapshot's own site ids are the
    // map's keys (compared against, they stay in the cache); payments usually come site by site.
    const siteNumber = new Map<string, number>();
    for (const id of siteIds) siteNumber.set(id, siteNumber.size);
    const siteOf = new Int32Array(payments.length);
    const counts: number[] = siteIds.map(() => 0);
    let lastSite: string | null = null;
    let n = -1;
    for (let i = 0; i < payments.length; i++) {
      const id = (payments[i] as Payment).siteId;
      if (id !== lastSite) {
        let found = siteNumber.get(id);
        if (found === undefined) {
          found = siteNumber.size;
          siteNumber.set(id, found);
          counts.push(0);
        }
        n = found;
        lastSite = id;
      }
      siteOf[i] = n;
      counts[n] = (counts[n] as number) + 1;
    }
    const bySite: SiteBucket[] = [];
    for (const [id, k] of siteNumber) {
      const size = counts[k] as number;
      const b: SiteBucket = { byVisitId: new Map(), byKey: new Map(), next: new Int32Array(size), day: new Int32Array(size), amount: new Float64Array(size), position: new Int32Array(size), state: new Uint8Array(size), size: 0 };
      bySite.push(b);
      this.buckets.set(id, b);
    }
    // Pass 2: the arrays and the key tables.
    for (let i = 0; i < payments.length; i++) {
      const p = payments[i] as Payment;
      const b = bySite[siteOf[i] as number] as SiteBucket;
      const local = b.size++;
      b.position[local] = i;
      b.day[local] = dateOrdinal(p.paidOn);
      const amount = Number(p.amountMinor);
      b.amount[local] = Number.isSafeInteger(amount) ? amount : Number.NaN;
      const key = p.lineKey;
      const isVisit = key.startsWith(VISIT_PREFIX);
      const index = isVisit ? b.byVisitId : b.byKey;
      const k = isVisit ? key.slice(VISIT_PREFIX.length) : key;
      const first = index.get(k);
      b.next[local] = first === undefined ? -1 : first;
      index.set(k, local);
    }
  }

  /** The payments of one site. */
  forSite(siteId: string): SitePayments {
    return new SitePayments(this.payments, this.buckets.get(siteId) ?? EMPTY);
  }

  /** Payments that reached no line, in input order. */
  unmatched(): { payment: Payment; reason: "no_such_line" | "after_as_of" }[] {
    const out: { position: number; reason: "no_such_line" | "after_as_of" }[] = [];
    for (const b of this.buckets.values()) {
      for (let j = 0; j < b.size; j++) {
        const s = b.state[j] as number;
        if (s !== 1) out.push({ position: b.position[j] as number, reason: s === 2 ? "after_as_of" : "no_such_line" });
      }
    }
    out.sort((a, b) => a.position - b.position);
    return out.map((u) => ({ payment: this.payments[u.position] as Payment, reason: u.reason }));
  }
}

const EMPTY: SiteBucket = { byVisitId: new Map(), byKey: new Map(), next: new Int32Array(0), day: new Int32Array(0), amount: new Float64Array(0), position: new Int32Array(0), state: new Uint8Array(0), size: 0 };

/** One site's payments chained by line key (latest first), so each line finds its own. */
export class SitePayments {
  constructor(
    private readonly payments: readonly Payment[],
    private readonly b: SiteBucket,
  ) {}

  /**
   * Add the payments dated on or before the site's asOf (as yyyymmdd) to the line, found by its key
   * or, for a visit line, by its visit id (paid may exceed net: the line clamps it).
   */
  applyTo(line: ScheduleLine, key: string | null, visitId: string | null, asOfDay: number): void {
    const b = this.b;
    if (b.size === 0) return;
    const first = visitId !== null ? b.byVisitId.get(visitId) : b.byKey.get(key as string);
    for (let j = first ?? -1; j >= 0; j = b.next[j] as number) {
      const day = b.day[j] as number;
      if (day > asOfDay) {
        b.state[j] = 2;
        continue;
      }
      b.state[j] = 1;
      const amount = b.amount[j] as number;
      line.applyPayment(amount === amount ? amount : (this.payments[b.position[j] as number] as Payment).amountMinor, day);
    }
  }
}

