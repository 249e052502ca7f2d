/**
 * Quantiles of the χ² distribution and the interval of a reduced χ² expected from a correct model
 * with correct σ. Arguments and results are dimensionless.
 */
import { normalQuantile } from "./distributions";
import { logGamma, regularizedGammaPair } from "./special-functions";

/**
 * The p-quantile x of χ² with ν degrees of freedom: P(ν/2, x/2) = p, P being the regularised lower
 * incomplete gamma function (Abramowitz & Stegun 26.4.19). Started from the Wilson–Hilferty cube
 * approximation (E. B. Wilson & M. M. Hilferty, PNAS 17, 684 (1931)) and refined by Newton steps on
 * the CDF, kept inside a shrinking bracket (bisection when a step leaves it). Upper quantiles solve
 * Q = 1 − p instead, so neither tail loses digits to cancellation.
 */
export function chiSquareQuantile(p: number, nu: number): number {
  if (!(nu > 0) || !(p >= 0 && p <= 1)) return NaN;
  if (p === 0) return 0;
  if (p === 1) return Infinity;
  const a = nu / 2;
  const upper = p > 0.5;
  const target = upper ? 1 - p : p;
  // Residual of the tail being solved, signed so that it increases with x.
  const residual = (x: number): number => {
    const { p: lower, q } = regularizedGammaPair(a, x / 2);
    return upper ? target - q : lower - target;
  };
  const logDensity = (x: number): number => (a - 1) * Math.log(x) - x / 2 - a * Math.LN2 - logGamma(a);

  const h = 2 / (9 * nu);
  let x = nu * (1 - h + normalQuantile(p) * Math.sqrt(h)) ** 3;
  let lo = 0;
  let hi = Infinity;
  if (!(x > 0) || !Number.isFinite(x)) x = nu;
  for (let i = 0; i < 200; i++) {
    const r = residual(x);
    if (r === 0) return x;
    if (r < 0) lo = x;
    else hi = x;
    let next = x - r / Math.exp(logDensity(x));
    if (!(next > lo && next < hi)) next = Number.isFinite(hi) ? (lo + hi) / 2 : 2 * x + 1;
    if (Math.abs(next - x) <= 1e-15 * x) return next;
    x = next;
  }
  return x;
}

/**
 * The central interval that χ²/ν falls in with probability `level` when the model is right and the
 * σ are the true standard deviations: [χ²_{(1−level)/2}, χ²_{(1+level)/2}]/ν.
 */
export function reducedChiSquareInterval(nu: number, level: number): [number, number] {
  const tail = (1 - level) / 2;
  return [chiSquareQuantile(tail, nu) / nu, chiSquareQuantile(1 - tail, nu) / nu];
}
