/**
 * NIST StRD nonlinear regression (NIST/ITL Statistical Reference Datasets, public domain), all
 * 27 datasets in tests/fixtures/nist-strd, each fitted from both certified start points with the
 * project's Levenberg–Marquardt fitter and central-difference Jacobians.
 *
 * Agreement is the log relative error LRE = −log10(|x − c|/|c|), capped at 11 (the certified
 * digits). Required: LRE ≥ 6 on every parameter and on the residual sum of squares, ≥ 4 on every
 * standard deviation — except where listed below, which are tested at the LRE actually reached:
 *
 * | dataset  | start | quantity            | LRE reached | threshold | why                              |
 * |----------|-------|---------------------|-------------|-----------|----------------------------------|
 * | Lanczos1 | 1     | std. dev. / RSS     | 3.2 / 2.9   | 2.5 / 2.5 | certified RSS 1.4e-25 is below   |
 * | Lanczos1 | 2     | std. dev. / RSS     | 3.0 / 2.7   | 2.5 / 2.5 | what doubles reach (REFERENCES)  |
 *
 * Lanczos1's parameters still agree to LRE ≈ 10.6; its standard deviations scale with √RSS and
 * so inherit the RSS shortfall. BoxBOD, MGH09 and MGH10 from start 1 reach full accuracy with the
 * default initial trust region (stepFactor 1); Rat43 uses n − p = 11 degrees of freedom, which is
 * what reproduces its certified standard deviations (the header's "9" does not).
 *
 * Settings: tolerances ftol = xtol = 1e-15 (reference precision; the defaults, 1e-12, stop once
 * further changes are about 1e-5 standard errors, enough for data but not for 6-digit agreement
 * on ENSO's poorly determined b8) and up to 1000 iterations (Bennett5 from start 1 takes ~750).
 */
import { mkdirSync, readdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { fitCurve, type CurveFitResult } from "@/lib/analysis/fit";
import { NIST_LOG_RESPONSE, NIST_MODELS } from "./nist-models";
import { parseNistFile, type NistDataset } from "./nist-parse";

const FIXTURES = join(__dirname, "../../fixtures/nist-strd");
const RESULTS = join(__dirname, "../../../bench/results/nist-lre.json");
const LRE_CAP = 11;
const REQUIRED = { params: 6, stdDev: 4, rss: 6 };

/** Datasets and starts that fall short of REQUIRED, with the thresholds they are held to. */
const KNOWN_SHORTFALLS: Record<string, Partial<typeof REQUIRED>> = {
  "Lanczos1/1": { stdDev: 2.5, rss: 2.5 },
  "Lanczos1/2": { stdDev: 2.5, rss: 2.5 },
};

function logRelativeError(value: number, certified: number): number {
  if (value === certified) return LRE_CAP;
  const lre = -Math.log10(Math.abs(value - certified) / Math.abs(certified));
  return Number.isNaN(lre) ? 0 : Math.min(LRE_CAP, Math.max(0, lre));
}

interface LreRow {
  dataset: string;
  start: number;
  minParamLre: number;
  minStdDevLre: number;
  rssLre: number;
  iterations: number;
  converged: boolean;
  reason: string;
}

function fitNist(dataset: NistDataset, start: number[]): CurveFitResult {
  const model = NIST_MODELS[dataset.name];
  const [x1, x2 = []] = dataset.predictors;
  const y = NIST_LOG_RESPONSE.has(dataset.name) ? dataset.y.map(Math.log) : dataset.y;
  // The row index serves as x so that two-predictor models (Nelson) fit the same interface.
  const rows = y.map((_, i) => i);
  return fitCurve(
    { evaluate: (i, b) => model(b, x1[i], x2[i]) },
    { x: rows, y },
    { start, solver: { ftol: 1e-15, xtol: 1e-15, maxIterations: 1000 } },
  );
}

const datasets = readdirSync(FIXTURES)
  .filter((file) => file.endsWith(".dat"))
  .sort()
  .map((file) => parseNistFile(join(FIXTURES, file)));
const rows: LreRow[] = [];

describe("NIST StRD nonlinear regression", () => {
  it("reads all 27 datasets and has a model for each", () => {
    expect(datasets).toHaveLength(27);
    for (const dataset of datasets) expect(NIST_MODELS[dataset.name], dataset.name).toBeTypeOf("function");
  });

  for (const dataset of datasets) {
    for (const [index, start] of [dataset.start1, dataset.start2].entries()) {
      const key = `${dataset.name}/${index + 1}`;
      const source = `NIST StRD, Nonlinear Regression, ${dataset.name}.dat, start ${index + 1}`;
      it(source, () => {
        const result = fitNist(dataset, start);
        const paramLre = result.params.map((v, j) => logRelativeError(v, dataset.certified[j]));
        const stdDevLre = result.stderr.map((v, j) => logRelativeError(v, dataset.certifiedStdDev[j]));
        const rssLre = logRelativeError(result.chi2, dataset.residualSumOfSquares);
        const row: LreRow = {
          dataset: dataset.name,
          start: index + 1,
          minParamLre: Number(Math.min(...paramLre).toFixed(1)),
          minStdDevLre: Number(Math.min(...stdDevLre).toFixed(1)),
          rssLre: Number(rssLre.toFixed(1)),
          iterations: result.iterations,
          converged: result.converged,
          reason: result.reason,
        };
        rows.push(row);
        const required = { ...REQUIRED, ...KNOWN_SHORTFALLS[key] };
        expect(result.converged, `${source}: ${result.reason}`).toBe(true);
        expect(result.dof, `${source}: n − p`).toBe(dataset.observations - start.length);
        expect(Math.min(...paramLre), `${source}: parameters`).toBeGreaterThanOrEqual(required.params);
        expect(Math.min(...stdDevLre), `${source}: standard deviations`).toBeGreaterThanOrEqual(required.stdDev);
        expect(rssLre, `${source}: residual sum of squares`).toBeGreaterThanOrEqual(required.rss);
      });
    }
  }

  afterAll(() => {
    rows.sort((a, b) => a.dataset.localeCompare(b.dataset) || a.start - b.start);
    console.table(rows);
    mkdirSync(join(RESULTS, ".."), { recursive: true });
    const document = {
      source: "NIST StRD, Nonlinear Regression (tests/fixtures/nist-strd/*.dat)",
      measure: "LRE = −log10(|x − c|/|c|), capped at 11; minimum over parameters and over standard deviations",
      required: REQUIRED,
      knownShortfalls: KNOWN_SHORTFALLS,
      rows,
    };
    writeFileSync(RESULTS, `${JSON.stringify(document, null, 2)}\n`);
  });
});
