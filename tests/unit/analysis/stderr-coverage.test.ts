/**
 * Honest standard errors: over 400 synthetic data sets per model, the truth lies within one
 * reported standard error in about 68 % of fits (binomial sd ≈ 2.3 %, accepted 60–76 %).
 */
import { describe, expect, it } from "vitest";
import { fitModel, getModel } from "@/lib/analysis";
import { seededRandom, synthesize } from "./seeded-random";
import { SYNTHETIC_CASES } from "./synthetic-cases";

const SEEDS = 400;

function coverage(modelId: string, useKnownSigma: boolean): Record<string, number> {
  const model = getModel(modelId)!;
  const testCase = SYNTHETIC_CASES.find((c) => c.modelId === modelId)!;
  const truth = model.params.map((p) => testCase.truth[p.name]);
  const sigma = testCase.x.map(() => testCase.noise);
  const inside = model.params.map(() => 0);
  for (let seed = 1000; seed < 1000 + SEEDS; seed++) {
    const y = synthesize((x, p) => model.evaluate(x, p), truth, testCase.x, testCase.noise, seededRandom(seed));
    const result = fitModel(modelId, { x: testCase.x, y, ...(useKnownSigma ? { sigma } : {}) });
    expect(result.converged, `seed ${seed}`).toBe(true);
    result.params.forEach((param, j) => {
      const error = useKnownSigma ? result.stderrUnscaled[j] : param.stderr;
      if (Math.abs(param.value - truth[j]) <= error) inside[j]++;
    });
  }
  return Object.fromEntries(model.params.map((p, j) => [p.name, inside[j] / SEEDS]));
}

describe(`standard-error coverage over ${SEEDS} seeds`, () => {
  for (const modelId of ["hahn_echo", "odmr_14n_triplet"]) {
    it(`${modelId}: χ²ᵣ-scaled standard errors cover the truth ≈ 68 % of the time`, () => {
      const fractions = coverage(modelId, false);
      for (const [name, fraction] of Object.entries(fractions)) {
        expect(fraction, name).toBeGreaterThan(0.6);
        expect(fraction, name).toBeLessThan(0.76);
      }
    });

    it(`${modelId}: with the true σ given, unscaled standard errors cover ≈ 68 % too`, () => {
      const fractions = coverage(modelId, true);
      for (const [name, fraction] of Object.entries(fractions)) {
        expect(fraction, name).toBeGreaterThan(0.6);
        expect(fraction, name).toBeLessThan(0.76);
      }
    });
  }
});
