// The statistics that judge a fit's residuals, against values computed outside this code:
// - the Wald–Wolfowitz runs test (A. Wald & J. Wolfowitz, Ann. Math. Stat. 11, 147 (1940)) and the
//   Durbin–Watson statistic (J. Durbin & G. S. Watson, Biometrika 37, 409 (1950)) of hand-written
//   residual sequences, counted by hand and recomputed with NumPy 2.4.6 / SciPy 1.17.1:
//     import numpy as np; from scipy.stats import norm
//     s = np.sign(e); s = s[s != 0]; n1 = (s > 0).sum(); n2 = (s < 0).sum(); n = n1 + n2
//     R = 1 + (s[1:] != s[:-1]).sum(); mu = 1 + 2*n1*n2/n
//     var = 2*n1*n2*(2*n1*n2 - n)/(n**2*(n - 1)); z = (R - mu)/np.sqrt(var); p = 2*norm.sf(abs(z))
//     d = np.sum(np.diff(e)**2)/np.sum(e**2); zd = np.sqrt(len(e))*(1 - d/2); pd = 2*norm.sf(abs(zd))
// - χ² quantiles from SciPy 1.17.1 scipy.stats.chi2.ppf(q, nu).
import { describe, expect, it } from "vitest";
import { chiSquareQuantile, reducedChiSquareInterval } from "@/lib/analysis/stats/chi-square";
import { durbinWatson, runsTest } from "@/lib/analysis/stats/residual-structure";

function expectRel(actual: number, expected: number, tol: number, label: string) {
  const err = Math.abs(actual - expected) / Math.abs(expected);
  expect(err, `${label}: got ${actual}, expected ${expected}`).toBeLessThanOrEqual(tol);
}

// Signs by hand: +++ −−−− +++++ −−− +++ −−−− +++ −− ++ −  → 10 runs, n₁ = 16 above, n₂ = 14 below.
const wave = [
  0.3, 0.5, 0.2, -0.1, -0.4, -0.6, -0.2, 0.1, 0.4, 0.7, 0.5, 0.3, -0.2, -0.5, -0.3, 0.2, 0.6, 0.4, -0.1, -0.3, -0.7, -0.4, 0.1, 0.3, 0.2, -0.2, -0.1, 0.4, 0.5,
  -0.3,
];

describe("Wald–Wolfowitz runs test", () => {
  it("a slow wave: too few runs (hand count and NumPy/SciPy)", () => {
    const r = runsTest(wave)!;
    expect(r.above).toBe(16);
    expect(r.below).toBe(14);
    expect(r.runs).toBe(10);
    // μ = 1 + 2·16·14/30 = 15.9333… (by hand)
    expectRel(r.expected, 15.933333333333334, 1e-15, "expected runs");
    expectRel(r.z, -2.215092432368707, 1e-13, "z"); // numpy/scipy snippet above
    expectRel(r.p, 0.02675372076589135, 1e-11, "p"); // 2*norm.sf(abs(z))
  });

  it("an alternating sequence: every point its own run", () => {
    // a = [(-1)**i*(1 + 0.1*i) for i in range(24)]: 12 above, 12 below, 24 runs
    const a = Array.from({ length: 24 }, (_, i) => (i % 2 === 0 ? 1 : -1) * (1 + 0.1 * i));
    const r = runsTest(a)!;
    expect(r.runs).toBe(24);
    expectRel(r.z, 4.591659104651971, 1e-13, "z"); // numpy/scipy snippet above
    expectRel(r.p, 4.3973621853702465e-6, 1e-9, "p");
  });

  it("exact zeros are left out, and too few of one sign gives no test", () => {
    const withZeros = wave.flatMap((v, i) => (i % 7 === 0 ? [0, v] : [v]));
    expect(runsTest(withZeros)).toEqual(runsTest(wave));
    // nine below the curve: below the normal approximation's minimum of ten per sign
    expect(runsTest([...Array(20).fill(1), ...Array(9).fill(-1)])).toBeUndefined();
  });
});

describe("Durbin–Watson statistic", () => {
  it("the slow wave: d well below 2", () => {
    const r = durbinWatson(wave)!;
    expectRel(r.d, 0.8314087759815243, 1e-14, "d"); // np.sum(np.diff(e)**2)/np.sum(e**2)
    expectRel(r.z, 3.20031886948746, 1e-13, "z"); // np.sqrt(30)*(1 - d/2)
    expectRel(r.p, 0.001372756225335865, 1e-10, "p"); // 2*norm.sf(abs(zd))
  });

  it("the alternating sequence: d near 4", () => {
    const a = Array.from({ length: 24 }, (_, i) => (i % 2 === 0 ? 1 : -1) * (1 + 0.1 * i));
    expectRel(durbinWatson(a)!.d, 3.8039039529565497, 1e-14, "d"); // numpy snippet above
  });

  it("a hand-computed short case, and no statistic below the minimum length", () => {
    // e = [1, −1, 1, −1]: Σ(Δe)² = 3·4 = 12, Σe² = 4 → d = 3 (by hand)
    expect(durbinWatson([1, -1, 1, -1], 4)!.d).toBe(3);
    expect(durbinWatson(wave.slice(0, 19))).toBeUndefined();
  });
});

describe("χ² quantiles and the 99 % interval of χ²/ν", () => {
  // [ν, chi2.ppf(0.005, ν), chi2.ppf(0.995, ν)] from SciPy 1.17.1
  const cases: Array<[number, number, number]> = [
    [1, 3.9270422220515944e-5, 7.879438576622417],
    [5, 0.41174190383249887, 16.74960234363904],
    [20, 7.433844262934236, 39.99684631293865],
    [100, 67.32756330547916, 140.1694894423138],
    [1996, 1837.0110844415472, 2162.501306667547],
  ];
  it.each(cases)("ν = %d: both tails to 1e-10 relative", (nu, lower, upper) => {
    expectRel(chiSquareQuantile(0.005, nu), lower, 1e-10, `chi2.ppf(0.005, ${nu})`);
    expectRel(chiSquareQuantile(0.995, nu), upper, 1e-10, `chi2.ppf(0.995, ${nu})`);
    const [lo, hi] = reducedChiSquareInterval(nu, 0.99);
    expectRel(lo, lower / nu, 1e-10, "interval low");
    expectRel(hi, upper / nu, 1e-10, "interval high");
  });

  it("the median of χ² with 2 degrees of freedom is 2·ln 2 (closed form: CDF 1 − e^(−x/2))", () => {
    expectRel(chiSquareQuantile(0.5, 2), 2 * Math.LN2, 1e-14, "median");
  });
});
