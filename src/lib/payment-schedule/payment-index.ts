import type { ScheduleLine } from "./line";
import type { Payment } from "./snapshot";

const VISIT_PREFIX = "visit:";

/**
 * Payments chained by line key (latest first) so each line finds its own. Visit lines are found by
 * visit id rather than by their full key: the key is a freshly built string per line, and hashing
 * 150,000 of them was the engine's largest single cost.
 */
export class PaymentIndex {
  private readonly byKey = new Map<string, number>();
  private readonly byVisitId = new Map<string, number>();
  private readonly next: Int32Array;
  /** 0 unmatched, 1 applied, 2 dated after the site's asOf. */
  private readonly state: Uint8Array;

  constructor(private readonly payments: readonly Payment[]) {
    this.next = new Int32Array(payments.length).fill(-1);
    this.state = new Uint8Array(payments.length);
    for (let i = 0; i < payments.length; i++) {
      const key = (payments[i] as Payment).lineKey;
      const isVisit = key.startsWith(VISIT_PREFIX);
      const index = isVisit ? this.byVisitId : this.byKey;
      const k = isVisit ? key.slice(VISIT_PREFIX.length) : key;
      const first = index.get(k);
      if (first !== undefined) this.next[i] = first;
      index.set(k, i);
    }
  }

  /**
   * Add the payments dated on or before asOf to the line, found by its key or, for a visit line, by
   * its visit id (paid may exceed net: the line clamps it).
   */
  applyTo(line: ScheduleLine, key: string | null, visitId: string | null, asOf: string): void {
    if (this.payments.length === 0) return;
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

  /** Payments that reached no line, in input order. */
  unmatched(): { payment: Payment; reason: "no_such_line" | "after_as_of" }[] {
    const out: { payment: Payment; reason: "no_such_line" | "after_as_of" }[] = [];
    for (let i = 0; i < this.payments.length; i++) {
      if (this.state[i] !== 1) out.push({ payment: this.payments[i] as Payment, reason: this.state[i] === 2 ? "after_as_of" : "no_such_line" });
    }
    return out;
  }
}
