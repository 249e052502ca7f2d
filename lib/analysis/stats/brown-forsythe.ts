/**
 * Brown–Forsythe test for equal spread (Brown & Forsythe, JASA 69, 364 (1974)): Levene's one-way
 * ANOVA on z_ij = |x_ij − median_i|. F has (k − 1, N − k) degrees of freedom; p is the upper tail.
 */
import { medianSorted } from "./describe";
import { fUpperP } from "./distributions";

export interface BrownForsytheResult {
  F: number;
  df1: number;
  df2: number;
  p: number;
  notes: string[];
}

/** Absolute deviations from the group median (same unit as the data). */
export function absoluteDeviationsFromMedian(values: readonly number[]): number[] {
  const med = medianSorted([...values].sort((x, y) => x - y));
  return values.map((v) => Math.abs(v - med));
}

/** Brown–Forsythe test across k ≥ 2 groups of finite values, each with at least 2 values. */
export function brownForsythe(groups: readonly (readonly number[])[]): BrownForsytheResult {
  const k = groups.length;
  const N = groups.reduce((s, g) => s + g.length, 0);
  const df1 = k - 1;
  const df2 = N - k;
  if (k < 2 || groups.some((g) => g.length < 2)) {
    return { F: NaN, df1, df2, p: NaN, notes: ["Brown–Forsythe needs at least 2 groups with at least 2 values each."] };
  }
  const z = groups.map(absoluteDeviationsFromMedian);
  const groupMeans = z.map((g) => g.reduce((s, v) => s + v, 0) / g.length);
  const grandMean = z.flat().reduce((s, v) => s + v, 0) / N;
  let between = 0;
  let within = 0;
  z.forEach((g, i) => {
    between += g.length * (groupMeans[i] - grandMean) ** 2;
    for (const v of g) within += (v - groupMeans[i]) ** 2;
  });
  if (within === 0) {
    if (between === 0) return { F: NaN, df1, df2, p: NaN, notes: ["No spread in the deviations: F is undefined."] };
    return { F: Infinity, df1, df2, p: 0, notes: ["Deviations are constant within each group but differ between groups."] };
  }
  const F = between / df1 / (within / df2);
  return { F, df1, df2, p: fUpperP(F, df1, df2), notes: [] };
}
