// Decoupling scaling T₂(N) = T₂(1)·N^s against an independent fit: SciPy 1.17.1
// scipy.optimize.curve_fit with sigma = the runs' standard errors and absolute_sigma=True (the
// errors this code reports), and absolute_sigma=False (the errors scaled by √χ²ᵣ, reported beside),
// xtol = ftol = gtol = 1e-15. The invented points grow as N^(2/3), the exponent expected for an NV
// centre decoupled from a slowly fluctuating spin bath (de Lange et al., Science 330, 60 (2010),
// doi:10.1126/science.1192739; from memory).
//
//   import numpy as np; from scipy.optimize import curve_fit
//   N = np.array([1, 2, 4, 8, 16.]); T = np.array([121.3, 188.9, 306.2, 478.5, 762.0]); s = np.array([4.1, 6.0, 9.8, 15.2, 26.0])
//   f = lambda n, a, b: a*n**b
//   p, c = curve_fit(f, N, T, p0=[120, 0.6], sigma=s, absolute_sigma=True, xtol=1e-15, ftol=1e-15, gtol=1e-15)
//   p2, c2 = curve_fit(f, N, T, p0=[120, 0.6], sigma=s, absolute_sigma=False, xtol=1e-15, ftol=1e-15, gtol=1e-15)
//   r = (T - f(N, *p))/s; chi2 = (r**2).sum()
import { describe, expect, it } from "vitest";
import { FitInputError } from "@/lib/analysis/fit-input-error";
import { fitDecouplingScaling, scalingCurve } from "@/lib/analysis/scaling/decoupling-scaling";

const points = [
  { pulses: 1, t2: 121.3, stderr: 4.1 },
  { pulses: 2, t2: 188.9, stderr: 6.0 },
  { pulses: 4, t2: 306.2, stderr: 9.8 },
  { pulses: 8, t2: 478.5, stderr: 15.2 },
  { pulses: 16, t2: 762.0, stderr: 26.0 },
];

function expectRel(actual: number, expected: number, tol: number, label: string) {
  expect(Math.abs(actual - expected) / Math.abs(expected), `${label}: got ${actual}, expected ${expected}`).toBeLessThanOrEqual(tol);
}

describe("decoupling scaling agrees with SciPy", () => {
  it("T₂(1) and s to 1e-8, their errors (absolute σ and scaled by √χ²ᵣ) to 1e-6, χ² and the correlation", () => {
    const r = fitDecouplingScaling(points);
    expect(r.converged).toBe(true);
    expectRel(r.t2One.value, 120.6089854149468, 1e-8, "T₂(1)");
    expectRel(r.exponent.value, 0.6645293776593558, 1e-8, "s");
    expectRel(r.t2One.stderr, 3.0966450795521108, 1e-6, "σ(T₂(1)), absolute_sigma=True");
    expectRel(r.exponent.stderr, 0.015288913081196148, 1e-6, "σ(s), absolute_sigma=True");
    expectRel(r.t2One.stderrScaled, 0.966024625992237, 1e-6, "σ(T₂(1)), absolute_sigma=False");
    expectRel(r.exponent.stderrScaled, 0.004769505759189729, 1e-6, "σ(s), absolute_sigma=False");
    expectRel(r.chi2, 0.29195423976323504, 1e-6, "χ²");
    expect(r.dof).toBe(3);
    expectRel(r.correlation, -0.8226284837795353, 1e-6, "corr(T₂(1), s)");
    // 2/3 (de Lange et al. 2010) lies within the fitted s ± 1 standard error here: |0.66453 − 0.66667| / 0.01529 = 0.14.
    expect(Math.abs(r.exponent.value - 2 / 3)).toBeLessThan(r.exponent.stderr);
    expect(r.notes).toContain("s differs from 2/3 (spin-bath-limited decoupling, de Lange et al., Science 330, 60 (2010)) by 0.14 standard errors.");
  });

  it("the fitted line is T₂(1)·N^s (in Python from SciPy's optimum: 120.60898541 · 16^0.66452938 = 761.2946 µs)", () => {
    const [at16] = scalingCurve(fitDecouplingScaling(points), [16]);
    expect(at16).toBeCloseTo(761.2946307444391, 5);
  });

  it("refuses points it cannot use, naming the point", () => {
    const bad =
      (changed: Partial<(typeof points)[0]>, at = 2) =>
      () =>
        fitDecouplingScaling(points.map((p, i) => (i === at ? { ...p, ...changed } : p)));
    expect(bad({ pulses: 0 })).toThrow(FitInputError);
    expect(bad({ pulses: 0 })).toThrow("point 3: the number of π pulses must be 1 or more (got 0)");
    expect(bad({ stderr: 0 })).toThrow("point 3: the standard error of T₂ must be a positive number (got 0)");
    expect(bad({ t2: Number.NaN })).toThrow("point 3: T₂ must be a positive number");
    expect(() => fitDecouplingScaling(points.slice(0, 2))).toThrow("at least 3 runs");
    expect(() => fitDecouplingScaling(points.map((p) => ({ ...p, pulses: 4 })))).toThrow("at least two different numbers of π pulses");
    expect(() => fitDecouplingScaling(points.map((p) => ({ ...p, t2: 100 })))).toThrow("every run has the same T₂ (100): there is no change with N to fit");
  });
});
