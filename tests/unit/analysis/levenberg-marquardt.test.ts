/** The bound-constrained Levenberg–Marquardt core on small problems with known answers. */
import { describe, expect, it } from "vitest";
import { fitCurve, minimizeLeastSquares, type LeastSquaresProblem } from "@/lib/analysis/fit";

function rosenbrock(lower = [-Infinity, -Infinity], upper = [Infinity, Infinity]): LeastSquaresProblem {
  return {
    m: 2,
    n: 2,
    lower: Float64Array.from(lower),
    upper: Float64Array.from(upper),
    residuals(p, out) {
      out[0] = 10 * (p[1] - p[0] * p[0]);
      out[1] = 1 - p[0];
    },
    jacobian(p, out) {
      // column-major: out[j*m + i]
      out[0] = -20 * p[0];
      out[1] = -1;
      out[2] = 10;
      out[3] = 0;
    },
  };
}

describe("minimizeLeastSquares", () => {
  it("finds the Rosenbrock minimum (1, 1) from the classic start (−1.2, 1)", () => {
    const outcome = minimizeLeastSquares(rosenbrock(), [-1.2, 1]);
    expect(outcome.converged).toBe(true);
    expect(outcome.params[0]).toBeCloseTo(1, 10);
    expect(outcome.params[1]).toBeCloseTo(1, 10);
    expect(outcome.reason).toBe("zero residuals");
  });

  it("stops on the bound when the minimum lies outside the box", () => {
    const outcome = minimizeLeastSquares(rosenbrock([-2, -2], [0.5, 2]), [-1.2, 1]);
    expect(outcome.converged).toBe(true);
    expect(outcome.params[0]).toBe(0.5);
    // On x₁ = 0.5 the best x₂ is x₁² = 0.25.
    expect(outcome.params[1]).toBeCloseTo(0.25, 8);
  });

  it("projects a start point outside the bounds into the box", () => {
    const outcome = minimizeLeastSquares(rosenbrock([0, 0], [3, 3]), [-5, 10]);
    expect(outcome.params[0]).toBeCloseTo(1, 8);
  });

  it("reports max iterations when stopped early", () => {
    const outcome = minimizeLeastSquares(rosenbrock(), [-1.2, 1], {
      maxIterations: 2,
      ftol: 1e-12,
      xtol: 1e-12,
      gtol: 0,
      stepFactor: 1,
    });
    expect(outcome.converged).toBe(false);
    expect(outcome.reason).toBe("max iterations");
    expect(outcome.iterations).toBe(2);
  });

  it("refuses a model that is not finite at the start", () => {
    const problem = { ...rosenbrock(), residuals: (_p: Float64Array, out: Float64Array) => out.fill(Number.NaN) };
    const outcome = minimizeLeastSquares(problem, [0, 0]);
    expect(outcome.converged).toBe(false);
    expect(outcome.reason).toBe("model not finite at the start values");
  });
});

describe("fitCurve", () => {
  const x = [0, 1, 2, 3, 4, 5];
  const y = [1.1, 2.9, 5.2, 6.8, 9.1, 11.0];
  const line = { evaluate: (t: number, p: ArrayLike<number>) => p[0] + p[1] * t };

  it("reproduces the closed-form straight-line regression and its standard errors", () => {
    const result = fitCurve(line, { x, y }, { start: [0, 0] });
    const n = x.length;
    const mx = x.reduce((a, b) => a + b) / n;
    const my = y.reduce((a, b) => a + b) / n;
    const sxx = x.reduce((a, t) => a + (t - mx) ** 2, 0);
    const slope = x.reduce((a, t, i) => a + (t - mx) * (y[i] - my), 0) / sxx;
    const intercept = my - slope * mx;
    const rss = y.reduce((a, v, i) => a + (v - intercept - slope * x[i]) ** 2, 0);
    const s2 = rss / (n - 2);
    expect(result.params[0]).toBeCloseTo(intercept, 10);
    expect(result.params[1]).toBeCloseTo(slope, 10);
    expect(result.stderr[1]).toBeCloseTo(Math.sqrt(s2 / sxx), 10);
    expect(result.stderr[0]).toBeCloseTo(Math.sqrt(s2 * (1 / n + (mx * mx) / sxx)), 10);
    expect(result.chi2).toBeCloseTo(rss, 10);
    expect(result.dof).toBe(4);
    expect(result.residuals[0]).toBeCloseTo(y[0] - intercept, 10);
  });

  it("is deterministic", () => {
    const a = fitCurve(line, { x, y }, { start: [3, -1] });
    const b = fitCurve(line, { x, y }, { start: [3, -1] });
    expect(b).toEqual(a);
  });

  it("reports NaN standard errors and 'undetermined' for a parameter the data cannot see", () => {
    const degenerate = { evaluate: (t: number, p: ArrayLike<number>) => p[0] + p[1] * t + 0 * p[2] };
    const result = fitCurve(degenerate, { x, y }, { start: [0, 0, 1] });
    expect(result.undetermined).toEqual([false, false, true]);
    expect(result.stderr[2]).toBeNaN();
    expect(result.stderr[1]).toBeGreaterThan(0);
  });
});
