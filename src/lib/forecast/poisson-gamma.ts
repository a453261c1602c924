// Poisson–gamma recruitment model (Anisimov & Fedorov, Statistics in Medicine 2007;26:4958).
// Each site enrols as a Poisson process with rate λᵢ ~ Gamma(α, β), β a rate (per month).
// A site's count kᵢ over τᵢ months is then negative binomial; α, β are fitted by maximum
// likelihood, and a site's updated rate is Gamma(α + kᵢ, β + τᵢ).
import { gammaQuantile, logGamma } from "./special-functions";

export interface SiteHistory {
  /** Subjects enrolled so far. */
  count: number;
  /** Months the site has been recruiting. */
  exposureMonths: number;
}

export type PoissonGammaFit =
  | { kind: "poisson-gamma"; alpha: number; beta: number; logLikelihood: number; pooledRate: number }
  /** Sites barely differ: the likelihood keeps rising as α, β → ∞ with α/β fixed; a plain Poisson model. */
  | { kind: "poisson"; pooledRate: number; logLikelihood: number };

/** A site's recruitment rate after seeing its history: a gamma, or a known rate in the Poisson limit. */
export type RatePosterior = { kind: "gamma"; shape: number; rate: number } | { kind: "fixed"; rate: number };

const LOG_ALPHA_MIN = Math.log(1e-3);
const LOG_ALPHA_MAX = Math.log(1e7);

// Negative binomial log-likelihood without the terms free of α, β.
// ln Γ(α+k) − ln Γ(α) is summed as Σ ln(α+j): exact for the large α of the Poisson limit.
function logLikelihood(sites: readonly SiteHistory[], alpha: number, beta: number): number {
  let ll = 0;
  for (const s of sites) {
    for (let j = 0; j < s.count; j++) ll += Math.log(alpha + j);
    ll += alpha * Math.log(beta) - (alpha + s.count) * Math.log(beta + s.exposureMonths);
  }
  return ll;
}

// For fixed α the score in β, times β, is nα − Σ(α+kᵢ)β/(β+τᵢ): strictly decreasing, one root.
function betaGivenAlpha(sites: readonly SiteHistory[], alpha: number): number {
  const g = (beta: number) => {
    let s = sites.length * alpha;
    for (const x of sites) s -= ((alpha + x.count) * beta) / (beta + x.exposureMonths);
    return s;
  };
  let lo = Math.log(1e-12);
  let hi = Math.log(1e15);
  for (let i = 0; i < 200 && hi - lo > 1e-13; i++) {
    const mid = (lo + hi) / 2;
    if (g(Math.exp(mid)) > 0) lo = mid;
    else hi = mid;
  }
  return Math.exp((lo + hi) / 2);
}

function poissonLogLikelihood(sites: readonly SiteHistory[], rate: number): number {
  let ll = 0;
  for (const s of sites) ll += s.count * Math.log(rate) - rate * s.exposureMonths;
  return ll;
}

/** Maximum-likelihood fit of α, β over sites with some exposure; null when nothing can be fitted. */
export function fitPoissonGamma(history: readonly SiteHistory[]): PoissonGammaFit | null {
  const sites = history.filter((s) => s.exposureMonths > 0);
  const total = sites.reduce((a, s) => a + s.count, 0);
  const exposure = sites.reduce((a, s) => a + s.exposureMonths, 0);
  if (sites.length === 0 || exposure <= 0) return null;
  const pooledRate = total / exposure;
  // No enrolment yet, or a single site: nothing to tell sites apart, keep the pooled Poisson rate.
  if (total === 0 || sites.length < 2) {
    return { kind: "poisson", pooledRate, logLikelihood: total === 0 ? 0 : poissonLogLikelihood(sites, pooledRate) };
  }
  const profile = (logAlpha: number) => {
    const alpha = Math.exp(logAlpha);
    return logLikelihood(sites, alpha, betaGivenAlpha(sites, alpha));
  };
  // Coarse grid on ln α, then golden-section search around the best point.
  const steps = 48;
  let best = 0;
  let bestValue = -Infinity;
  const grid: number[] = [];
  for (let i = 0; i <= steps; i++) {
    const x = LOG_ALPHA_MIN + ((LOG_ALPHA_MAX - LOG_ALPHA_MIN) * i) / steps;
    grid.push(x);
    const v = profile(x);
    if (v > bestValue) {
      bestValue = v;
      best = i;
    }
  }
  const poissonLL = poissonLogLikelihood(sites, pooledRate);
  // Running off to the edge (or no better than Poisson): the overdispersion is not there.
  if (best === steps || bestValue <= poissonLL + 1e-9) {
    return { kind: "poisson", pooledRate, logLikelihood: poissonLL };
  }
  let a = grid[Math.max(0, best - 1)] as number;
  let b = grid[Math.min(steps, best + 1)] as number;
  const phi = (Math.sqrt(5) - 1) / 2;
  let c = b - phi * (b - a);
  let d = a + phi * (b - a);
  let fc = profile(c);
  let fd = profile(d);
  while (b - a > 1e-9) {
    if (fc > fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - phi * (b - a);
      fc = profile(c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + phi * (b - a);
      fd = profile(d);
    }
  }
  const alpha = Math.exp((a + b) / 2);
  const beta = betaGivenAlpha(sites, alpha);
  return { kind: "poisson-gamma", alpha, beta, logLikelihood: logLikelihood(sites, alpha, beta), pooledRate };
}

/** A site's rate after its own history (the paper's empirical Bayes update). */
export function posteriorRate(fit: PoissonGammaFit, site: SiteHistory): RatePosterior {
  if (fit.kind === "poisson") return { kind: "fixed", rate: fit.pooledRate };
  return { kind: "gamma", shape: fit.alpha + site.count, rate: fit.beta + site.exposureMonths };
}

export function rateMean(p: RatePosterior): number {
  return p.kind === "fixed" ? p.rate : p.shape / p.rate;
}
export function rateVariance(p: RatePosterior): number {
  return p.kind === "fixed" ? 0 : p.shape / (p.rate * p.rate);
}

/**
 * New enrolments over the next t months: mixed Poisson, mean E[λ]t, variance E[λ]t + Var[λ]t²
 * (negative binomial with size a and probability b/(b+t) when λ ~ Gamma(a, b)).
 */
export function predictiveCount(p: RatePosterior, months: number): { mean: number; variance: number } {
  const m = rateMean(p);
  return { mean: m * months, variance: m * months + rateVariance(p) * months * months };
}

/** P(at least r new enrolments within t months) under the predictive distribution. */
export function probabilityAtLeast(p: RatePosterior, months: number, r: number): number {
  if (r <= 0) return 1;
  if (months <= 0) return 0;
  // pmf(j + 1) = pmf(j) · (c + d·j) / (j + 1): Poisson (c = μ, d = 0) or negative binomial
  // (c = a·q, d = q with q = t/(b + t)).
  let pmf: number;
  let c: number;
  let d: number;
  if (p.kind === "fixed") {
    const mu = p.rate * months;
    if (mu === 0) return 0;
    pmf = Math.exp(-mu);
    c = mu;
    d = 0;
  } else {
    const q = months / (p.rate + months);
    pmf = Math.exp(p.shape * Math.log(p.rate / (p.rate + months)));
    c = p.shape * q;
    d = q;
  }
  let cdf = 0;
  for (let j = 0; j < r; j++) {
    cdf += pmf;
    pmf *= (c + d * j) / (j + 1);
  }
  return Math.min(1, Math.max(0, 1 - cdf));
}

/**
 * Time to n more subjects with C identical sites of rate Gamma(α, β): T = β·BetaPrime(n, Cα),
 * E[T] = nβ/(Cα−1), Var[T] = β²n(n+Cα−1)/((Cα−1)²(Cα−2)). Needs Cα > 2 for a finite variance.
 */
export function timeToNMoments(n: number, sites: number, alpha: number, beta: number): { mean: number; sd: number } {
  const ca = sites * alpha;
  if (ca <= 2) throw new RangeError("The time to n subjects has no finite variance when C·α ≤ 2");
  const mean = (n * beta) / (ca - 1);
  const variance = (beta * beta * n * (n + ca - 1)) / ((ca - 1) ** 2 * (ca - 2));
  return { mean, sd: Math.sqrt(variance) };
}

/**
 * Sum of sites' rates matched to one gamma by mean and variance (m = Σa/b, v = Σa/b²) — the paper's
 * approximation for sites with different updated rates. Returns a fixed rate when nothing is random.
 */
export function combinedRate(posteriors: readonly RatePosterior[]): RatePosterior {
  let m = 0;
  let v = 0;
  for (const p of posteriors) {
    m += rateMean(p);
    v += rateVariance(p);
  }
  if (v === 0 || m === 0) return { kind: "fixed", rate: m };
  return { kind: "gamma", shape: (m * m) / v, rate: m / v };
}

/** Time to n more subjects from a combined rate; Poisson limit gives T ~ Gamma(n, rate). */
export function timeToNMore(n: number, combined: RatePosterior): { mean: number; sd: number } | null {
  if (combined.kind === "fixed") {
    if (combined.rate <= 0) return null;
    return { mean: n / combined.rate, sd: Math.sqrt(n) / combined.rate };
  }
  if (combined.shape <= 2) return null;
  return timeToNMoments(n, 1, combined.shape, combined.rate);
}

export const BAND_LOW_P = 0.1;
export const BAND_HIGH_P = 0.9;
/** Standard normal 90th percentile (from memory; tests check the band against gamma quantiles). */
const Z_90 = 1.2815515655446004;

/**
 * 80% band of a non-negative quantity known by its mean and variance: the gamma with the same two
 * moments, 10th and 90th percentiles. A zero variance gives a band of width zero.
 */
export function band80(mean: number, variance: number): { low: number; high: number } {
  if (!(mean > 0) || !(variance > 0)) return { low: Math.max(0, mean), high: Math.max(0, mean) };
  const shape = (mean * mean) / variance;
  const rate = mean / variance;
  if (shape > 1e6) {
    // The gamma is then normal to ~1e-3 relative skew; the series for P(a, x) would be slow.
    const half = Z_90 * Math.sqrt(variance);
    return { low: Math.max(0, mean - half), high: mean + half };
  }
  // First guesses from the cube-root normal approximation of Wilson & Hilferty (PNAS 17, 1931):
  // Newton then needs few steps. The answer is the exact quantile either way (tests: @stdlib).
  const wh = (z: number) => (shape / rate) * Math.pow(Math.max(0, 1 - 1 / (9 * shape) + z * Math.sqrt(1 / (9 * shape))), 3);
  return { low: gammaQuantile(BAND_LOW_P, shape, rate, wh(-Z_90)), high: gammaQuantile(BAND_HIGH_P, shape, rate, wh(Z_90)) };
}

/**
 * E[λ · P(Poisson(λt) = k)] over the rate's distribution. For a Poisson process with rate λ,
 * Cov(N(A), 1{N(t) ≥ k+1} | λ) = |A| · λ · P(Poisson(λt) = k) when A ⊂ (0, t]; this is its mean
 * over λ ~ Gamma(a, b): t^k/k! · bᵃ Γ(a+k+1) / (Γ(a) (b+t)^(a+k+1)).
 */
export function meanRateTimesPoissonPmf(p: RatePosterior, months: number, k: number): number {
  if (months <= 0 || k < 0) return 0;
  if (p.kind === "fixed") {
    const mu = p.rate * months;
    if (mu === 0) return 0;
    return p.rate * Math.exp(k * Math.log(mu) - mu - logGamma(k + 1));
  }
  const { shape: a, rate: b } = p;
  return Math.exp(k * Math.log(months) - logGamma(k + 1) + a * Math.log(b) + logGamma(a + k + 1) - logGamma(a) - (a + k + 1) * Math.log(b + months));
}

/** E[λ · 1{N(t) ≥ r}] = E[λ] · P(N(t) ≥ r) under the size-biased rate Gamma(a+1, b). */
export function meanRateTimesProbabilityAtLeast(p: RatePosterior, months: number, r: number): number {
  if (p.kind === "fixed") return p.rate * probabilityAtLeast(p, months, r);
  return (p.shape / p.rate) * probabilityAtLeast({ kind: "gamma", shape: p.shape + 1, rate: p.rate }, months, r);
}
