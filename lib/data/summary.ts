/** One-pass descriptive statistics of a numeric column (values in the column's own unit). */

export interface ColumnSummary {
  /** Finite values counted. */
  count: number;
  /** NaN cells (missing) plus ±Infinity, which are left out of every statistic. */
  missing: number;
  min: number;
  max: number;
  mean: number;
  /** Sample standard deviation (n − 1); NaN with fewer than two values. */
  sd: number;
}

/**
 * Welford's update keeps the variance accurate when the mean is large compared with the spread
 * (e.g. frequencies of 2.87e9 Hz varying by kHz), where Σx² − n·mean² cancels catastrophically.
 */
export function summarizeColumn(col: ArrayLike<number>): ColumnSummary {
  let count = 0;
  let missing = 0;
  let mean = 0;
  let m2 = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < col.length; i++) {
    const v = col[i];
    if (!Number.isFinite(v)) {
      missing++;
      continue;
    }
    count++;
    const delta = v - mean;
    mean += delta / count;
    m2 += delta * (v - mean);
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (count === 0) return { count, missing, min: NaN, max: NaN, mean: NaN, sd: NaN };
  return { count, missing, min, max, mean, sd: count > 1 ? Math.sqrt(m2 / (count - 1)) : NaN };
}
