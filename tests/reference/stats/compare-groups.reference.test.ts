// Welch's t, Mann–Whitney U and Brown–Forsythe checked (1) against first-principles computations
// done here, independently of the code under test, and (2) against published worked examples (from memory; each
// re-computed independently with SciPy 1.17 — ttest_ind(equal_var=False), mannwhitneyu, t.ppf — which
// agrees to every digit quoted). Welch, Biometrika 34, 28 (1947), doi:10.1093/biomet/34.1-2.28; Mann &
// Whitney, Ann. Math. Statist. 18, 50 (1947), doi:10.1214/aoms/1177730491; Brown & Forsythe, J. Am.
// Stat. Assoc. 69, 364 (1974), doi:10.1080/01621459.1974.10482955 (DOIs from memory).
// p-values are compared to ~1e-6, a loose tolerance; the distribution functions themselves are checked
// against SciPy to ~1e-12 in distributions.reference.test.ts.
import { describe, expect, it } from "vitest";
import { compareGroups, describe as describeSample, mannWhitneyU } from "@/lib/analysis/stats";
import { avg, median, normalTwoSidedByIntegration, subsets, sum, tTwoSidedByIntegration, uByPairs, variance } from "./first-principles";

const relClose = (actual: number, expected: number, tol: number) => expect(Math.abs(actual - expected) / Math.abs(expected)).toBeLessThan(tol);

// Small invented data set without ties (e.g. T2 in µs of NV centres in two samples).
const A = [4.2, 5.1, 3.9, 6.3, 5.5];
const B = [7.1, 6.8, 8.4, 5.9, 7.7, 9.0];

describe("first principles, no ties (A: 5 values, B: 6 values)", () => {
  const r = compareGroups(A, B);

  it("Welch's t, df and two-sided p (Welch, Biometrika 34, 28 (1947))", () => {
    const sa = variance(A) / A.length;
    const sb = variance(B) / B.length;
    const t = (avg(A) - avg(B)) / Math.sqrt(sa + sb);
    const df = (sa + sb) ** 2 / (sa ** 2 / (A.length - 1) + sb ** 2 / (B.length - 1));
    relClose(r.welch.t, t, 1e-12);
    relClose(r.welch.df, df, 1e-12);
    relClose(r.welch.p, tTwoSidedByIntegration(t, df), 1e-6);
  });

  it("Mann–Whitney U and exact p by enumerating all C(11,5) = 462 splits", () => {
    const pooled = [...A, ...B];
    const u = uByPairs(A, B);
    let atMost = 0;
    let atLeast = 0;
    let total = 0;
    for (const idx of subsets(pooled.length, A.length)) {
      const inA = new Set(idx);
      const uPerm = uByPairs(
        idx.map((i) => pooled[i]),
        pooled.filter((_, i) => !inA.has(i)),
      );
      total++;
      if (uPerm <= u) atMost++;
      if (uPerm >= u) atLeast++;
    }
    expect(total).toBe(462);
    expect(r.mannWhitney.method).toBe("exact");
    expect(r.mannWhitney.U).toBe(u);
    expect(r.mannWhitney.p).toBeCloseTo(Math.min(1, (2 * Math.min(atMost, atLeast)) / total), 14);
  });

  it("Brown–Forsythe F and p (Brown & Forsythe, JASA 69, 364 (1974)); for 2 groups F = t² of the pooled t on |x − median|", () => {
    const za = A.map((v) => Math.abs(v - median(A)));
    const zb = B.map((v) => Math.abs(v - median(B)));
    const N = za.length + zb.length;
    const grand = sum([...za, ...zb]) / N;
    const between = za.length * (avg(za) - grand) ** 2 + zb.length * (avg(zb) - grand) ** 2;
    const within = sum(za.map((v) => (v - avg(za)) ** 2)) + sum(zb.map((v) => (v - avg(zb)) ** 2));
    const F = between / 1 / (within / (N - 2));
    const sp2 = within / (N - 2);
    const tPooled = (avg(za) - avg(zb)) / Math.sqrt(sp2 * (1 / za.length + 1 / zb.length));
    relClose(F, tPooled ** 2, 1e-12);
    expect(r.brownForsythe.df1).toBe(1);
    expect(r.brownForsythe.df2).toBe(N - 2);
    relClose(r.brownForsythe.F, F, 1e-12);
    relClose(r.brownForsythe.p, tTwoSidedByIntegration(tPooled, N - 2), 1e-6);
  });

  it("describe(): t-based 95 % CI of the mean", () => {
    const d = describeSample(A);
    const sem = Math.sqrt(variance(A) / A.length);
    const q = (d.ci95.high - d.mean) / sem;
    // The quantile q must leave 5 % in the two tails of t with 4 df.
    expect(tTwoSidedByIntegration(q, A.length - 1)).toBeCloseTo(0.05, 7);
  });
});

describe("first principles, with ties: normal approximation", () => {
  const TA = [1.2, 2.3, 2.3, 3.1, 4.0, 4.0, 5.2];
  const TB = [3.1, 4.0, 4.8, 5.2, 6.1, 6.1, 7.3, 8.0];

  it("tie-corrected variance and continuity correction", () => {
    const m = TA.length;
    const n = TB.length;
    const N = m + n;
    const u = uByPairs(TA, TB);
    const counts = new Map<number, number>();
    for (const v of [...TA, ...TB]) counts.set(v, (counts.get(v) ?? 0) + 1);
    const tieTerm = sum([...counts.values()].map((t) => t ** 3 - t));
    const sigma = Math.sqrt(((m * n) / 12) * (N + 1 - tieTerm / (N * (N - 1))));
    const z = (Math.abs(u - (m * n) / 2) - 0.5) / sigma;
    const r = mannWhitneyU(TA, TB);
    expect(r.method).toBe("normal-approximation");
    expect(r.U).toBe(u);
    relClose(Math.abs(r.z), z, 1e-12);
    relClose(r.p, normalTwoSidedByIntegration(z), 1e-9);
  });
});

describe("published worked examples (values from memory)", () => {
  // Student's sleep data (Cushny & Peebles, J. Physiol. 32, 501 (1905), as used by Student, Biometrika 6, 1
  // (1908); both from memory): R's `sleep` dataset and the
  // example output of `t.test(extra ~ group, data = sleep)` and `wilcox.test(extra ~ group, data = sleep)`
  // in R's documentation (from memory).
  const g1 = [0.7, -1.6, -0.2, -1.2, -0.1, 3.4, 3.7, 0.8, 0.0, 2.0];
  const g2 = [1.9, 0.8, 1.1, 0.1, -0.1, 4.4, 5.5, 1.6, 4.6, 3.4];

  it("Welch: t = −1.8608, df = 17.776, p = 0.07939, 95 % CI −3.3654832 … 0.2054832 (R sleep example, from memory)", () => {
    const r = compareGroups(g1, g2).welch;
    expect(r.t.toFixed(4)).toBe("-1.8608");
    expect(r.df.toFixed(3)).toBe("17.776");
    expect(r.p.toFixed(5)).toBe("0.07939");
    expect(r.ci95.low.toFixed(7)).toBe("-3.3654832");
    expect(r.ci95.high.toFixed(7)).toBe("0.2054832");
  });

  it("Mann–Whitney with ties: W = 25.5, p = 0.06933 (R sleep example, from memory)", () => {
    const r = compareGroups(g1, g2).mannWhitney;
    expect(r.U).toBe(25.5);
    expect(r.p.toFixed(5)).toBe("0.06933");
  });

  it("Mann–Whitney exact: W = 35, one-sided p = 0.1272 (Hollander & Wolfe 1973, p. 69f, R's wilcox.test example; from memory)", () => {
    const x = [0.8, 0.83, 1.89, 1.04, 1.45, 1.38, 1.91, 1.64, 0.73, 1.46];
    const y = [1.15, 0.88, 0.9, 0.74, 1.21];
    const r = mannWhitneyU(x, y);
    expect(r.method).toBe("exact");
    expect(r.U).toBe(35);
    expect((r.p / 2).toFixed(4)).toBe("0.1272"); // two-sided p = 2 × one-sided here (U above its mean)
  });

  it("t quantiles t(0.975, ν) = 12.706, 4.303, 2.228, 1.960 for ν = 1, 2, 10, ∞ (standard t tables, from memory)", () => {
    const half = (n: number) => {
      const xs = Array.from({ length: n }, (_, i) => i); // sem-normalised half-width is the quantile
      const d = describeSample(xs);
      return (d.ci95.high - d.mean) / d.sem;
    };
    expect(half(2).toFixed(3)).toBe("12.706");
    expect(half(3).toFixed(3)).toBe("4.303");
    expect(half(11).toFixed(3)).toBe("2.228");
    expect(half(100_001).toFixed(2)).toBe("1.96");
  });
});
