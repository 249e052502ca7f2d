/**
 * The central-difference Jacobian (used for models without an analytic one) on a narrow ODMR dip
 * far from zero: a 0.8 MHz line at 2801 MHz in a 2780–2820 MHz sweep. A step relative to |f₀|
 * (6.06e-6 × 2801 MHz ≈ 0.017 MHz) is a fair part of the line and misses ∂y/∂f₀ by 2e-3 of its
 * largest value; a step from the parameter's typical size (here the 40 MHz the bounds allow)
 * gets within 5e-7.
 */
import { describe, expect, it } from "vitest";
import { buildCurveProblem, typicalSize } from "@/lib/analysis/fit/curve-problem";
import { getModel } from "@/lib/analysis";

const model = getModel("odmr_lorentzian_1")!;
const p = [1, 2801, 0.8, 0.02]; // B, f1 (MHz), w1 (MHz), c1
const x = Array.from({ length: 401 }, (_, i) => 2780 + 0.1 * i);

/** Column-major m×n Jacobian of the problem at p, built without the model's analytic derivatives. */
function numericalJacobian(lower: number[], upper: number[]): Float64Array {
  const withoutJacobian = { evaluate: model.evaluate };
  const problem = buildCurveProblem(withoutJacobian, { x, y: x.map(() => 0) }, p, [false, false, false, false], lower, upper);
  const out = new Float64Array(x.length * p.length);
  problem.jacobian(Float64Array.from(p), out);
  return out;
}

/**
 * ∂y/∂(B, f₀, w, c) of y = B·(1 − c·L), L = 1/(1 + q²), q = 2(f − f₀)/w, written out by hand and
 * evaluated in Python 3 / NumPy (float64) at three sweep points:
 *   q = 2*(f - 2801.0)/0.8; L = 1/(1 + q*q)
 *   [1 - 0.02*L, -0.02*4*q*L*L/0.8, -0.02*2*q*q*L*L/0.8, -L]   for f = 2780 + 0.1*i, i = 209, 211, 212
 */
const CLOSED_FORM: Array<[number, number[]]> = [
  [209, [0.9811764705882333, 0.022145328719707775, -0.0027681660899609548, -0.941176470588336]],
  [211, [0.9811764705882333, -0.022145328719707775, -0.0027681660899609548, -0.941176470588336]],
  [212, [0.9839999999999942, -0.03199999999999417, -0.00799999999999127, -0.800000000000291]],
];

describe("finite-difference Jacobian step", () => {
  it("takes the smaller of |p| and the bounds' width as the parameter's size", () => {
    expect(typicalSize(2801, 2780, 2820)).toBe(40);
    expect(typicalSize(0.8, 0.01, 40)).toBe(0.8);
    expect(typicalSize(0, 0, 1)).toBe(1);
    expect(typicalSize(-3, -Infinity, Infinity)).toBe(3);
    expect(typicalSize(0, -Infinity, Infinity)).toBe(1);
  });

  it("matches the closed-form derivatives of a narrow dip at 2801 MHz within the model's default bounds", () => {
    const bounds = model.bounds!(x, x);
    expect(bounds[1]).toEqual([2780, 2820]);
    const jac = numericalJacobian(
      bounds.map((b) => b[0]),
      bounds.map((b) => b[1]),
    );
    const m = x.length;
    for (const [i, expected] of CLOSED_FORM) {
      expected.forEach((d, k) => {
        const scale = k === 1 ? 0.032 : Math.max(Math.abs(d), 1e-3); // ∂y/∂f₀ peaks at 0.032 per MHz
        expect(Math.abs(jac[k * m + i] - d) / scale, `∂y/∂p${k} at f = ${x[i]}`).toBeLessThan(1e-6);
      });
    }
  });

  it("agrees with the model's analytic Jacobian at every point to 1e-6 of each column's largest value", () => {
    const bounds = model.bounds!(x, x);
    const jac = numericalJacobian(
      bounds.map((b) => b[0]),
      bounds.map((b) => b[1]),
    );
    const m = x.length;
    const row = new Float64Array(4);
    for (let k = 0; k < 4; k++) {
      let worst = 0;
      let largest = 0;
      for (let i = 0; i < m; i++) {
        model.jacobian!(x[i], p, row);
        worst = Math.max(worst, Math.abs(jac[k * m + i] - row[k]));
        largest = Math.max(largest, Math.abs(row[k]));
      }
      expect(worst / largest, `column ${model.params[k].name}`).toBeLessThan(1e-6);
    }
  });

  it("keeps the relative step for unbounded parameters (the old, coarse one here: 2e-3 off at f = 2801.2 MHz)", () => {
    const jac = numericalJacobian([-Infinity, -Infinity, -Infinity, -Infinity], [Infinity, Infinity, Infinity, Infinity]);
    // Python, same closed form, step 6.0554544523933395e-6 × 2801: |fd − exact|/|exact| = 0.0017252074657150079
    const exact = -0.03199999999999417;
    expect(Math.abs(jac[1 * x.length + 212] - exact) / Math.abs(exact)).toBeCloseTo(0.0017252074657150079, 5);
  });
});
