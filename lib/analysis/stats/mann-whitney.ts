/**
 * Mann–Whitney U test (Wilcoxon rank-sum), two-sided. U is the statistic of group a: the number of
 * pairs (x from a, y from b) with x > y, ties counting ½, so U_a + U_b = n_a·n_b.
 * p-value: exact permutation distribution when there are no ties and both groups have fewer than
 * 50 values; otherwise the normal approximation with tie-corrected variance and a 0.5 continuity
 * correction (the same choice as R's wilcox.test).
 */
import { normalTwoSidedP } from "./distributions";
import { midRanks } from "./ranks";

export interface MannWhitneyResult {
  /** U of group a (dimensionless). */
  U: number;
  p: number;
  method: "exact" | "normal-approximation";
  /** Continuity-corrected z, for the normal approximation only (NaN for exact). */
  z: number;
  notes: string[];
}

/** Groups smaller than this (both) and without ties get the exact p-value. */
export const MANN_WHITNEY_EXACT_LIMIT = 50;

/**
 * P(U = u) for u = 0 … m·n under the null, for group sizes m (a) and n (b) without ties.
 * Recursion on the largest pooled value: it belongs to a with probability m/(m+n) and then beats
 * all n values of b.
 */
export function mannWhitneyExactDistribution(m: number, n: number): Float64Array {
  // rows[j] holds the distribution for sizes (i, j) of the current i.
  let prev: Float64Array[] = Array.from({ length: n + 1 }, () => Float64Array.of(1));
  for (let i = 1; i <= m; i++) {
    const cur: Float64Array[] = [Float64Array.of(1)];
    for (let j = 1; j <= n; j++) {
      const d = new Float64Array(i * j + 1);
      const fromA = prev[j];
      const fromB = cur[j - 1];
      const wa = i / (i + j);
      const wb = j / (i + j);
      for (let u = 0; u < fromA.length; u++) d[u + j] += wa * fromA[u];
      for (let u = 0; u < fromB.length; u++) d[u] += wb * fromB[u];
      cur.push(d);
    }
    prev = cur;
  }
  return prev[n];
}

/** Two-sided Mann–Whitney U test of a against b (finite values only; the caller filters). */
export function mannWhitneyU(a: readonly number[], b: readonly number[]): MannWhitneyResult {
  const m = a.length;
  const n = b.length;
  if (m === 0 || n === 0) {
    return { U: NaN, p: NaN, method: "normal-approximation", z: NaN, notes: ["Mann–Whitney needs at least 1 value in each group."] };
  }
  const { ranks, tieSizes } = midRanks([...a, ...b]);
  let rankSumA = 0;
  for (let i = 0; i < m; i++) rankSumA += ranks[i];
  const U = rankSumA - (m * (m + 1)) / 2;
  const notes: string[] = [];
  if (tieSizes.length === 0 && m < MANN_WHITNEY_EXACT_LIMIT && n < MANN_WHITNEY_EXACT_LIMIT) {
    const dist = mannWhitneyExactDistribution(m, n);
    const u = Math.round(U);
    let lower = 0;
    for (let k = 0; k <= u; k++) lower += dist[k];
    let upper = 0;
    for (let k = u; k < dist.length; k++) upper += dist[k];
    return { U, p: Math.min(1, 2 * Math.min(lower, upper)), method: "exact", z: NaN, notes };
  }
  if (tieSizes.length > 0) notes.push("Ties present: normal approximation with tie-corrected variance.");
  const N = m + n;
  const tieTerm = tieSizes.reduce((s, t) => s + t ** 3 - t, 0);
  const variance = ((m * n) / 12) * (N + 1 - tieTerm / (N * (N - 1)));
  if (!(variance > 0)) {
    notes.push("All values are equal: no evidence of a shift.");
    return { U, p: 1, method: "normal-approximation", z: 0, notes };
  }
  const diff = U - (m * n) / 2;
  const corrected = Math.sign(diff) * Math.max(0, Math.abs(diff) - 0.5);
  const z = corrected / Math.sqrt(variance);
  return { U, p: normalTwoSidedP(z), method: "normal-approximation", z, notes };
}
