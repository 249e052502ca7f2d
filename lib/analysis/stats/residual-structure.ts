/**
 * Tests for structure left in a fit's residuals, taken in order of x: a model that describes the
 * data leaves residuals that are independent from point to point; a model that misses a feature
 * leaves long stretches of one sign (too few runs, neighbouring residuals alike). Residuals may be
 * in any unit (or divided by σ); the statistics are dimensionless.
 */
import { normalTwoSidedP } from "./distributions";

export interface RunsTest {
  /** Points above (n₁) and below (n₂) the curve; residuals that are exactly 0 are left out. */
  above: number;
  below: number;
  /** Number of runs of one sign. */
  runs: number;
  /** Runs expected for independent residuals: 1 + 2n₁n₂/n. */
  expected: number;
  /** (runs − expected)/sd; negative when neighbours share their sign. */
  z: number;
  /** Two-sided p from the normal approximation. */
  p: number;
}

/**
 * Wald–Wolfowitz runs test on the signs of a sequence (A. Wald & J. Wolfowitz, Ann. Math. Stat. 11,
 * 147 (1940)), with the large-sample normal approximation and no continuity correction:
 * μ = 1 + 2n₁n₂/n, σ² = 2n₁n₂(2n₁n₂ − n)/(n²(n − 1)), z = (R − μ)/σ, p = 2·(1 − Φ(|z|)).
 * Returns undefined when either sign has fewer than `minimumEach` members.
 */
export function runsTest(values: ArrayLike<number>, minimumEach = 10): RunsTest | undefined {
  let above = 0;
  let below = 0;
  let runs = 0;
  let last = 0;
  for (let i = 0; i < values.length; i++) {
    const sign = Math.sign(values[i]);
    if (sign === 0 || Number.isNaN(sign)) continue;
    if (sign > 0) above++;
    else below++;
    if (sign !== last) runs++;
    last = sign;
  }
  if (above < minimumEach || below < minimumEach) return undefined;
  const n = above + below;
  const product = 2 * above * below;
  const expected = 1 + product / n;
  const variance = (product * (product - n)) / (n * n * (n - 1));
  const z = (runs - expected) / Math.sqrt(variance);
  return { above, below, runs, expected, z, p: normalTwoSidedP(z) };
}

export interface DurbinWatson {
  /** d = Σ(eₜ − eₜ₋₁)²/Σeₜ², 0 … 4; about 2 for independent residuals, below 2 when neighbours are alike. */
  d: number;
  /** Lag-one autocorrelation implied by d: r₁ ≈ 1 − d/2. */
  r1: number;
  /** Large-sample z of r₁: √n·(1 − d/2). */
  z: number;
  /** Two-sided p from that normal approximation. */
  p: number;
}

/**
 * Durbin–Watson statistic (J. Durbin & G. S. Watson, Biometrika 37, 409 (1950)) of a sequence, with
 * an approximate two-sided p: for independent values the lag-one autocorrelation r₁ ≈ 1 − d/2 has
 * variance ≈ 1/n (M. S. Bartlett, J. R. Stat. Soc. Suppl. 8, 27 (1946)), so z = √n·(1 − d/2). The
 * exact bounds of Durbin & Watson depend on the regressors; this large-sample form does not.
 * Returns undefined for fewer than `minimum` values or an all-zero sequence.
 */
export function durbinWatson(values: ArrayLike<number>, minimum = 20): DurbinWatson | undefined {
  const n = values.length;
  if (n < minimum) return undefined;
  let sumSquares = values[0] * values[0];
  let sumDifferences = 0;
  for (let i = 1; i < n; i++) {
    sumSquares += values[i] * values[i];
    sumDifferences += (values[i] - values[i - 1]) ** 2;
  }
  if (!(sumSquares > 0)) return undefined;
  const d = sumDifferences / sumSquares;
  const r1 = 1 - d / 2;
  const z = Math.sqrt(n) * r1;
  return { d, r1, z, p: normalTwoSidedP(z) };
}
