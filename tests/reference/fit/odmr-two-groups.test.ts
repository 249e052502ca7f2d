// The f₋/f₊ model with ¹⁴N hyperfine triplets against an independent fit: SciPy 1.17.1
// scipy.optimize.curve_fit on the same invented sweep (the generator below, written out identically
// in Python), unweighted least squares, covariance scaled by χ²ᵣ (absolute_sigma=False, as the
// fitter reports), xtol = ftol = gtol = 1e-15. The sweep: f₋ = 2752.4 MHz and f₊ = 2987.6 MHz, i.e.
// D ∓ γB with D = 2870 MHz, γ = 28.0 GHz/T, B = 4.2 mT (2870 ∓ 117.6 MHz); |A∥| = 2.14 MHz, the
// value of lib/physics/constants (Felton et al., PRB 79, 075203 (2009); from memory); width 1 MHz.
//
//   import numpy as np; from scipy.optimize import curve_fit
//   i = np.arange(1401); x = 2700 + 0.25*i
//   L = lambda f, c, w: 1/(1 + (2*(f - c)/w)**2)
//   def model(f, B, fm, fp, A, w, cm, cp):
//       return B*(1 - cm*sum(L(f, fm + k*A, w) for k in (-1, 0, 1)) - cp*sum(L(f, fp + k*A, w) for k in (-1, 0, 1)))
//   y = model(x, 1.0, 2752.4, 2987.6, 2.14, 1.0, 0.03, 0.028) + 0.003*np.sin(0.7*i*i + 1.3)
//   p, c = curve_fit(model, x, y, p0=[1, 2752, 2988, 2.0, 1.2, 0.025, 0.025], xtol=1e-15, ftol=1e-15, gtol=1e-15, maxfev=100000)
import { describe, expect, it } from "vitest";
import { fitModel } from "@/lib/analysis/fit-model";

const x = Array.from({ length: 1401 }, (_, i) => 2700 + 0.25 * i);
const line = (f: number, c: number, w: number) => 1 / (1 + ((2 * (f - c)) / w) ** 2);
const group = (f: number, centre: number) => [-1, 0, 1].reduce((s, k) => s + line(f, centre + k * 2.14, 1.0), 0);
const y = x.map((f, i) => 1.0 * (1 - 0.03 * group(f, 2752.4) - 0.028 * group(f, 2987.6)) + 0.003 * Math.sin(0.7 * i * i + 1.3));

const values = [0.9999399281084432, 2752.378588149198, 2987.577142152433, 2.158680339965977, 1.0124992176688672, 0.028563108265530632, 0.0285362887384501];
const stderr = [
  5.860394443435939e-5, 0.018232319528566472, 0.018246616975711255, 0.015013332832575313, 0.030999367457098245, 0.0008468694002516316, 0.0008465068659311807,
];

function expectRel(actual: number, expected: number, tol: number, label: string) {
  expect(Math.abs(actual - expected) / Math.abs(expected), `${label}: got ${actual}, expected ${expected}`).toBeLessThanOrEqual(tol);
}

describe("ODMR f₋ and f₊ with ¹⁴N triplets agrees with SciPy", () => {
  // Parameters to 1e-6: the minimum is flat along |A∥| at the 1e-11 level of χ² — SciPy stops at
  // χ² = 0.0063034376268503 (|A∥| = 2.15868034), this fitter at 0.0063034376267468 (2.15867979), lower.
  it("from its own start values (the two groups found in the data): parameters to 1e-6, errors to 1e-5", () => {
    const r = fitModel("odmr_14n_two_groups", { x, y, xUnit: "MHz", solver: { ftol: 1e-15, xtol: 1e-15, gtol: 1e-15 } });
    expect(r.converged).toBe(true);
    expect(r.params.map((p) => p.name)).toEqual(["B", "fMinus", "fPlus", "Apar", "w", "cMinus", "cPlus"]);
    r.params.forEach((p, j) => {
      expectRel(p.value, values[j]!, 1e-6, p.name);
      expectRel(p.stderr, stderr[j]!, 1e-5, `σ(${p.name})`);
    });
    // D = (f₋ + f₊)/2 and Δ = f₊ − f₋ with σ = √(gᵀCg) from SciPy's covariance C (in Python:
    // g = [0, .5, .5, 0, 0, 0, 0] → 0.012897250650035011; g = [0, −1, 1, 0, 0, 0, 0] → 0.025794509407639582).
    const [d, split] = r.derived;
    expect([d!.name, split!.name]).toEqual(["D", "splitting"]);
    expectRel(d!.value, (values[1]! + values[2]!) / 2, 1e-8, "D");
    expectRel(d!.stderr, 0.012897250650035011, 1e-5, "σ(D)");
    expectRel(split!.value, values[2]! - values[1]!, 1e-7, "Δ");
    expectRel(split!.stderr, 0.025794509407639582, 1e-5, "σ(Δ)");
    expect(r.quality.level).toBe("good");
  });
});
