import { cyclePeriodOf, dateOrdinal, dueDateOf, type CyclePeriod, type PaymentCycle } from "./calendar";
import { MoneySum } from "./money-sum";
import { ScheduleLine, type CycleSlot, type EventLineDraft, type PricedAmounts, type SiteLineContext } from "./line";
import type { SitePayments } from "./payment-index";
import { PriceBook, pricePassThrough, withNumbers } from "./pricing";
import type { PendingEvent } from "./result";
import type { BudgetVersion, MilestoneFee, PassThroughInvoice, RecordedVisit, ScreenFailureCap, Site, Subject } from "./snapshot";

/** Everything about one site the line builders need, indexed once. */
export interface SiteInput {
  site: Site;
  /** The site's calendar date of asOf. */
  asOf: string;
  /** Sorted by effectiveFrom, then versionNumber. */
  versions: BudgetVersion[];
  subjects: Subject[];
  visits: RecordedVisit[];
  /** The subject of each visit, same order as visits. */
  visitSubjects: Subject[];
  invoices: PassThroughInvoice[];
}

/** The budget version effective on a date at the site: the latest effectiveFrom on or before it. */
export function versionAt(versions: readonly BudgetVersion[], date: string): BudgetVersion | null {
  for (let i = versions.length - 1; i >= 0; i--) {
    const v = versions[i] as BudgetVersion;
    if (v.effectiveFrom <= date) return v;
  }
  return null;
}

export class CycleBook {
  private readonly periods = new Map<number, CyclePeriod>();
  private readonly dues = new Map<CyclePeriod, Map<number, string>>();
  /** Period and due date by (period key, net days) in one numeric key: one lookup per line. */
  private readonly slots = new Map<number, CycleSlot>();

  private static key(date: string, cycle: PaymentCycle): number {
    // Numeric key (year·12 + month; −(year·4 + quarter) − 1 for quarters): nothing to hash per line.
    const ordinal = dateOrdinal(date);
    const year = Math.floor(ordinal / 10_000);
    const month = Math.floor(ordinal / 100) % 100;
    return cycle === "monthly" ? year * 12 + month : -(year * 4 + Math.floor((month - 1) / 3)) - 1;
  }

  period(date: string, cycle: PaymentCycle): CyclePeriod {
    const k = CycleBook.key(date, cycle);
    let p = this.periods.get(k);
    if (!p) {
      p = cyclePeriodOf(date, cycle);
      this.periods.set(k, p);
    }
    return p;
  }

  /** The period of a date and its due date after netDays (0–365, as the snapshot schema allows). */
  slot(date: string, cycle: PaymentCycle, netDays: number): CycleSlot {
    if (!Number.isInteger(netDays) || netDays < 0 || netDays > 511) {
      const period = this.period(date, cycle);
      return { period, due: this.due(period, netDays) };
    }
    const k = CycleBook.key(date, cycle) * 512 + netDays;
    let s = this.slots.get(k);
    if (!s) {
      const period = this.period(date, cycle);
      s = { period, due: this.due(period, netDays) };
      this.slots.set(k, s);
    }
    return s;
  }

  due(period: CyclePeriod, netDays: number): string {
    let byNet = this.dues.get(period);
    if (!byNet) {
      byNet = new Map();
      this.dues.set(period, byNet);
    }
    let d = byNet.get(netDays);
    if (d === undefined) {
      d = dueDateOf(period, netDays);
      byNet.set(netDays, d);
    }
    return d;
  }
}


function paidScreenFailuresAllowed(cap: ScreenFailureCap | null | undefined, enrolled: number): number {
  if (!cap) return Infinity;
  let allowed = Infinity;
  if (cap.perEnrolled != null) allowed = Math.floor(enrolled / cap.perEnrolled);
  if (cap.maxCount != null) allowed = Math.min(allowed, cap.maxCount);
  return allowed;
}

function milestoneKey(siteId: string, m: Pick<MilestoneFee, "kind" | "n">): string {
  return m.kind === "nth_enrolled" ? `milestone:${siteId}:enrolled-${m.n}` : `milestone:${siteId}:${m.kind}`;
}

const ZERO: PricedAmounts = withNumbers({ grossMinor: 0n, overheadMinor: 0n, holdbackMinor: 0n, netMinor: 0n });

/**
 * Every line a site has earned by its asOf date, with the payments made against it added up
 * (clamping to the net and states come afterwards).
 * Rules beyond the computation rules, documented here:
 * - Visit fees are earned on the trigger of the budget version in force on the service date
 *   (service date, data-entry date or monitor-verified date; never before the service date).
 *   Start-up fee, milestones, screen failures and pass-through invoices are earned on their event date.
 * - The start-up fee is earned at site activation, priced by the version in force that day.
 * - A milestone is paid when the version in force on its date lists it, at that version's fee.
 * - Screen-failure cap: events in date order, enrolments before screen failures on the same day; a
 *   screen failure past the cap is a zero-value `overCap` line that becomes payable, at the fee of its
 *   own date's version, on the date of the enrolment that lifts the cap (cap of that day's version).
 * - Holdback applies to lines earned up to close-out; the release line (key
 *   holdback-release:<siteId>) on the close-out date pays back everything withheld; lines earned
 *   after close-out have nothing withheld. Pass-through invoices: no overhead, no holdback.
 * - Cycle and net days come from the version applied to the line; the cycle is the calendar
 *   month or quarter of the trigger date.
 */
export function buildSiteLines(
  input: SiteInput,
  prices: PriceBook,
  cycles: CycleBook,
  payments: SitePayments,
  pending: PendingEvent[],
  onLine: ((line: ScheduleLine) => void) | null = null,
  keep = true,
): ScheduleLine[] {
  // Each line goes to onLine as soon as it is built (in build order, while it is still in the cache);
  // keep = false returns no lines (totals only), so nothing of them outlives the call.
  // Added up as numbers while exact (one bigint per line would be 150,000 allocations).
  const visitWithheld = new MoneySum();
  const { site, asOf, versions } = input;
  const closedOutOn = site.closedOutOn && site.closedOutOn <= asOf ? site.closedOutOn : null;
  const withholds = (triggerDate: string) => closedOutOn === null || triggerDate <= closedOutOn;
  const ctx: SiteLineContext = { site, asOf };
  const asOfDay = dateOrdinal(asOf);
  const drafts: EventLineDraft[] = [];
  const lines: ScheduleLine[] = [];

  // Start-up fee and milestones.
  const activatedOn = site.activatedOn && site.activatedOn <= asOf ? site.activatedOn : null;
  if (activatedOn) {
    const v = versionAt(versions, activatedOn);
    if (!v) pending.push({ key: `startup:${site.id}`, siteId: site.id, serviceDate: activatedOn, reason: "no_budget_in_effect", detail: `No budget version in effect on ${activatedOn}` });
    else if (v.startupFeeMinor > 0n)
      drafts.push({
        key: `startup:${site.id}`,
        kind: "startup",
        source: { event: "site_activation", id: site.id, description: "Start-up fee" },
        serviceDate: activatedOn,
        triggerDate: activatedOn,
        version: v,
        amounts: prices.price(v, v.startupFeeMinor, withholds(activatedOn)),
        overCap: false,
        cappedFeeMinor: null,
        capLiftedOn: null,
        capLiftedBySubjectId: null,
      });
  }

  const enrolments = input.subjects
    .filter((s) => s.enrolledOn && s.enrolledOn <= asOf)
    .sort((a, b) => ((a.enrolledOn as string) < (b.enrolledOn as string) ? -1 : (a.enrolledOn as string) > (b.enrolledOn as string) ? 1 : a.code < b.code ? -1 : a.code > b.code ? 1 : 0));
  let firstImplant: string | null = null;
  for (const s of input.subjects) if (s.implantedOn && s.implantedOn <= asOf && (firstImplant === null || s.implantedOn < firstImplant)) firstImplant = s.implantedOn;

  const milestoneDefs = new Map<string, Pick<MilestoneFee, "kind" | "n">>();
  for (const v of versions) for (const m of v.milestoneFees) milestoneDefs.set(milestoneKey(site.id, m), { kind: m.kind, n: m.n ?? null });
  for (const [key, m] of milestoneDefs) {
    let date: string | null = null;
    let subject: Subject | undefined;
    if (m.kind === "site_activated") date = activatedOn;
    else if (m.kind === "close_out") date = closedOutOn;
    else if (m.kind === "first_implant") date = firstImplant;
    else if (m.n != null) {
      subject = enrolments[m.n - 1];
      date = subject?.enrolledOn ?? null;
    }
    if (!date) continue;
    const v = versionAt(versions, date);
    const fee = v?.milestoneFees.find((f) => f.kind === m.kind && (f.n ?? null) === (m.n ?? null));
    if (!v || !fee || fee.amountMinor === 0n) continue;
    drafts.push({
      key,
      kind: "milestone",
      source: {
        event: m.kind === "close_out" ? "close_out" : "milestone",
        id: subject?.id ?? site.id,
        milestone: m.kind,
        ...(m.n != null ? { n: m.n } : {}),
        ...(subject ? { subjectId: subject.id, subjectCode: subject.code } : {}),
      },
      serviceDate: date,
      triggerDate: date,
      version: v,
      amounts: prices.price(v, fee.amountMinor, withholds(date)),
      overCap: false,
      cappedFeeMinor: null,
      capLiftedOn: null,
      capLiftedBySubjectId: null,
    });
  }

  // Screen failures against the cap, in date order.
  type CapEvent = { date: string; order: number; subject: Subject };
  const capEvents: CapEvent[] = [];
  for (const s of enrolments) capEvents.push({ date: s.enrolledOn as string, order: 0, subject: s });
  for (const s of input.subjects) if (s.screenFailedOn && s.screenFailedOn <= asOf) capEvents.push({ date: s.screenFailedOn, order: 1, subject: s });
  capEvents.sort((a, b) => (a.date < b.date ? -1 : a.date > b.date ? 1 : a.order - b.order || (a.subject.code < b.subject.code ? -1 : a.subject.code > b.subject.code ? 1 : 0)));
  let enrolled = 0;
  let paidFailures = 0;
  const overCap: EventLineDraft[] = [];
  for (const e of capEvents) {
    if (e.order === 0) {
      enrolled++;
      const vE = versionAt(versions, e.date);
      // No budget in force on the enrolment date: the cap cannot be read, nothing is lifted.
      while (vE && overCap.length > 0 && paidFailures < paidScreenFailuresAllowed(vE.screenFailureCap, enrolled)) {
        const d = overCap.shift() as EventLineDraft;
        paidFailures++;
        d.overCap = false;
        d.triggerDate = e.date;
        d.capLiftedOn = e.date;
        d.capLiftedBySubjectId = e.subject.id;
        d.amounts = prices.price(d.version, d.cappedFeeMinor as bigint, withholds(e.date));
      }
      continue;
    }
    const key = `screen-failure:${e.subject.id}`;
    const v = versionAt(versions, e.date);
    if (!v) {
      pending.push({ key, siteId: site.id, serviceDate: e.date, reason: "no_budget_in_effect", detail: `No budget version in effect on ${e.date}` });
      continue;
    }
    if (v.screenFailureFeeMinor === 0n) continue;
    const draft: EventLineDraft = {
      key,
      kind: "screen_failure",
      source: { event: "screen_failure", id: e.subject.id, subjectId: e.subject.id, subjectCode: e.subject.code },
      serviceDate: e.date,
      triggerDate: e.date,
      version: v,
      amounts: ZERO,
      overCap: true,
      cappedFeeMinor: v.screenFailureFeeMinor,
      capLiftedOn: null,
      capLiftedBySubjectId: null,
    };
    if (paidFailures < paidScreenFailuresAllowed(v.screenFailureCap, enrolled)) {
      paidFailures++;
      draft.overCap = false;
      draft.amounts = prices.price(v, v.screenFailureFeeMinor, withholds(e.date));
    } else overCap.push(draft);
    drafts.push(draft);
  }

  // Visits.
  // (A visit's key is built only where it is needed: one string per visit adds up.)
  for (let vi = 0; vi < input.visits.length; vi++) {
    const visit = input.visits[vi] as RecordedVisit;
    if (visit.status !== "done") continue;
    const subject = input.visitSubjects[vi] as Subject;
    if (visit.serviceDate > asOf) {
      pending.push({ key: `visit:${visit.id}`, siteId: site.id, serviceDate: visit.serviceDate, reason: "after_as_of", detail: `Service date ${visit.serviceDate} is after ${asOf}` });
      continue;
    }
    const v = versionAt(versions, visit.serviceDate);
    if (!v) {
      pending.push({ key: `visit:${visit.id}`, siteId: site.id, serviceDate: visit.serviceDate, reason: "no_budget_in_effect", detail: `No budget version in effect on ${visit.serviceDate}` });
      continue;
    }
    const priced = prices.visit(v, visit.visitCode, true);
    if (priced === null) {
      pending.push({ key: `visit:${visit.id}`, siteId: site.id, serviceDate: visit.serviceDate, reason: "no_fee_for_visit_code", detail: `Budget version ${v.versionNumber} has no fee for visit ${visit.visitCode}` });
      continue;
    }
    if (priced.grossMinor === 0n) continue;
    let triggerDate: string | null | undefined = visit.serviceDate;
    if (v.trigger === "data_entered") triggerDate = visit.dataEnteredOn;
    else if (v.trigger === "monitor_verified") triggerDate = visit.verifiedOn;
    if (!triggerDate || triggerDate > asOf) {
      const waiting = v.trigger === "data_entered" ? "awaiting_data_entry" : "awaiting_verification";
      pending.push({ key: `visit:${visit.id}`, siteId: site.id, serviceDate: visit.serviceDate, reason: waiting, detail: `Earned once ${v.trigger === "data_entered" ? "data are entered" : "a monitor verifies the visit"}` });
      continue;
    }
    if (triggerDate < visit.serviceDate) triggerDate = visit.serviceDate;
    // Visits are the bulk of the lines: built directly, without an intermediate draft.
    const amounts = withholds(triggerDate) ? priced : (prices.visit(v, visit.visitCode, false) as PricedAmounts);
    const line = ScheduleLine.ofVisit(ctx, visit, subject, triggerDate, v, amounts, cycles.slot(triggerDate, v.cycle, v.netDays));
    payments.applyTo(line, null, visit.id, asOfDay);
    if (amounts.holdback !== 0) visitWithheld.add(amounts.holdbackMinor, amounts.holdback);
    if (onLine !== null) onLine(line);
    if (keep) lines.push(line);
  }

  // Pass-through invoices.
  for (const inv of input.invoices) {
    const key = `pass-through:${inv.id}`;
    if (inv.approvedOn > asOf) continue;
    const v = versionAt(versions, inv.approvedOn);
    if (!v) {
      pending.push({ key, siteId: site.id, serviceDate: inv.approvedOn, reason: "no_budget_in_effect", detail: `No budget version in effect on ${inv.approvedOn}` });
      continue;
    }
    drafts.push({
      key,
      kind: "pass_through",
      source: { event: "invoice", id: inv.id, description: inv.description },
      serviceDate: inv.approvedOn,
      triggerDate: inv.approvedOn,
      version: v,
      amounts: pricePassThrough(inv.amountMinor),
      overCap: false,
      cappedFeeMinor: null,
      capLiftedOn: null,
      capLiftedBySubjectId: null,
    });
  }

  // Holdback release at close-out: everything withheld so far.
  if (closedOutOn) {
    let withheld = visitWithheld.value;
    for (const d of drafts) withheld += d.amounts.holdbackMinor;
    const v = versionAt(versions, closedOutOn);
    if (v && withheld !== 0n) {
      drafts.push({
        key: `holdback-release:${site.id}`,
        kind: "holdback_release",
        source: { event: "close_out", id: site.id, description: "Release of holdback at close-out" },
        serviceDate: closedOutOn,
        triggerDate: closedOutOn,
        version: v,
        amounts: withNumbers({ grossMinor: 0n, overheadMinor: 0n, holdbackMinor: -withheld, netMinor: withheld }),
        overCap: false,
        cappedFeeMinor: null,
        capLiftedOn: null,
        capLiftedBySubjectId: null,
      });
    }
  }

  for (const d of drafts) {
    const line = ScheduleLine.ofEvent(ctx, d, cycles.slot(d.triggerDate, d.version.cycle, d.version.netDays));
    payments.applyTo(line, d.key, null, asOfDay);
    if (onLine !== null) onLine(line);
    if (keep) lines.push(line);
  }
  return keep ? sortLines(lines) : lines;
}

/**
 * A day index that keeps the order of ISO dates: year·372 + month·31 + day (not a count of days —
 * months are taken as 31 days — but monotonic and dense enough to bucket).
 */
function daySlot(iso: string): number {
  const ordinal = dateOrdinal(iso);
  return Math.floor(ordinal / 10_000) * 372 + (Math.floor(ordinal / 100) % 100) * 31 + (ordinal % 100);
}

/**
 * Lines by trigger date, then key: a counting sort on the date (a site's lines span a few years of
 * days), then the lines of one day by key.
 */
export function sortLines(lines: ScheduleLine[]): ScheduleLine[] {
  const n = lines.length;
  if (n < 2) return lines;
  const slot = new Int32Array(n);
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < n; i++) {
    const d = daySlot((lines[i] as ScheduleLine).triggerDate);
    slot[i] = d;
    if (d < min) min = d;
    if (d > max) max = d;
  }
  const span = max - min + 1;
  // Far-apart dates (not in real data; 100 years) would make the buckets wasteful: compare instead.
  if (span > 37_200) {
    const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => (slot[a] as number) - (slot[b] as number) || (lines[a] as ScheduleLine).compareKey(lines[b] as ScheduleLine));
    return order.map((i) => lines[i] as ScheduleLine);
  }
  const start = new Int32Array(span + 1);
  for (let i = 0; i < n; i++) {
    const k = (slot[i] as number) - min + 1;
    start[k] = (start[k] as number) + 1;
  }
  for (let d = 1; d <= span; d++) start[d] = (start[d] as number) + (start[d - 1] as number);
  const sorted: ScheduleLine[] = new Array(n);
  const fill = start.slice(0, span);
  for (let i = 0; i < n; i++) {
    const d = (slot[i] as number) - min;
    sorted[fill[d] as number] = lines[i] as ScheduleLine;
    fill[d] = (fill[d] as number) + 1;
  }
  // Lines of the same day, by key: an insertion sort in place (a day has a few lines).
  for (let d = 0; d < span; d++) {
    const from = start[d] as number;
    const to = start[d + 1] as number;
    for (let i = from + 1; i < to; i++) {
      const l = sorted[i] as ScheduleLine;
      let j = i - 1;
      while (j >= from && (sorted[j] as ScheduleLine).compareKey(l) > 0) {
        sorted[j + 1] = sorted[j] as ScheduleLine;
        j--;
      }
      sorted[j + 1] = l;
    }
  }
  return sorted;
}
