// Special functions for the recruitment model (double precision, no dependencies).

// Lanczos approximation, g = 7, 9 coefficients (Numerical Recipes / Godfrey's set).
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
  12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];

/** ln Γ(x) for x > 0. */
export function logGamma(x: number): number {
  if (!(x > 0)) throw new RangeError(`logGamma needs a positive argument, got ${x}`);
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - logGamma(1 - x);
  const z = x - 1;
  let s = LANCZOS[0] as number;
  for (let i = 1; i < 9; i++) s += (LANCZOS[i] as number) / (z + i);
  const t = z + 7.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(s);
}

/** Regularized lower incomplete gamma P(a, x) (series below a+1, continued fraction above). */
export function regularizedLowerGamma(a: number, x: number): number {
  if (x <= 0) return 0;
  if (!Number.isFinite(x)) return 1;
  const logPrefix = -x + a * Math.log(x) - logGamma(a);
  if (x < a + 1) {
    let term = 1 / a;
    let sum = term;
    for (let n = 1; n < 100_000; n++) {
      term *= x / (a + n);
      sum += term;
      if (Math.abs(term) < Math.abs(sum) * 1e-15) break;
    }
    return Math.min(1, sum * Math.exp(logPrefix));
  }
  // Modified Lentz continued fraction for Q(a, x).
  const tiny = 1e-300;
  let b = x + 1 - a;
  let c = 1 / tiny;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 100_000; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < tiny) d = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-15) break;
  }
  return Math.max(0, 1 - Math.exp(logPrefix) * h);
}

/**
 * Quantile of Gamma(shape, rate): x with P(X ≤ x) = p. Newton steps kept inside a bracket that
 * tightens as they go (bisection when a step leaves it, doubling while no upper end is known).
 * `start` (in the same units as the answer) is an optional first guess: a close one saves steps.
 */
export function gammaQuantile(p: number, shape: number, rate: number, start?: number): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`Probability must lie in [0, 1], got ${p}`);
  if (!(shape > 0 && rate > 0)) throw new RangeError("Gamma shape and rate must be positive");
  if (p === 0) return 0;
  if (p === 1) return Infinity;
  const a = shape;
  let lo = 0;
  let hi = Infinity;
  let x = start !== undefined && start > 0 && Number.isFinite(start) ? start * rate : Math.max(a, 1e-300);
  const logNorm = logGamma(a);
  for (let i = 0; i < 400; i++) {
    const f = regularizedLowerGamma(a, x) - p;
    if (f === 0) break;
    if (f < 0) lo = x;
    else hi = x;
    const density = Math.exp((a - 1) * Math.log(x) - x - logNorm);
    let next = density > 0 ? x - f / density : NaN;
    if (!(next > lo && next < hi)) next = hi === Infinity ? Math.max(2 * x, 1) : (lo + hi) / 2;
    if (Math.abs(next - x) <= 1e-14 * x) {
      x = next;
      break;
    }
    x = next;
  }
  return x / rate;
}
