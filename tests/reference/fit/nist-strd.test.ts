/**
 * NIST StRD nonlinear regression (NIST/ITL Statistical Reference Datasets, public domain,
 * https://www.itl.nist.gov/div898/strd/nls/nls_main.shtml), all 27 datasets in
 * tests/fixtures/nist-strd (NIST's .dat files, unchanged), each fitted from both certified start
 * points with the project's Levenberg–Marquardt fitter and central-difference Jacobians. Every
 * expected value is a certified value read from the dataset's own file ("from NIST StRD <dataset>").
 *
 * Agreement is the log relative error LRE = −log10(|x − c|/|c|), capped at 11 (the certified
 * digits). Required: LRE ≥ 6 on every parameter and on the residual sum of squares, ≥ 4 on every
 * standard deviation — except where listed below, which are tested at the LRE actually reached:
 *
 * | dataset  | start | quantity            | LRE reached | threshold | why                              |
 * |----------|-------|---------------------|-------------|-----------|----------------------------------|
 * | Lanczos1 | 1     | std. dev. / RSS     | 3.2 / 2.9   | 2.5 / 2.5 | certified RSS 1.4e-25 is below   |
 * | Lanczos1 | 2     | std. dev. / RSS     | 3.0 / 2.7   | 2.5 / 2.5 | what doubles reach (Lanczos1.dat)|
 *
 * Lanczos1's parameters still agree to LRE ≈ 10.6; its standard deviations scale with √RSS and
 * so inherit the RSS shortfall. BoxBOD, MGH09 and MGH10 from start 1 reach full accuracy with the
 * default initial trust region (stepFactor 1); Rat43 uses n − p = 11 degrees of freedom, which is
 * what reproduces its certified standard deviations (the header's "9" does not).
 *
 * Settings: tolerances ftol = xtol = 1e-15 (reference precision; the defaults, 1e-12, stop once
 * further changes are about 1e-5 standard errors, enough for data but not for 6-digit agreement
 * on ENSO's poorly determined b8) and up to 1000 iterations (Bennett5 from start 1 takes ~750).
 *
 * This test writes nothing. The table of LRE reached per dataset (bench/results/nist-lre.json) is
 * produced by hand with `npx tsx bench/nist-lre.ts`.
 */
import { describe, expect, it } from "vitest";
import { NIST_MODELS } from "./nist-models";
import { agreement, fitNist, KNOWN_SHORTFALLS, loadNistDatasets, REQUIRED } from "./nist-lre";

const datasets = loadNistDatasets();

describe("NIST StRD nonlinear regression", () => {
  it("reads all 27 datasets and has a model for each", () => {
    expect(datasets).toHaveLength(27);
    for (const dataset of datasets) expect(NIST_MODELS[dataset.name], dataset.name).toBeTypeOf("function");
  });

  for (const dataset of datasets) {
    for (const [index, start] of [dataset.start1, dataset.start2].entries()) {
      const key = `${dataset.name}/${index + 1}`;
      const source = `certified values from NIST StRD ${dataset.name} (Nonlinear Regression, ${dataset.name}.dat), start ${index + 1}`;
      it(source, () => {
        const result = fitNist(dataset, start);
        const { paramLre, stdDevLre, rssLre } = agreement(dataset, result);
        const required = { ...REQUIRED, ...KNOWN_SHORTFALLS[key] };
        expect(result.converged, `${source}: ${result.reason}`).toBe(true);
        expect(result.dof, `${source}: n − p`).toBe(dataset.observations - start.length);
        expect(Math.min(...paramLre), `${source}: parameters`).toBeGreaterThanOrEqual(required.params);
        expect(Math.min(...stdDevLre), `${source}: standard deviations`).toBeGreaterThanOrEqual(required.stdDev);
        expect(rssLre, `${source}: residual sum of squares`).toBeGreaterThanOrEqual(required.rss);
      });
    }
  }
});
