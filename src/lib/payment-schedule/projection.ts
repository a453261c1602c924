import {
  band80,
  fitPoissonGamma,
  meanRateTimesPoissonPmf,
  meanRateTimesProbabilityAtLeast,
  posteriorRate,
  predictiveCount,
  probabilityAtLeast,
  rateMean,
  rateVariance,
  type RatePosterior,
  type SiteHistory,
} from "@/lib/forecast";
import { DAYS_PER_MONTH, dayNumber, daysInMonth, localDate } from "./calendar";
import { versionAt, type SiteInput } from "./earned-lines";
import { PriceBook } from "./pricing";
import type { Amounts, CurrencyProjection, ProjectionMonthFigures, Projection, SiteProjection } from "./result";
import type { PaymentScheduleSnapshot } from "./snapshot";

// Forward projection, month by month, of what sites will earn:
// 1. Calendar visits of enrolled subjects, each priced with the budget version in force on its
//    target date and counted in the month of that date (visits already past their target date
//    and not yet recorded fall in the first month). Treated as certain.
// 2. Forecast enrolment at recruiting sites (Poisson–gamma model fitted over all activated sites):
//    N-subjects-enrolled milestones, with the probability that the count is crossed in the month,
//    and the visits of the new subjects given by `newSubjectVisitPlan` (days after enrolment),
//    priced with the version in force at the month's start. Screen failures and the first-implant
//    milestone are left out. Means and variances are exact under the model (Poisson given the
//    rate, plus the rate's own variance), except that two milestones in one month are taken as
//    uncorrelated. The 80% band is that of a gamma with the forecast part's mean and variance,
//    added to the scheduled amount. Figures are estimates rounded to minor units.

interface Bucket {
  label: string;
  start: string;
  end: string;
}

interface Moments {
  scheduled: Amounts;
  scheduledVisitCount: number;
  expectedEnrolments: number;
  grossMean: number;
  netMean: number;
  netVariance: number;
}

function toMinor(x: number): bigint {
  return BigInt(Math.sign(x) * Math.floor(Math.abs(x) + 0.5));
}

function monthBuckets(firstDate: string, horizon: number): Bucket[] {
  const buckets: Bucket[] = [];
  let y = Number(firstDate.slice(0, 4));
  let m = Number(firstDate.slice(5, 7));
  for (let i = 0; i < horizon; i++) {
    const mm = String(m).padStart(2, "0");
    buckets.push({ label: `${y}-${mm}`, start: `${y}-${mm}-01`, end: `${y}-${mm}-${String(daysInMonth(y, m)).padStart(2, "0")}` });
    m++;
    if (m > 12) {
      m = 1;
      y++;
    }
  }
  return buckets;
}

function emptyMoments(): Moments {
  return { scheduled: { grossMinor: 0n, overheadMinor: 0n, holdbackMinor: 0n, netMinor: 0n }, scheduledVisitCount: 0, expectedEnrolments: 0, grossMean: 0, netMean: 0, netVariance: 0 };
}

function overlap(a0: number, a1: number, b0: number, b1: number): number {
  return Math.max(0, Math.min(a1, b1) - Math.max(a0, b0));
}

function figures(bucket: Bucket, m: Moments): ProjectionMonthFigures {
  const band = band80(m.netMean, m.netVariance);
  return {
    month: bucket.label,
    start: bucket.start,
    end: bucket.end,
    scheduledVisitCount: m.scheduledVisitCount,
    scheduled: m.scheduled,
    expectedEnrolments: m.expectedEnrolments,
    forecastGrossMinor: toMinor(m.grossMean),
    forecastNetMinor: toMinor(m.netMean),
    forecastNetSd: Math.sqrt(m.netVariance),
    expectedNetMinor: m.scheduled.netMinor + toMinor(m.netMean),
    lowNetMinor: m.scheduled.netMinor + toMinor(band.low),
    highNetMinor: m.scheduled.netMinor + toMinor(band.high),
  };
}

export function computeProjection(snapshot: PaymentScheduleSnapshot, inputs: readonly SiteInput[]): Projection {
  const input = snapshot.projection!;
  const horizon = input.horizonMonths ?? 12;
  const plan = input.newSubjectVisitPlan ?? [];
  const buckets = monthBuckets(localDate(snapshot.asOf, "UTC"), horizon);
  const firstStart = (buckets[0] as Bucket).start;
  const lastEnd = (buckets[buckets.length - 1] as Bucket).end;
  const prices = new PriceBook();

  // Recruitment history of every activated site, for the fit.
  const history = new Map<string, SiteHistory>();
  for (const s of inputs) {
    const act = s.site.activatedOn;
    if (!act || act > s.asOf) continue;
    let stop = s.asOf;
    for (const d of [s.site.enrolmentClosedOn, s.site.closedOutOn]) if (d && d < stop) stop = d;
    const count = s.subjects.filter((x) => x.enrolledOn && x.enrolledOn <= s.asOf).length;
    history.set(s.site.id, { count, exposureMonths: Math.max(0, dayNumber(stop) - dayNumber(act)) / DAYS_PER_MONTH });
  }
  const fit = fitPoissonGamma([...history.values()]);

  const bySite = new Map<string, SiteInput>();
  const subjectSite = new Map<string, SiteInput>();
  for (const s of inputs) {
    bySite.set(s.site.id, s);
    for (const x of s.subjects) subjectSite.set(x.id, s);
  }
  const moments = new Map<string, Moments[]>();
  for (const s of inputs) moments.set(s.site.id, buckets.map(emptyMoments));

  const bucketIndex = new Map<string, number>();
  buckets.forEach((b, i) => bucketIndex.set(b.label, i));
  for (const sv of input.scheduledVisits) {
    const s = subjectSite.get(sv.subjectId);
    if (!s || sv.targetDate > lastEnd) continue;
    const i = sv.targetDate < firstStart ? 0 : (bucketIndex.get(sv.targetDate.slice(0, 7)) as number);
    const v = versionAt(s.versions, sv.targetDate);
    const fee = v?.visitFees[sv.visitCode];
    if (!v || fee === undefined) continue;
    const a = prices.price(v, fee, true);
    const m = (moments.get(s.site.id) as Moments[])[i] as Moments;
    m.scheduledVisitCount++;
    m.scheduled.grossMinor += a.grossMinor;
    m.scheduled.overheadMinor += a.overheadMinor;
    m.scheduled.holdbackMinor += a.holdbackMinor;
    m.scheduled.netMinor += a.netMinor;
  }

  const sites: SiteProjection[] = [];
  for (const s of inputs) {
    const siteMoments = moments.get(s.site.id) as Moments[];
    const h = history.get(s.site.id);
    const closed = [s.site.enrolmentClosedOn, s.site.closedOutOn].some((d) => d && d <= s.asOf);
    const recruiting = fit !== null && h !== undefined && !closed;
    let post: RatePosterior | null = null;
    if (recruiting) {
      post = posteriorRate(fit, h);
      const asOfDay = dayNumber(s.asOf);
      // Recruitment stops at a planned end of enrolment inside the horizon.
      let stopT = Infinity;
      for (const d of [s.site.enrolmentClosedOn, s.site.closedOutOn]) if (d) stopT = Math.min(stopT, (dayNumber(d) - asOfDay) / DAYS_PER_MONTH);
      const mean = rateMean(post);
      const varRate = rateVariance(post);
      // For a milestone needing `need` more subjects, at a time t: P(N(t) ≥ need), E[λ·1{N(t) ≥ need}]
      // and E[λ·P(N(t) = need − 1)]. A month's end is the next month's start: each is computed once.
      const rate = post;
      const atEdge = new Map<number, { t: number; p: number; meanRateP: number; pmf: number }>();
      const edge = (need: number, t: number) => {
        const last = atEdge.get(need);
        if (last !== undefined && last.t === t) return last;
        const at = { t, p: probabilityAtLeast(rate, t, need), meanRateP: meanRateTimesProbabilityAtLeast(rate, t, need), pmf: meanRateTimesPoissonPmf(rate, t, need - 1) };
        atEdge.set(need, at);
        return at;
      };
      buckets.forEach((b, i) => {
        const m = siteMoments[i] as Moments;
        const t0 = Math.max(0, dayNumber(b.start) - 1 - asOfDay) / DAYS_PER_MONTH;
        const t1 = Math.max(0, dayNumber(b.end) - asOfDay) / DAYS_PER_MONTH;
        m.expectedEnrolments = mean * overlap(t0, t1, 0, stopT);
        const v = versionAt(s.versions, b.start < s.asOf ? s.asOf : b.start);
        if (!v) return;
        // Visits of new subjects: enrolment times u with u + offset in (t0, t1].
        const parts: { net: number; gross: number; lo: number; hi: number }[] = [];
        for (const p of plan) {
          const fee = v.visitFees[p.visitCode];
          if (fee === undefined) continue;
          const a = prices.price(v, fee, true);
          const o = p.dayOffset / DAYS_PER_MONTH;
          const lo = Math.max(0, t0 - o);
          const hi = Math.min(stopT, t1 - o);
          if (hi > lo) parts.push({ net: Number(a.netMinor), gross: Number(a.grossMinor), lo, hi });
        }
        let sumNetLen = 0;
        let poissonPart = 0;
        for (const p of parts) {
          m.grossMean += mean * p.gross * (p.hi - p.lo);
          sumNetLen += p.net * (p.hi - p.lo);
          for (const q of parts) poissonPart += p.net * q.net * overlap(p.lo, p.hi, q.lo, q.hi);
        }
        m.netMean += mean * sumNetLen;
        m.netVariance += mean * poissonPart + varRate * sumNetLen * sumNetLen;
        // N-subjects-enrolled milestones not yet reached: M = 1{the r-th new subject arrives in (e0, e1]}.
        // Var adds p(1−p)·fee² and 2·fee·Cov(visits, M), exact under the model (from the Poisson
        // process given λ, then over λ); covariances between two milestones are left out.
        const e0 = Math.min(t0, Math.max(0, stopT));
        const e1 = Math.min(t1, Math.max(0, stopT));
        for (const f of v.milestoneFees) {
          if (f.kind !== "nth_enrolled" || f.n == null || f.n <= h.count || e1 <= e0) continue;
          const need = f.n - h.count;
          const at0 = edge(need, e0);
          const at1 = edge(need, e1);
          const p = at1.p - at0.p;
          const priced = prices.price(v, f.amountMinor, true);
          const fee = priced.net;
          const gross = priced.gross;
          m.grossMean += p * gross;
          m.netMean += p * fee;
          let withinRate = 0;
          for (const q of parts) withinRate += q.net * (overlap(q.lo, q.hi, 0, e1) * at1.pmf - overlap(q.lo, q.hi, 0, e0) * at0.pmf);
          const acrossRates = sumNetLen * (at1.meanRateP - at0.meanRateP - mean * p);
          m.netVariance += p * (1 - p) * fee * fee + 2 * fee * (withinRate + acrossRates);
        }
      });
    }
    sites.push({
      siteId: s.site.id,
      currency: s.site.currency,
      recruiting,
      enrolmentRatePerMonth: post ? predictiveCount(post, 1).mean : 0,
      months: buckets.map((b, i) => figures(b, siteMoments[i] as Moments)),
    });
  }

  // Per currency: sums of scheduled amounts and of forecast means and variances (sites independent).
  const currencyMoments = new Map<string, Moments[]>();
  for (const s of inputs) {
    let acc = currencyMoments.get(s.site.currency);
    if (!acc) {
      acc = buckets.map(emptyMoments);
      currencyMoments.set(s.site.currency, acc);
    }
    (moments.get(s.site.id) as Moments[]).forEach((m, i) => {
      const c = (acc as Moments[])[i] as Moments;
      c.scheduled.grossMinor += m.scheduled.grossMinor;
      c.scheduled.overheadMinor += m.scheduled.overheadMinor;
      c.scheduled.holdbackMinor += m.scheduled.holdbackMinor;
      c.scheduled.netMinor += m.scheduled.netMinor;
      c.scheduledVisitCount += m.scheduledVisitCount;
      c.expectedEnrolments += m.expectedEnrolments;
      c.grossMean += m.grossMean;
      c.netMean += m.netMean;
      c.netVariance += m.netVariance;
    });
  }
  const currencies: CurrencyProjection[] = [...currencyMoments.entries()]
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .map(([currency, ms]) => ({ currency, months: buckets.map((b, i) => figures(b, ms[i] as Moments)) }));

  return { asOf: snapshot.asOf, horizonMonths: horizon, fit, sites, currencies };
}
