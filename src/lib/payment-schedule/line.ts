import { isoDateOfOrdinal, type CyclePeriod } from "./calendar";
import type { Amounts, EarnedLine, LineKind, LineSource, LineState } from "./result";
import type { BudgetVersion, PaymentTrigger, RecordedVisit, Site, Subject } from "./snapshot";

/** A priced fee, with its amounts also as numbers for the sums (`MoneySum` goes back to bigint past 2^53). */
export interface PricedAmounts extends Amounts {
  readonly gross: number;
  readonly overhead: number;
  readonly holdback: number;
  readonly net: number;
}

/** A cycle and the due date of its lines (one object shared by every line of the cycle). */
export interface CycleSlot {
  readonly period: CyclePeriod;
  readonly due: string;
}

/** What the lines of one site share. */
export interface SiteLineContext {
  readonly site: Site;
  /** The site's calendar date of asOf. */
  readonly asOf: string;
}

/** A line earned on something other than a visit: start-up, milestone, screen failure, invoice, release. */
export interface EventLineDraft {
  key: string;
  kind: Exclude<LineKind, "visit">;
  source: LineSource;
  serviceDate: string;
  triggerDate: string;
  version: BudgetVersion;
  amounts: PricedAmounts;
  overCap: boolean;
  cappedFeeMinor: bigint | null;
  capLiftedOn: string | null;
  capLiftedBySubjectId: string | null;
}

/**
 * An earned line as the engine returns it. A study has one line per earned visit (150,000 in the
 * benchmark), so a line keeps only references to what it was built from — the visit and its subject
 * or an event draft, the site, the budget version, the priced amounts and the cycle, all shared —
 * plus what payments add. Every field of `EarnedLine` is read through a getter; `toJSON()` gives the
 * plain object (API responses). The getters settle payments: paid is clamped to the net, the excess
 * is `unappliedMinor`, and the state follows from what is left and the due date.
 *
 * Lines are read-only to their users; they hold their snapshot's objects, so keep neither beyond a
 * request.
 */
export class ScheduleLine implements EarnedLine {
  /**
   * Sum of the payments applied (may exceed the net: see `paidMinor`, `unappliedMinor`): a number
   * while it is a safe integer (exact), a bigint beyond.
   */
  private paid: number | bigint = 0;
  /** Latest payment date as yyyymmdd, −1 when nothing was paid. */
  private lastPaidDay = -1;
  private inRun = false;

  constructor(
    private readonly ctx: SiteLineContext,
    private readonly visit: RecordedVisit | null,
    private readonly subject: Subject | null,
    private readonly draft: EventLineDraft | null,
    readonly triggerDate: string,
    private readonly version: BudgetVersion,
    /** Priced amounts of the line (shared; internal to the engine). */
    readonly amounts: PricedAmounts,
    private readonly slot: CycleSlot,
  ) {}

  static ofVisit(ctx: SiteLineContext, visit: RecordedVisit, subject: Subject, triggerDate: string, version: BudgetVersion, amounts: PricedAmounts, slot: CycleSlot): ScheduleLine {
    return new ScheduleLine(ctx, visit, subject, null, triggerDate, version, amounts, slot);
  }

  static ofEvent(ctx: SiteLineContext, draft: EventLineDraft, slot: CycleSlot): ScheduleLine {
    return new ScheduleLine(ctx, null, null, draft, draft.triggerDate, draft.version, draft.amounts, slot);
  }

  /** Adds a payment dated on or before asOf (its date as yyyymmdd). */
  applyPayment(amountMinor: number | bigint, day: number): void {
    const p = this.paid;
    if (typeof p === "number" && typeof amountMinor === "number" && Number.isSafeInteger(p + amountMinor)) this.paid = p + amountMinor;
    else this.paid = BigInt(p) + BigInt(amountMinor);
    if (day > this.lastPaidDay) this.lastPaidDay = day;
  }

  /** What was paid against the line in all, as stored (number or bigint); for the engine's sums. */
  get paidTotal(): number | bigint {
    return this.paid;
  }

  /** The due date is before the site's asOf. */
  get pastDue(): boolean {
    return this.slot.due < this.ctx.asOf;
  }

  private get paidBig(): bigint {
    return typeof this.paid === "number" ? BigInt(this.paid) : this.paid;
  }

  markInPaymentRun(): void {
    this.inRun = true;
  }

  /** Orders lines by key like comparing `key`s, without building the keys of two visit lines. */
  compareKey(other: ScheduleLine): number {
    if (this.visit !== null && other.visit !== null) {
      const a = this.visit.id;
      const b = other.visit.id;
      return a < b ? -1 : a > b ? 1 : 0;
    }
    const a = this.key;
    const b = other.key;
    return a < b ? -1 : a > b ? 1 : 0;
  }

  get key(): string {
    return this.visit !== null ? `visit:${this.visit.id}` : (this.draft as EventLineDraft).key;
  }
  get siteId(): string {
    return this.ctx.site.id;
  }
  get currency(): string {
    return this.ctx.site.currency;
  }
  get kind(): LineKind {
    return this.visit !== null ? "visit" : (this.draft as EventLineDraft).kind;
  }
  get source(): LineSource {
    if (this.visit === null) return (this.draft as EventLineDraft).source;
    const s = this.subject as Subject;
    return { event: "visit", id: this.visit.id, subjectId: s.id, subjectCode: s.code, visitCode: this.visit.visitCode };
  }
  get serviceDate(): string {
    return this.visit !== null ? this.visit.serviceDate : (this.draft as EventLineDraft).serviceDate;
  }
  get trigger(): PaymentTrigger | "event_date" {
    return this.visit !== null ? this.version.trigger : "event_date";
  }
  get budgetVersionId(): string {
    return this.version.id;
  }
  get budgetVersionNumber(): number {
    return this.version.versionNumber;
  }
  get grossMinor(): bigint {
    return this.amounts.grossMinor;
  }
  get overheadMinor(): bigint {
    return this.amounts.overheadMinor;
  }
  get holdbackMinor(): bigint {
    return this.amounts.holdbackMinor;
  }
  get netMinor(): bigint {
    return this.amounts.netMinor;
  }
  get overCap(): boolean {
    return this.draft !== null && this.draft.overCap;
  }
  get cappedFeeMinor(): bigint | null {
    return this.draft !== null ? this.draft.cappedFeeMinor : null;
  }
  get capLiftedOn(): string | null {
    return this.draft !== null ? this.draft.capLiftedOn : null;
  }
  get capLiftedBySubjectId(): string | null {
    return this.draft !== null ? this.draft.capLiftedBySubjectId : null;
  }
  get cycle(): CyclePeriod {
    return this.slot.period;
  }
  get dueDate(): string {
    return this.slot.due;
  }
  /** Paid against the line, at most its net. */
  get paidMinor(): bigint {
    const paid = this.paidBig;
    return paid > this.amounts.netMinor ? this.amounts.netMinor : paid;
  }
  get outstandingMinor(): bigint {
    const net = this.amounts.netMinor;
    const paid = this.paidBig;
    return paid >= net ? 0n : net - paid;
  }
  /** Paid beyond the net: kept apart so the reconciliation stays exact. */
  get unappliedMinor(): bigint {
    const paid = this.paidBig;
    return paid > this.amounts.netMinor ? paid - this.amounts.netMinor : 0n;
  }
  get lastPaidOn(): string | null {
    return this.lastPaidDay < 0 ? null : isoDateOfOrdinal(this.lastPaidDay);
  }
  get partiallyPaid(): boolean {
    const paid = this.paidBig;
    return paid > 0n && paid < this.amounts.netMinor;
  }
  get inPaymentRun(): boolean {
    return this.inRun;
  }
  get state(): LineState {
    if (this.amounts.netMinor === 0n && this.overCap) return "not_payable";
    if (this.paidBig >= this.amounts.netMinor) return "paid";
    return this.pastDue ? "overdue" : "outstanding";
  }

  /** The plain line (every field of `EarnedLine`, in its order): what API responses carry. */
  toJSON(): EarnedLine {
    return {
      key: this.key,
      siteId: this.siteId,
      currency: this.currency,
      kind: this.kind,
      source: this.source,
      serviceDate: this.serviceDate,
      triggerDate: this.triggerDate,
      trigger: this.trigger,
      budgetVersionId: this.budgetVersionId,
      budgetVersionNumber: this.budgetVersionNumber,
      grossMinor: this.grossMinor,
      overheadMinor: this.overheadMinor,
      holdbackMinor: this.holdbackMinor,
      netMinor: this.netMinor,
      overCap: this.overCap,
      cappedFeeMinor: this.cappedFeeMinor,
      capLiftedOn: this.capLiftedOn,
      capLiftedBySubjectId: this.capLiftedBySubjectId,
      cycle: this.cycle,
      dueDate: this.dueDate,
      paidMinor: this.paidMinor,
      outstandingMinor: this.outstandingMinor,
      unappliedMinor: this.unappliedMinor,
      lastPaidOn: this.lastPaidOn,
      partiallyPaid: this.partiallyPaid,
      inPaymentRun: this.inPaymentRun,
      state: this.state,
    };
  }
}
