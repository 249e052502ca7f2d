/**
 * Welch's unequal-variance t-test (Welch, Biometrika 34, 28 (1947)) with Welch–Satterthwaite
 * degrees of freedom and a two-sided p-value. Values in any common unit.
 */
import { mean, sampleVariance } from "./describe";
import { studentTQuantile, studentTTwoSidedP } from "./distributions";

export interface WelchResult {
  /** mean(a) − mean(b), in the data's unit. */
  meanDiff: number;
  t: number;
  df: number;
  /** Two-sided p-value. */
  p: number;
  /** 95 % CI of meanDiff with the Welch df. */
  ci95: { low: number; high: number };
  notes: string[];
}

/** Welch's t-test of a against b (finite values only; the caller filters). */
export function welchTTest(a: readonly number[], b: readonly number[]): WelchResult {
  const na = a.length;
  const nb = b.length;
  const meanDiff = mean(a) - mean(b);
  const nan = { meanDiff, t: NaN, df: NaN, p: NaN, ci95: { low: NaN, high: NaN } };
  if (na < 2 || nb < 2) return { ...nan, notes: ["Welch's t needs at least 2 values in each group."] };
  const sa = sampleVariance(a) / na;
  const sb = sampleVariance(b) / nb;
  const se2 = sa + sb;
  if (se2 === 0) return { ...nan, notes: ["Both groups have zero variance: Welch's t is undefined."] };
  const se = Math.sqrt(se2);
  const t = meanDiff / se;
  const df = (se2 * se2) / ((sa * sa) / (na - 1) + (sb * sb) / (nb - 1));
  const half = studentTQuantile(0.975, df) * se;
  return { meanDiff, t, df, p: studentTTwoSidedP(t, df), ci95: { low: meanDiff - half, high: meanDiff + half }, notes: [] };
}
