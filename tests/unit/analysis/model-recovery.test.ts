/**
 * Every model recovers known parameters from realistic noisy synthetic data with no start
 * values: the automatic guess must lead the fit to the truth, within 3 reported standard errors.
 */
import { describe, expect, it } from "vitest";
import { fitModel, getModel } from "@/lib/analysis";
import { seededRandom, synthesize } from "./seeded-random";
import { SYNTHETIC_CASES } from "./synthetic-cases";

describe("parameter recovery from synthetic data, automatic start values", () => {
  for (const testCase of SYNTHETIC_CASES) {
    const model = getModel(testCase.modelId)!;
    const truth = model.params.map((p) => testCase.truth[p.name]);

    it(`${model.id}: seed 1 within 3σ, χ²ᵣ ≈ 1`, () => {
      const y = synthesize((x, p) => model.evaluate(x, p), truth, testCase.x, testCase.noise, seededRandom(1));
      const result = fitModel(model.id, { x: testCase.x, y });
      expect(result.converged, result.reason).toBe(true);
      expect(result.warnings.filter((w) => w.startsWith("hit a bound"))).toEqual([]);
      result.params.forEach((param, j) => {
        expect(Math.abs(param.value - truth[j]), `${param.name} = ${param.value} ± ${param.stderr}`).toBeLessThan(3 * param.stderr);
      });
      // χ² of m − p degrees of freedom: χ²ᵣ within ±5 standard deviations of 1.
      expect(Math.abs(result.chi2red / testCase.noise ** 2 - 1)).toBeLessThan(5 * Math.sqrt(2 / result.dof));
    });

    it(`${model.id}: seeds 2–11 all converge to the truth (within 5σ)`, () => {
      for (let seed = 2; seed <= 11; seed++) {
        const y = synthesize((x, p) => model.evaluate(x, p), truth, testCase.x, testCase.noise, seededRandom(seed));
        const result = fitModel(model.id, { x: testCase.x, y });
        expect(result.converged, `seed ${seed}: ${result.reason}`).toBe(true);
        result.params.forEach((param, j) => {
          expect(Math.abs(param.value - truth[j]), `seed ${seed}: ${param.name}`).toBeLessThan(5 * param.stderr);
        });
      }
    });
  }

  it("fits the same data identically whatever the order of the points", () => {
    const model = getModel("hahn_echo")!;
    const testCase = SYNTHETIC_CASES.find((c) => c.modelId === "hahn_echo")!;
    const truth = model.params.map((p) => testCase.truth[p.name]);
    const y = synthesize((x, p) => model.evaluate(x, p), truth, testCase.x, testCase.noise, seededRandom(5));
    const order = testCase.x.map((_, i) => i).reverse();
    const sorted = fitModel("hahn_echo", { x: testCase.x, y });
    const reversed = fitModel("hahn_echo", { x: order.map((i) => testCase.x[i]), y: order.map((i) => y[i]) });
    sorted.params.forEach((param, j) => {
      expect(reversed.params[j].value).toBeCloseTo(param.value, 6);
    });
  });
});
