/**
 * Descriptive statistics of one sample. Values keep the caller's unit (e.g. T2 in µs); n and the
 * counts are dimensionless. Non-finite values are dropped with a note; n < 2 gives NaN where a
 * quantity is undefined, with a note, rather than throwing.
 */
import { studentTQuantile } from "./distributions";

export interface Description {
  n: number;
  mean: number;
  /** Sample standard deviation (divisor n − 1). */
  sd: number;
  /** Standard error of the mean, sd/√n. */
  sem: number;
  median: number;
  q1: number;
  q3: number;
  iqr: number;
  min: number;
  max: number;
  /** 95 % confidence interval of the mean: mean ± t(0.975, n − 1) · sem. */
  ci95: { low: number; high: number };
  notes: string[];
}

/** How describe() computes what it reports; shown beside tables of results. */
export const DESCRIBE_METHOD =
  "sd with divisor n − 1; sem = sd/√n; quartiles and median by linear interpolation between order statistics " +
  "(Hyndman & Fan 1996 type 7, the default of R and NumPy); ci95 = mean ± t(0.975, n − 1)·sem (Student t, assumes roughly normal data).";

/** Sample quantile of ascending `sorted` at probability p ∈ [0, 1], Hyndman–Fan type 7. */
export function quantileSorted(sorted: readonly number[], p: number): number {
  const n = sorted.length;
  if (n === 0 || !(p >= 0 && p <= 1)) return NaN;
  const h = (n - 1) * p;
  const j = Math.floor(h);
  if (j >= n - 1) return sorted[n - 1];
  const lo = sorted[j];
  const hi = sorted[j + 1];
  // The clamp guards against rounding pushing the interpolant outside [lo, hi].
  return Math.min(hi, Math.max(lo, lo + (h - j) * (hi - lo)));
}

/** Median of ascending `sorted`. */
export function medianSorted(sorted: readonly number[]): number {
  return quantileSorted(sorted, 0.5);
}

/** Arithmetic mean, two-pass corrected, clamped to [min, max] against rounding; NaN if empty. */
export function mean(values: readonly number[]): number {
  const n = values.length;
  if (n === 0) return NaN;
  let s = 0;
  for (const v of values) s += v;
  let m = s / n;
  let c = 0;
  for (const v of values) c += v - m;
  m += c / n;
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return Math.min(hi, Math.max(lo, m));
}

/** Sample variance (divisor n − 1), two-pass; NaN for n < 2. */
export function sampleVariance(values: readonly number[]): number {
  const n = values.length;
  if (n < 2) return NaN;
  const m = mean(values);
  let ss = 0;
  for (const v of values) ss += (v - m) ** 2;
  return ss / (n - 1);
}

/** Keeps finite values; reports how many were dropped. */
export function finiteValues(values: readonly number[]): { kept: number[]; dropped: number } {
  const kept = values.filter((v) => typeof v === "number" && Number.isFinite(v));
  return { kept, dropped: values.length - kept.length };
}

/** n, mean, sd, sem, median, quartiles, IQR, range and t-based 95 % CI of the mean. */
export function describe(values: readonly number[]): Description {
  const { kept, dropped } = finiteValues(values);
  const notes: string[] = [];
  if (dropped > 0) notes.push(`${dropped} non-finite value(s) ignored.`);
  const n = kept.length;
  const sorted = [...kept].sort((a, b) => a - b);
  if (n === 0) notes.push("No values: every statistic is NaN.");
  else if (n === 1) notes.push("Only one value: sd, sem and ci95 need n ≥ 2 and are NaN.");
  const m = mean(sorted);
  const sd = Math.sqrt(sampleVariance(sorted));
  const sem = sd / Math.sqrt(n);
  const half = n >= 2 ? studentTQuantile(0.975, n - 1) * sem : NaN;
  const q1 = quantileSorted(sorted, 0.25);
  const q3 = quantileSorted(sorted, 0.75);
  return {
    n,
    mean: m,
    sd,
    sem,
    median: medianSorted(sorted),
    q1,
    q3,
    iqr: q3 - q1,
    min: n > 0 ? sorted[0] : NaN,
    max: n > 0 ? sorted[n - 1] : NaN,
    ci95: { low: m - half, high: m + half },
    notes,
  };
}
