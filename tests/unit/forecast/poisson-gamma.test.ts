import { describe, expect, it } from "vitest";
import gammaRandom from "@stdlib/random-base-gamma";
import poissonRandom from "@stdlib/random-base-poisson";
import stdlibGammaQuantile from "@stdlib/stats-base-dists-gamma-quantile";
import {
  band80,
  combinedRate,
  meanRateTimesPoissonPmf,
  meanRateTimesProbabilityAtLeast,
  fitPoissonGamma,
  gammaQuantile,
  posteriorRate,
  predictiveCount,
  probabilityAtLeast,
  rateMean,
  rateVariance,
  timeToNMoments,
  timeToNMore,
  type SiteHistory,
} from "@/lib/forecast";

// Seeded generators: the Monte Carlo checks are deterministic.
const SEED = 20_071_126;

function mean(xs: number[]) {
  return xs.reduce((a, b) => a + b, 0) / xs.length;
}
function variance(xs: number[]) {
  const m = mean(xs);
  return xs.reduce((a, b) => a + (b - m) ** 2, 0) / (xs.length - 1);
}

describe("time to n more subjects (Anisimov & Fedorov 2007; check values in REFERENCES.md)", () => {
  it("10 identical sites, α = 2, β = 4 months, n = 100 → E[T] = 21.053, SD 5.413", () => {
    const t = timeToNMoments(100, 10, 2, 4);
    expect(t.mean).toBeCloseTo(21.053, 3);
    expect(t.sd).toBeCloseTo(5.413, 3);
  });

  it("agrees with a Monte Carlo of the same model (λᵢ ~ Gamma(2, 4), T | Λ ~ Gamma(100, Λ)) within 1%", () => {
    const gamma = gammaRandom.factory({ seed: SEED });
    const draws: number[] = [];
    for (let r = 0; r < 40_000; r++) {
      let total = 0;
      for (let i = 0; i < 10; i++) total += gamma(2, 4);
      draws.push(gamma(100, total));
    }
    // Standard error of the mean ≈ 5.413/√40000 ≈ 0.027 months: 1% (0.21) is ~8 standard errors.
    expect(Math.abs(mean(draws) - 21.053) / 21.053).toBeLessThan(0.01);
    expect(Math.abs(Math.sqrt(variance(draws)) - 5.413) / 5.413).toBeLessThan(0.03);
  });

  it("combining identical sites by moment matching gives back Gamma(Cα, β) exactly", () => {
    const sites = Array.from({ length: 10 }, () => ({ kind: "gamma", shape: 2, rate: 4 }) as const);
    const c = combinedRate(sites);
    expect(c).toEqual({ kind: "gamma", shape: 20, rate: 4 });
    const t = timeToNMore(100, c);
    expect(t?.mean).toBeCloseTo(21.053, 3);
    expect(t?.sd).toBeCloseTo(5.413, 3);
  });
});

describe("predictive counts of new enrolments", () => {
  it("use the paper's mixed-Poisson moments: mean at/b, variance at/b + at²/b²", () => {
    const post = posteriorRate({ kind: "poisson-gamma", alpha: 2, beta: 4, logLikelihood: 0, pooledRate: 0.5 }, { count: 7, exposureMonths: 10 });
    expect(post).toEqual({ kind: "gamma", shape: 9, rate: 14 });
    const p = predictiveCount(post, 3);
    expect(p.mean).toBeCloseTo((9 * 3) / 14, 12);
    expect(p.variance).toBeCloseTo((9 * 3) / 14 + (9 * 9) / (14 * 14), 12);
  });

  it("agree with a seeded simulation (λ ~ Gamma(9, 14), N | λ ~ Poisson(3λ)) within 2%", () => {
    const gamma = gammaRandom.factory({ seed: SEED });
    const poisson = poissonRandom.factory({ seed: SEED + 1 });
    const post = { kind: "gamma", shape: 9, rate: 14 } as const;
    const draws: number[] = [];
    for (let r = 0; r < 100_000; r++) draws.push(poisson(3 * gamma(9, 14)));
    const p = predictiveCount(post, 3);
    expect(Math.abs(mean(draws) - p.mean) / p.mean).toBeLessThan(0.02);
    expect(Math.abs(variance(draws) - p.variance) / p.variance).toBeLessThan(0.02);
    // P(N ≥ 4) from the negative binomial sum against the simulated frequency.
    const freq = draws.filter((x) => x >= 4).length / draws.length;
    expect(Math.abs(probabilityAtLeast(post, 3, 4) - freq)).toBeLessThan(0.01);
  });

  it("Poisson limit: P(N ≥ 1) = 1 − e^{−λt}", () => {
    expect(probabilityAtLeast({ kind: "fixed", rate: 0.5 }, 2, 1)).toBeCloseTo(1 - Math.exp(-1), 12);
    expect(probabilityAtLeast({ kind: "fixed", rate: 0.5 }, 2, 0)).toBe(1);
  });
});

describe("size-biased moments used for milestone covariances", () => {
  it("E[λ·P(Poisson(λt) = k)] and E[λ·P(N(t) ≥ r)] match a seeded simulation of λ ~ Gamma(9, 14) within 1%", () => {
    const gamma = gammaRandom.factory({ seed: SEED + 6 });
    const post = { kind: "gamma", shape: 9, rate: 14 } as const;
    let pmfSum = 0;
    let tailSum = 0;
    const n = 200_000;
    for (let i = 0; i < n; i++) {
      const lambda = gamma(9, 14);
      const mu = lambda * 6;
      let pmf = Math.exp(-mu);
      for (let j = 1; j <= 3; j++) pmf *= mu / j; // P(Poisson(μ) = 3)
      pmfSum += lambda * pmf;
      tailSum += lambda * probabilityAtLeast({ kind: "fixed", rate: lambda }, 6, 4);
    }
    expect(Math.abs(meanRateTimesPoissonPmf(post, 6, 3) - pmfSum / n) / (pmfSum / n)).toBeLessThan(0.01);
    expect(Math.abs(meanRateTimesProbabilityAtLeast(post, 6, 4) - tailSum / n) / (tailSum / n)).toBeLessThan(0.01);
  });
});

describe("maximum-likelihood fit of α, β", () => {
  it("recovers α = 2, β = 4 from 3,000 simulated sites of 12 months within 15%", () => {
    const gamma = gammaRandom.factory({ seed: SEED + 2 });
    const poisson = poissonRandom.factory({ seed: SEED + 3 });
    const sites: SiteHistory[] = [];
    for (let i = 0; i < 3000; i++) sites.push({ count: poisson(12 * gamma(2, 4)), exposureMonths: 12 });
    const fit = fitPoissonGamma(sites);
    expect(fit?.kind).toBe("poisson-gamma");
    if (fit?.kind !== "poisson-gamma") return;
    expect(Math.abs(fit.alpha - 2) / 2).toBeLessThan(0.15);
    expect(Math.abs(fit.beta - 4) / 4).toBeLessThan(0.15);
    // At the maximum the β score is zero: nα/β = Σ(α+kᵢ)/(β+τᵢ).
    const lhs = (sites.length * fit.alpha) / fit.beta;
    const rhs = sites.reduce((a, s) => a + (fit.alpha + s.count) / (fit.beta + s.exposureMonths), 0);
    expect(Math.abs(lhs - rhs) / lhs).toBeLessThan(1e-6);
  });

  it("falls back to a plain Poisson model when sites barely differ (α, β → ∞)", () => {
    const fit = fitPoissonGamma([
      { count: 10, exposureMonths: 10 },
      { count: 10, exposureMonths: 10 },
      { count: 11, exposureMonths: 10 },
    ]);
    expect(fit).toMatchObject({ kind: "poisson" });
    expect(fit?.pooledRate).toBeCloseTo(31 / 30, 12);
    const post = posteriorRate(fit!, { count: 0, exposureMonths: 1 });
    expect(rateMean(post)).toBeCloseTo(31 / 30, 12);
    expect(rateVariance(post)).toBe(0);
  });

  it("returns null without exposure and a zero rate without enrolment", () => {
    expect(fitPoissonGamma([{ count: 0, exposureMonths: 0 }])).toBeNull();
    expect(fitPoissonGamma([{ count: 0, exposureMonths: 5 }, { count: 0, exposureMonths: 3 }])).toMatchObject({ kind: "poisson", pooledRate: 0 });
  });
});

describe("gamma quantiles and the 80% band", () => {
  it.each([
    [0.1, 2, 4],
    [0.9, 2, 4],
    [0.5, 0.3, 1],
    [0.1, 1e6, 1e5],
    [0.9, 50.5, 3.2],
    [0.01, 0.05, 2],
  ])("quantile(%d; shape %d, rate %d) matches @stdlib/stats-base-dists-gamma-quantile", (p, a, b) => {
    const ref = stdlibGammaQuantile(p, a, b);
    expect(Math.abs(gammaQuantile(p, a, b) - ref) / ref).toBeLessThan(1e-8);
  });

  it.each([
    [0.1, 2, 4, 1e-9],
    [0.9, 2, 4, 1e6],
    [0.9, 50.5, 3.2, 15.6],
    [0.01, 0.05, 2, 3],
    [0.5, 0.3, 1, Number.NaN],
  ])("quantile(%d; shape %d, rate %d) from a first guess of %d still matches @stdlib", (p, a, b, start) => {
    const ref = stdlibGammaQuantile(p, a, b);
    expect(Math.abs(gammaQuantile(p, a, b, start) - ref) / ref).toBeLessThan(1e-8);
  });

  it("band80 is the 10th–90th percentile of the moment-matched gamma", () => {
    const { low, high } = band80(100, 400); // shape 25, rate 0.25
    expect(low).toBeCloseTo(stdlibGammaQuantile(0.1, 25, 0.25), 8);
    expect(high).toBeCloseTo(stdlibGammaQuantile(0.9, 25, 0.25), 8);
    expect(band80(5, 0)).toEqual({ low: 5, high: 5 });
    // Very large shapes switch to the normal limit: still within 1e-6 of the gamma quantiles.
    const big = band80(1e9, 1e9 * 1e9 / 4e7); // shape 4e7
    expect(Math.abs(big.low - stdlibGammaQuantile(0.1, 4e7, 4e7 / 1e9)) / big.low).toBeLessThan(1e-6);
    expect(Math.abs(big.high - stdlibGammaQuantile(0.9, 4e7, 4e7 / 1e9)) / big.high).toBeLessThan(1e-6);
  });

  it("covers about 80% of a simulated predictive count (±2 points)", () => {
    const gamma = gammaRandom.factory({ seed: SEED + 4 });
    const poisson = poissonRandom.factory({ seed: SEED + 5 });
    const post = { kind: "gamma", shape: 40, rate: 8 } as const;
    const p = predictiveCount(post, 12); // mean 60
    const { low, high } = band80(p.mean, p.variance);
    let inside = 0;
    const n = 50_000;
    for (let r = 0; r < n; r++) {
      const x = poisson(12 * gamma(40, 8));
      if (x >= low && x <= high) inside++;
    }
    expect(Math.abs(inside / n - 0.8)).toBeLessThan(0.02);
  });
});
