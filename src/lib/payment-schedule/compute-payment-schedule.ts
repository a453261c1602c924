import { isSupportedCurrency } from "@/lib/money";
import { localDate } from "./calendar";
import { MoneySum } from "./money-sum";
import { PaymentIndex } from "./payment-index";
import { buildSiteLines, CycleBook, type SiteInput } from "./earned-lines";
import type { ScheduleLine } from "./line";
import { PriceBook } from "./pricing";
import { computeProjection } from "./projection";
import type {
  CurrencyTotals,
  CycleSummary,
  EarnedLine,
  HoldbackLedger,
  PaymentSchedule,
  PendingEvent,
  SiteTotals,
  Totals,
  UnmatchedPayment,
} from "./result";
import type { PaymentScheduleSnapshot, RecordedVisit, Subject } from "./snapshot";

function emptyTotals(currency: string): Totals {
  return {
    currency,
    grossMinor: 0n,
    overheadMinor: 0n,
    holdbackMinor: 0n,
    netMinor: 0n,
    earnedMinor: 0n,
    holdbackWithheldMinor: 0n,
    holdbackReleasedMinor: 0n,
    heldBackMinor: 0n,
    paidMinor: 0n,
    outstandingMinor: 0n,
    overdueMinor: 0n,
    unappliedMinor: 0n,
    lineCount: 0,
  };
}

function addTotals(into: Totals, from: Totals): void {
  into.grossMinor += from.grossMinor;
  into.overheadMinor += from.overheadMinor;
  into.holdbackMinor += from.holdbackMinor;
  into.netMinor += from.netMinor;
  into.earnedMinor += from.earnedMinor;
  into.holdbackWithheldMinor += from.holdbackWithheldMinor;
  into.holdbackReleasedMinor += from.holdbackReleasedMinor;
  into.heldBackMinor += from.heldBackMinor;
  into.paidMinor += from.paidMinor;
  into.outstandingMinor += from.outstandingMinor;
  into.overdueMinor += from.overdueMinor;
  into.unappliedMinor += from.unappliedMinor;
  into.lineCount += from.lineCount;
}

type CycleAcc = { period: EarnedLine["cycle"]; dueDate: string; lineCount: number; gross: MoneySum; overhead: MoneySum; holdback: MoneySum; net: MoneySum; paid: MoneySum; outstanding: MoneySum; overdue: MoneySum };

/**
 * Adds a site's lines up by cycle, with what each has paid clamped to its net as the line itself
 * reads it, and marks the lines in a live payment run; the site's totals are the sums of its cycles'
 * (exact integer sums, so the order of the lines does not matter).
 */
class SiteAccumulator {
  readonly cycles = new Map<EarnedLine["cycle"], Map<string, CycleAcc>>();
  readonly ledgerByCycle = new Map<string, { label: string; withheld: MoneySum; released: MoneySum }>();
  readonly unapplied = new MoneySum();
  readonly withheld = new MoneySum();
  readonly released = new MoneySum();
  releaseLineKey: string | null = null;
  private lastCycle: CycleAcc | null = null;

  constructor(private readonly inRun: ReadonlySet<string>) {}

  add(l: ScheduleLine): void {
    if (this.inRun.size > 0 && this.inRun.has(l.key)) l.markInPaymentRun();
    const a = l.amounts;
    // Paid (clamped to the net), outstanding and unapplied: as numbers when exact (the usual case,
    // no bigint made or read per line), else as bigints.
    const total = l.paidTotal;
    let paid: bigint | null = null;
    let outstanding: bigint | null = null;
    let p: number;
    let out: number;
    if (typeof total === "number" && Number.isSafeInteger(a.net)) {
      p = total > a.net ? a.net : total;
      out = a.net - p;
      if (total > p) this.unapplied.add(null, total - p);
    } else {
      paid = l.paidMinor;
      outstanding = l.outstandingMinor;
      p = Number(paid);
      out = Number(outstanding);
      const unapplied = l.unappliedMinor;
      if (unapplied !== 0n) this.unapplied.add(unapplied);
    }
    const overdue = out > 0 && l.pastDue;

    if (a.holdbackMinor < 0n) {
      this.released.add(-a.holdbackMinor);
      this.releaseLineKey = l.key;
    } else this.withheld.add(a.holdbackMinor, a.holdback);

    // Lines mostly follow a line of the same cycle (sorted by trigger date, or a subject's visits).
    const period = l.cycle;
    const dueDate = l.dueDate;
    let c: CycleAcc | undefined = this.lastCycle !== null && this.lastCycle.period === period && this.lastCycle.dueDate === dueDate ? this.lastCycle : undefined;
    if (!c) {
      let byDue = this.cycles.get(period);
      if (!byDue) {
        byDue = new Map();
        this.cycles.set(period, byDue);
      }
      c = byDue.get(dueDate);
      if (!c) {
        c = { period, dueDate, lineCount: 0, gross: new MoneySum(), overhead: new MoneySum(), holdback: new MoneySum(), net: new MoneySum(), paid: new MoneySum(), outstanding: new MoneySum(), overdue: new MoneySum() };
        byDue.set(dueDate, c);
      }
      this.lastCycle = c;
    }
    c.lineCount++;
    c.gross.add(a.grossMinor, a.gross);
    c.overhead.add(a.overheadMinor, a.overhead);
    c.holdback.add(a.holdbackMinor, a.holdback);
    c.net.add(a.netMinor, a.net);
    c.paid.add(paid, p);
    c.outstanding.add(outstanding, out);
    if (overdue) c.overdue.add(outstanding, out);

    if (a.holdbackMinor !== 0n) {
      let hb = this.ledgerByCycle.get(period.label);
      if (!hb) {
        hb = { label: period.label, withheld: new MoneySum(), released: new MoneySum() };
        this.ledgerByCycle.set(period.label, hb);
      }
      if (a.holdbackMinor > 0n) hb.withheld.add(a.holdbackMinor, a.holdback);
      else hb.released.add(-a.holdbackMinor);
    }
  }
}

/** Each site's budget versions, subjects, visits and invoices, in input order; strays go to pending. */
function indexSnapshot(snapshot: PaymentScheduleSnapshot, pending: PendingEvent[]): Map<string, SiteInput> {
  const sites = snapshot.sites;
  const siteInputs = new Map<string, SiteInput>();
  for (const site of sites) {
    if (!isSupportedCurrency(site.currency)) throw new Error(`Site ${site.code}: currency ${site.currency} is not supported`);
    if (siteInputs.has(site.id)) throw new Error(`Site ${site.id} appears twice in the snapshot`);
    siteInputs.set(site.id, { site, asOf: localDate(snapshot.asOf, site.timeZone), versions: [], subjects: [], visits: [], visitSubjects: [], invoices: [] });
  }
  for (const v of snapshot.budgetVersions) siteInputs.get(v.siteId)?.versions.push(v);
  for (const input of siteInputs.values()) {
    input.versions.sort((a, b) => (a.effectiveFrom < b.effectiveFrom ? -1 : a.effectiveFrom > b.effectiveFrom ? 1 : a.versionNumber - b.versionNumber));
  }
  const subjectById = new Map<string, { subject: Subject; input: SiteInput }>();
  // Indexed loops over the large arrays: this runs once per computation, often before the optimiser
  // has compiled it, and an unoptimised for…of allocates a result object per element.
  const subjects = snapshot.subjects;
  for (let i = 0; i < subjects.length; i++) {
    const s = subjects[i] as Subject;
    const input = siteInputs.get(s.siteId);
    if (!input) {
      pending.push({ key: `subject:${s.id}`, siteId: s.siteId, serviceDate: s.screenedOn, reason: "unknown_site", detail: `Subject ${s.code} belongs to no site in the snapshot` });
      continue;
    }
    input.subjects.push(s);
    subjectById.set(s.id, { subject: s, input });
  }
  // A subject's visits usually come one after another: the previous lookup is reused.
  let lastSubjectId: string | null = null;
  let lastFound: { subject: Subject; input: SiteInput } | undefined;
  const visits = snapshot.visits;
  for (let i = 0; i < visits.length; i++) {
    const v = visits[i] as RecordedVisit;
    const found = v.subjectId === lastSubjectId ? lastFound : subjectById.get(v.subjectId);
    lastSubjectId = v.subjectId;
    lastFound = found;
    if (!found) {
      pending.push({ key: `visit:${v.id}`, siteId: "", serviceDate: v.serviceDate, reason: "unknown_subject", detail: `Visit ${v.id} belongs to no subject in the snapshot` });
      continue;
    }
    found.input.visits.push(v);
    found.input.visitSubjects.push(found.subject);
  }
  for (const inv of snapshot.passThroughInvoices ?? []) siteInputs.get(inv.siteId)?.invoices.push(inv);
  return siteInputs;
}

/** The study-wide lookups every site's lines use. */
interface Books {
  prices: PriceBook;
  cycles: CycleBook;
  payments: PaymentIndex;
  inRun: ReadonlySet<string>;
}

/**
 * One site's lines, settled and added up by cycle; the site's totals are the sums of its cycles'
 * (exact integer sums, so the order of the lines does not matter). Lines are appended to `lines`
 * unless it is null (totals only).
 */
function settleSite(input: SiteInput, books: Books, lines: ScheduleLine[] | null, pending: PendingEvent[]): { cycles: CycleSummary[]; totals: SiteTotals; ledger: HoldbackLedger } {
  const { site, asOf } = input;
  const { prices, cycles, inRun } = books;
  const payments = books.payments.forSite(site.id);
  const cycleSummaries: CycleSummary[] = [];
  const acc = new SiteAccumulator(inRun);
  // The sums do not depend on the order of the lines: without lines, each is added up as it is built.
  if (lines !== null) {
    const built = buildSiteLines(input, prices, cycles, payments, pending);
    for (let i = 0; i < built.length; i++) {
      const l = built[i] as ScheduleLine;
      acc.add(l);
      lines.push(l);
    }
  } else buildSiteLines(input, prices, cycles, payments, pending, (l) => acc.add(l), false);

  const accs = [...acc.cycles.values()].flatMap((m) => [...m.values()]);
  // By cycle start, due date, then label (a month and a quarter may share both).
  accs.sort((a, b) =>
    a.period.start < b.period.start ? -1 : a.period.start > b.period.start ? 1 : a.dueDate < b.dueDate ? -1 : a.dueDate > b.dueDate ? 1 : a.period.label < b.period.label ? -1 : a.period.label > b.period.label ? 1 : 0,
  );
  const sums = { gross: new MoneySum(), overhead: new MoneySum(), holdback: new MoneySum(), net: new MoneySum(), paid: new MoneySum(), outstanding: new MoneySum(), overdue: new MoneySum() };
  let lineCount = 0;
  for (const c of accs) {
    const summary: CycleSummary = {
      siteId: site.id,
      currency: site.currency,
      cycle: c.period,
      dueDate: c.dueDate,
      lineCount: c.lineCount,
      grossMinor: c.gross.value,
      overheadMinor: c.overhead.value,
      holdbackMinor: c.holdback.value,
      netMinor: c.net.value,
      paidMinor: c.paid.value,
      outstandingMinor: c.outstanding.value,
      overdueMinor: c.overdue.value,
    };
    cycleSummaries.push(summary);
    lineCount += c.lineCount;
    sums.gross.add(summary.grossMinor);
    sums.overhead.add(summary.overheadMinor);
    sums.holdback.add(summary.holdbackMinor);
    sums.net.add(summary.netMinor);
    sums.paid.add(summary.paidMinor);
    sums.outstanding.add(summary.outstandingMinor);
    sums.overdue.add(summary.overdueMinor);
  }
  const withheld = acc.withheld.value;
  const released = acc.released.value;
  const totals: SiteTotals = {
    siteId: site.id,
    asOf,
    currency: site.currency,
    grossMinor: sums.gross.value,
    overheadMinor: sums.overhead.value,
    holdbackMinor: sums.holdback.value,
    netMinor: sums.net.value,
    earnedMinor: sums.gross.value + sums.overhead.value,
    holdbackWithheldMinor: withheld,
    holdbackReleasedMinor: released,
    heldBackMinor: withheld - released,
    paidMinor: sums.paid.value,
    outstandingMinor: sums.outstanding.value,
    overdueMinor: sums.overdue.value,
    unappliedMinor: acc.unapplied.value,
    lineCount,
  };
  const ledger: HoldbackLedger = { siteId: site.id, currency: site.currency, withheldMinor: withheld, releasedMinor: released, balanceMinor: withheld - released, releaseLineKey: acc.releaseLineKey, byCycle: [] };
  let running = 0n;
  for (const h of [...acc.ledgerByCycle.values()].sort((a, b) => (a.label < b.label ? -1 : a.label > b.label ? 1 : 0))) {
    const w = h.withheld.value;
    const r = h.released.value;
    running += w - r;
    ledger.byCycle.push({ label: h.label, withheldMinor: w, releasedMinor: r, balanceMinor: running });
  }
  return { cycles: cycleSummaries, totals, ledger };
}

export interface ComputeOptions {
  /**
   * false: totals only — `lines` comes back empty and no line is kept or sorted (every total, cycle,
   * holdback ledger, pending event and unmatched payment is the same as with the lines).
   */
  lines?: boolean;
}

/**
 * The payment schedule of one site or a whole study: a pure, deterministic function of its snapshot
 * (no clock, no I/O). Lines come out by site (input order), then trigger date, then key.
 *
 * Payments: every payment dated on or before the site's asOf is applied to the line its key names, up to
 * the line's net; a partial payment leaves the line outstanding (or overdue) with `partiallyPaid`,
 * and anything paid beyond the net is `unapplied` (shown, not counted as paid), so that for every
 * line, site and currency: earned (gross + overhead) = paid + outstanding + held back.
 */
export function computePaymentSchedule(snapshot: PaymentScheduleSnapshot, options: ComputeOptions = {}): PaymentSchedule {
  const keepLines = options.lines !== false;
  const pending: PendingEvent[] = [];
  const siteInputs = indexSnapshot(snapshot, pending);

  const books: Books = { prices: new PriceBook(), cycles: new CycleBook(), payments: new PaymentIndex(snapshot.payments ?? [], [...siteInputs.keys()]), inRun: new Set(snapshot.inPaymentRun ?? []) };
  const lines: ScheduleLine[] = [];

  // Sites one after the other (pending events come out in site order).
  const cycleSummaries: CycleSummary[] = [];
  const siteTotals: SiteTotals[] = [];
  const holdback: HoldbackLedger[] = [];
  const currencyTotals = new Map<string, CurrencyTotals>();
  for (const input of siteInputs.values()) {
    const site = settleSite(input, books, keepLines ? lines : null, pending);
    for (const c of site.cycles) cycleSummaries.push(c);
    siteTotals.push(site.totals);
    holdback.push(site.ledger);
    // Amounts in different currencies are never added together.
    let ct = currencyTotals.get(site.totals.currency);
    if (!ct) {
      ct = { ...emptyTotals(site.totals.currency), siteCount: 0 };
      currencyTotals.set(site.totals.currency, ct);
    }
    addTotals(ct, site.totals);
    ct.siteCount++;
  }

  const unmatchedPayments: UnmatchedPayment[] = books.payments.unmatched().map(({ payment: p, reason }) => ({ siteId: p.siteId, lineKey: p.lineKey, amountMinor: p.amountMinor, paidOn: p.paidOn, reason }));

  return {
    asOf: snapshot.asOf,
    lines,
    cycles: cycleSummaries,
    sites: siteTotals,
    currencies: [...currencyTotals.values()].sort((a, b) => (a.currency < b.currency ? -1 : a.currency > b.currency ? 1 : 0)),
    holdback,
    pending,
    unmatchedPayments,
    projection: snapshot.projection ? computeProjection(snapshot, [...siteInputs.values()]) : null,
  };
}
