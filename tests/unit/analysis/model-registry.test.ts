/** Every registered model: metadata, derivatives against central differences, guesses, curves. */
import { describe, expect, it } from "vitest";
import { FitInputError, getModel, listModels, sampleCurve } from "@/lib/analysis";
import { SYNTHETIC_CASES } from "./synthetic-cases";

const KINDS = ["hahn_echo", "decoupling", "relaxation", "ramsey", "odmr", "pl_spectrum", "nv_nmr", "other"];
const UNITS = ["x", "y", "1/x", "1", "x*y", "y/x", "y/x^2", "y/x^3"];

describe("model registry", () => {
  const models = listModels();

  it("has unique snake_case ids, known kinds and units, and a version", () => {
    const ids = models.map((m) => m.id);
    expect(new Set(ids).size).toBe(ids.length);
    for (const model of models) {
      expect(model.id).toMatch(/^[a-z0-9]+(_[a-z0-9]+)*$/);
      expect(model.version).toMatch(/^\d+\.\d+\.\d+$/);
      expect(model.formula.length).toBeGreaterThan(5);
      for (const kind of model.kinds) expect(KINDS).toContain(kind);
      for (const param of model.params) expect(UNITS).toContain(param.unit);
      expect(new Set(model.params.map((p) => p.name)).size).toBe(model.params.length);
    }
  });

  it("includes every model the product needs", () => {
    for (const id of [
      "hahn_echo",
      "relaxation",
      "relaxation_stretched",
      "ramsey",
      "ramsey_14n",
      "odmr_lorentzian_1",
      "odmr_lorentzian_2",
      "odmr_lorentzian_3",
      "odmr_14n_triplet",
      "odmr_15n_doublet",
      "odmr_two_resonances",
      "odmr_14n_two_groups",
      "odmr_15n_two_groups",
      "exponential",
      "gaussian",
      "lorentzian",
      "pseudo_voigt",
      "voigt",
      "line",
      "polynomial_2",
      "polynomial_3",
    ]) {
      expect(getModel(id), id).toBeDefined();
    }
    expect(getModel("no_such_model")).toBeUndefined();
    expect(getModel("ramsey")!.params.map((p) => [p.name, p.unit])).toContainEqual(["T2star", "x"]);
    expect(getModel("ramsey")!.params.map((p) => [p.name, p.unit])).toContainEqual(["delta", "1/x"]);
    expect(getModel("hahn_echo")!.params.map((p) => p.name)).toEqual(["S0", "A", "T2", "n"]);
  });

  for (const testCase of SYNTHETIC_CASES) {
    const model = getModel(testCase.modelId)!;
    const truth = model.params.map((p) => testCase.truth[p.name]);

    it(`${model.id}: analytic derivatives match central differences`, () => {
      expect(model.jacobian).toBeTypeOf("function");
      const out = new Float64Array(truth.length);
      const xs = testCase.x.filter((_, i) => i % Math.ceil(testCase.x.length / 25) === 0);
      for (const x of xs) {
        model.jacobian!(x, truth, out);
        const analytic = Array.from(out);
        const value = model.valueAndJacobian ? model.valueAndJacobian(x, truth, out) : model.evaluate(x, truth);
        expect(value).toBeCloseTo(model.evaluate(x, truth), 12);
        truth.forEach((v, j) => {
          const h = 1e-7 * (Math.abs(v) || 1);
          const central = (step: number): number => {
            const plus = [...truth];
            const minus = [...truth];
            plus[j] += step;
            minus[j] -= step;
            return (model.evaluate(x, plus) - model.evaluate(x, minus)) / (2 * step);
          };
          // Richardson extrapolation: truncation O(h⁴); rounding stays about ε·|f|/h.
          const numeric = (4 * central(h / 2) - central(h)) / 3;
          const allowed = 1e-6 * Math.max(Math.abs(numeric), Math.abs(analytic[j])) + (1e3 * 2.2e-16 * (Math.abs(value) + 1)) / h;
          expect(Math.abs(analytic[j] - numeric), `${model.params[j].name} at x = ${x}`).toBeLessThan(allowed);
        });
      }
    });

    it(`${model.id}: guess and bounds have one entry per parameter, guess inside bounds`, () => {
      const y = testCase.x.map((x) => model.evaluate(x, truth));
      const guess = model.guess(testCase.x, y);
      expect(guess).toHaveLength(truth.length);
      guess.forEach((v) => expect(Number.isFinite(v)).toBe(true));
      const bounds = model.bounds?.(testCase.x, y);
      if (bounds) {
        expect(bounds).toHaveLength(truth.length);
        bounds.forEach(([lo, hi], j) => {
          expect(lo).toBeLessThan(hi);
          expect(truth[j], model.params[j].name).toBeGreaterThanOrEqual(lo);
          expect(truth[j], model.params[j].name).toBeLessThanOrEqual(hi);
        });
      }
    });
  }
});

describe("sampleCurve", () => {
  const params = { S0: 0.5, A: 0.3, T2: 80, n: 2 };

  it("samples a linear grid including both ends", () => {
    const curve = sampleCurve("hahn_echo", params, 0, 300, 301);
    expect(curve.x).toHaveLength(301);
    expect(curve.x[0]).toBe(0);
    expect(curve.x[300]).toBe(300);
    expect(curve.x[80]).toBeCloseTo(80, 12);
    expect(curve.y[0]).toBeCloseTo(0.8, 12);
    expect(curve.y[80]).toBeCloseTo(0.5 + 0.3 * Math.exp(-1), 12);
  });

  it("samples a log grid and accepts values as an array", () => {
    const curve = sampleCurve("relaxation", [0.2, 0.5, 1000], 1, 10000, 5, true);
    expect(curve.x.map((v) => Math.round(Math.log10(v) * 1e9) / 1e9)).toEqual([0, 1, 2, 3, 4]);
    expect(curve.y[3]).toBeCloseTo(0.2 + 0.5 * Math.exp(-1), 12);
  });

  it("rejects bad requests with a FitInputError naming the field", () => {
    const field = (fn: () => unknown): string | undefined => {
      try {
        fn();
      } catch (error) {
        expect(error).toBeInstanceOf(FitInputError);
        return (error as FitInputError).field;
      }
      return undefined;
    };
    expect(field(() => sampleCurve("nope", params, 0, 1, 10))).toBe("modelId");
    expect(field(() => sampleCurve("hahn_echo", { S0: 1 }, 0, 1, 10))).toBe("params");
    expect(field(() => sampleCurve("hahn_echo", params, 1, 1, 10))).toBe("xMin");
    expect(field(() => sampleCurve("hahn_echo", params, 0, 1, 1))).toBe("n");
    expect(field(() => sampleCurve("hahn_echo", params, 0, 1, 10, true))).toBe("xMin");
  });
});
