// A model's whole-dataset sweep (the fitter's fast path) must say what its point-by-point
// evaluate and jacobian say: the weighted residuals and every weighted column, at points both
// sides of the data's features, and a fit with a parameter held fixed must land where the
// point-by-point path lands.
import { describe, expect, it } from "vitest";
import { fitCurve } from "@/lib/analysis/fit/fit-curve";
import { listModels } from "@/lib/analysis/models/registry";
import type { FitModel } from "@/lib/analysis/models/types";

const swept = listModels().filter((m) => m.prepareSweep);

/** Test points per model: x grid, a parameter vector (hand-picked, in the models' own units). */
const CASES: Record<string, { x: number[]; p: number[] }> = {
  hahn_echo: { x: [0, 0.5, 3, 40, 80, 120, 299], p: [0.51, 0.29, 78.5, 1.8] },
  odmr_14n_triplet: { x: [2860, 2868.1, 2869.2, 2870.3, 2871.9, 2879.5], p: [1.002, 2870.28, 2.16, 0.61, 0.048] },
  odmr_15n_doublet: { x: [2860, 2868.5, 2869.9, 2871.6, 2879.5], p: [0.998, 2870.1, 3.03, 0.7, 0.03] },
};

describe("whole-dataset sweeps agree with the point-by-point model", () => {
  it("every model with a sweep has a case here", () => {
    expect(swept.map((m) => m.id).sort()).toEqual(Object.keys(CASES).sort());
  });

  for (const model of swept) {
    it(`${model.id}: weighted residuals and Jacobian columns`, () => {
      const { x, p } = CASES[model.id];
      const m = x.length;
      const y = x.map((_, i) => 0.9 + 0.01 * i);
      const weight = x.map((_, i) => 1 / (0.01 + 0.002 * i));
      const residuals = new Float64Array(m);
      const jac = new Float64Array(m * p.length);
      model.prepareSweep!(new Float64Array(x), new Float64Array(y), new Float64Array(weight))(p, residuals, jac);
      const row = new Float64Array(p.length);
      for (let i = 0; i < m; i++) {
        expect(residuals[i]).toBeCloseTo((model.evaluate(x[i], p) - y[i]) * weight[i], 9);
        model.jacobian!(x[i], p, row);
        for (let j = 0; j < p.length; j++) expect(jac[j * m + i]).toBeCloseTo(row[j] * weight[i], 9);
      }
    });
  }

  it("a fit with a fixed parameter lands where the point-by-point path lands", () => {
    const model = swept.find((m) => m.id === "hahn_echo")!;
    const pointwise: FitModel = { ...model, prepareSweep: undefined };
    const x = Array.from({ length: 60 }, (_, i) => 5 * i);
    // Hand-made wobble instead of noise, so the data are not the model's own curve.
    const y = x.map((t, i) => 0.5 + 0.3 * Math.exp(-((t / 80) ** 2)) + 0.004 * Math.sin(1.7 * i));
    const options = {
      start: [0.5, 0.3, 70, 2],
      fixed: [false, false, false, true],
      lower: [-Infinity, -Infinity, 1e-3, 0.5],
      upper: [Infinity, Infinity, 1e5, 4],
    };
    const fast = fitCurve(model, { x, y }, options);
    const slow = fitCurve(pointwise, { x, y }, options);
    expect(fast.params[3]).toBe(2);
    for (let j = 0; j < 3; j++) expect(fast.params[j]).toBeCloseTo(slow.params[j], 9);
  });
});
