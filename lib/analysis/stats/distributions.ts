/**
 * Tail probabilities and quantiles through jstat 1.9.6. Tails go through the regularised
 * incomplete beta function directly (no 1 − cdf cancellation). jstat's continued fraction stops
 * at a relative step of 3e-7, so p-values and quantiles are good to about 6–7 significant digits.
 */
import jStat from "jstat";

/** Two-sided p = P(|T| ≥ |t|) for Student's t with `df` degrees of freedom (df may be fractional). */
export function studentTTwoSidedP(t: number, df: number): number {
  if (!Number.isFinite(df) || df <= 0 || Number.isNaN(t)) return NaN;
  if (!Number.isFinite(t)) return 0;
  return clampP(jStat.ibeta(df / (df + t * t), df / 2, 0.5));
}

/** Quantile t_p of Student's t with `df` degrees of freedom, 0 < p < 1. */
export function studentTQuantile(p: number, df: number): number {
  if (!(p > 0 && p < 1) || !(df > 0)) return NaN;
  return jStat.studentt.inv(p, df);
}

/** Upper-tail p = P(F ≥ f) for the F distribution with (df1, df2) degrees of freedom. */
export function fUpperP(f: number, df1: number, df2: number): number {
  if (!(df1 > 0) || !(df2 > 0) || Number.isNaN(f)) return NaN;
  if (f <= 0) return 1;
  if (!Number.isFinite(f)) return 0;
  return clampP(jStat.ibeta(df2 / (df2 + df1 * f), df2 / 2, df1 / 2));
}

/** Two-sided p = P(|Z| ≥ |z|) for a standard normal Z. */
export function normalTwoSidedP(z: number): number {
  if (Number.isNaN(z)) return NaN;
  return clampP(jStat.erfc(Math.abs(z) / Math.SQRT2));
}

function clampP(p: number): number {
  return Math.min(1, Math.max(0, p));
}
