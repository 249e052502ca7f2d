/** fitModel: bounds, fixed parameters, per-point σ, input validation and warnings. */
import { describe, expect, it } from "vitest";
import { FitInputError, fitModel, getModel, type FitModel } from "@/lib/analysis";
import { linspace, seededRandom, synthesize } from "./seeded-random";

const hahn = getModel("hahn_echo")!;
const x = linspace(0, 300, 200);
const truth = [0.5, 0.3, 80, 2];
const y = synthesize((t, p) => hahn.evaluate(t, p), truth, x, 0.01, seededRandom(7));

function fieldOf(fn: () => unknown): string {
  try {
    fn();
  } catch (error) {
    expect(error).toBeInstanceOf(FitInputError);
    return (error as FitInputError).field;
  }
  throw new Error("expected a FitInputError");
}

describe("fitModel options", () => {
  it("returns named parameters with units, values by name, model id and version", () => {
    const result = fitModel("hahn_echo", { x, y });
    expect(result.modelId).toBe("hahn_echo");
    expect(result.modelVersion).toBe(hahn.version);
    expect(result.params.map((p) => [p.name, p.unit])).toEqual([
      ["S0", "y"],
      ["A", "y"],
      ["T2", "x"],
      ["n", "1"],
    ]);
    expect(result.values.T2).toBe(result.params[2].value);
    expect(result.warnings).toEqual([]);
    expect(result.covariance[2][2]).toBeCloseTo(result.stderr[2] ** 2, 12);
    expect(result.correlation[2][2]).toBeCloseTo(1, 12);
    expect(result.r2).toBeGreaterThan(0.95);
    expect(Number.isFinite(result.aic) && Number.isFinite(result.bic)).toBe(true);
    expect(result.residuals).toHaveLength(x.length);
  });

  it("holds fixed parameters at their value, with zero error and one more degree of freedom", () => {
    const free = fitModel("hahn_echo", { x, y });
    const result = fitModel("hahn_echo", { x, y, fixed: { n: 2 } });
    expect(result.values.n).toBe(2);
    expect(result.params[3]).toMatchObject({ fixed: true, stderr: 0, atBound: false });
    expect(result.dof).toBe(free.dof + 1);
    expect(Math.abs(result.values.T2 - 80)).toBeLessThan(3 * result.params[2].stderr);
  });

  it("keeps a parameter inside user bounds and flags it at the bound", () => {
    const result = fitModel("hahn_echo", { x, y, bounds: { T2: [1, 60] } });
    expect(result.values.T2).toBe(60);
    expect(result.params[2].atBound).toBe(true);
    expect(result.params[2].bounds).toEqual([1, 60]);
    expect(result.warnings).toContain("hit a bound: T2");
    expect(result.converged).toBe(true);
  });

  it("applies the model's default bounds (hahn_echo n within 0.5–4)", () => {
    const flat = x.map((t) => 0.5 + 0.3 * (t < 100 ? 1 : 0));
    const result = fitModel("hahn_echo", { x, y: flat });
    expect(result.values.n).toBeLessThanOrEqual(4);
    expect(result.params[3].bounds).toEqual([0.5, 4]);
  });

  it("uses per-point σ as weights: a point with huge σ barely matters, χ²ᵣ ≈ 1 with true σ", () => {
    const sigma = x.map(() => 0.01);
    const spoiled = [...y];
    spoiled[50] += 5;
    sigma[50] = 1e6;
    const weighted = fitModel("hahn_echo", { x, y: spoiled, sigma });
    const keep = (_: number, i: number): boolean => i !== 50;
    const without = fitModel("hahn_echo", { x: x.filter(keep), y: y.filter(keep) });
    expect(weighted.values.T2).toBeCloseTo(without.values.T2, 6);
    const clean = fitModel("hahn_echo", { x, y, sigma: x.map(() => 0.01) });
    expect(Math.abs(clean.chi2red - 1)).toBeLessThan(0.3);
    expect(clean.stderrUnscaled[2]).toBeCloseTo(clean.stderr[2] / Math.sqrt(clean.chi2red), 10);
  });

  it("honours start values", () => {
    const result = fitModel("hahn_echo", { x, y, start: { T2: 50, n: 1 }, maxIterations: 1 });
    expect(result.params[2].start).toBe(50);
    expect(result.params[3].start).toBe(1);
  });

  it("warns when the fit did not converge", () => {
    const result = fitModel("hahn_echo", { x, y, start: { T2: 5, n: 3.5 }, maxIterations: 1 });
    expect(result.converged).toBe(false);
    expect(result.reason).toBe("max iterations");
    expect(result.warnings).toContain("did not converge");
  });

  it("warns about strongly correlated parameters", () => {
    const far = linspace(1000, 1010, 30);
    const line = far.map((t, i) => 2 + 0.5 * t + 0.01 * (((i * 7919) % 13) - 6));
    const result = fitModel("line", { x: far, y: line });
    expect(result.warnings).toContain("correlation > 0.95 between c0 and c1");
  });

  it("accepts a caller-supplied model (e.g. a NIST model) in place of an id", () => {
    const custom: FitModel = {
      id: "misra1a_like",
      title: "b1·(1 − exp(−b2·x))",
      formula: "y = b1·(1 − exp(−b2·x))",
      version: "1",
      kinds: ["other"],
      params: [
        { name: "b1", unit: "y", description: "" },
        { name: "b2", unit: "1/x", description: "" },
      ],
      evaluate: (t, p) => p[0] * (1 - Math.exp(-p[1] * t)),
      guess: () => [500, 1e-4],
    };
    const xs = linspace(10, 800, 14);
    const ys = xs.map((t) => 240 * (1 - Math.exp(-5.5e-4 * t)));
    const result = fitModel(custom, { x: xs, y: ys });
    expect(result.values.b1).toBeCloseTo(240, 6);
    expect(result.values.b2).toBeCloseTo(5.5e-4, 10);
  });
});

describe("fitModel input errors", () => {
  it("names the offending field", () => {
    expect(fieldOf(() => fitModel("no_such_model", { x, y }))).toBe("modelId");
    expect(fieldOf(() => fitModel("hahn_echo", { x: [1, 2, 3], y: [1, 2, 3] }))).toBe("x");
    expect(fieldOf(() => fitModel("hahn_echo", { x: [], y: [] }))).toBe("x");
    expect(fieldOf(() => fitModel("hahn_echo", { x, y: y.slice(1) }))).toBe("y");
    expect(fieldOf(() => fitModel("hahn_echo", { x: [...x.slice(1), Number.NaN], y }))).toBe("x");
    expect(fieldOf(() => fitModel("hahn_echo", { x, y: [...y.slice(1), Number.NaN] }))).toBe("y");
    expect(fieldOf(() => fitModel("hahn_echo", { x, y, sigma: x.map(() => 0) }))).toBe("sigma");
    expect(fieldOf(() => fitModel("hahn_echo", { x, y, sigma: [1] }))).toBe("sigma");
    expect(fieldOf(() => fitModel("hahn_echo", { x, y, start: { T3: 1 } }))).toBe("start");
    expect(fieldOf(() => fitModel("hahn_echo", { x, y, start: { T2: Number.NaN } }))).toBe("start");
    expect(fieldOf(() => fitModel("hahn_echo", { x, y, fixed: { m: 1 } }))).toBe("fixed");
    expect(fieldOf(() => fitModel("hahn_echo", { x, y, bounds: { tau: [0, 1] } }))).toBe("bounds");
    expect(fieldOf(() => fitModel("hahn_echo", { x, y, bounds: { T2: [10, 10] } }))).toBe("bounds");
    expect(fieldOf(() => fitModel("hahn_echo", { x, y, bounds: { T2: [10, 1] } }))).toBe("bounds");
    expect(fieldOf(() => fitModel("hahn_echo", { x, y, maxIterations: 0 }))).toBe("maxIterations");
  });

  it("allows as many points as free parameters once some are fixed", () => {
    const result = fitModel("hahn_echo", { x: [0, 50, 100], y: [0.8, 0.7, 0.55], fixed: { n: 2 } });
    expect(result.dof).toBe(0);
    expect(result.warnings).toContain("no degrees of freedom: standard errors are undefined");
  });
});
