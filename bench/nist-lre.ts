/**
 * `npx tsx bench/nist-lre.ts`: the accuracy table of the fitter against NIST StRD nonlinear
 * regression (all 27 datasets in tests/fixtures/nist-strd, both certified start points), printed
 * and written to bench/results/nist-lre.json. Run by hand after changing the fitter; the reference
 * test (tests/reference/fit/nist-strd.test.ts) checks the same fits against the thresholds and
 * writes nothing. Accuracy, not speed: the numbers do not depend on the machine.
 */
import fs from "node:fs";
import path from "node:path";
import { agreement, fitNist, KNOWN_SHORTFALLS, loadNistDatasets, REQUIRED } from "../tests/reference/fit/nist-lre";
import { printTable } from "./report";

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

const rows: LreRow[] = [];
for (const dataset of loadNistDatasets()) {
  for (const [index, start] of [dataset.start1, dataset.start2].entries()) {
    const result = fitNist(dataset, start);
    const { paramLre, stdDevLre, rssLre } = agreement(dataset, result);
    rows.push({
      dataset: dataset.name,
      start: index + 1,
      minParamLre: Number(Math.min(...paramLre).toFixed(1)),
      minStdDevLre: Number(Math.min(...stdDevLre).toFixed(1)),
      rssLre: Number(rssLre.toFixed(1)),
      iterations: result.iterations,
      converged: result.converged,
      reason: result.reason,
    });
  }
}
rows.sort((a, b) => a.dataset.localeCompare(b.dataset) || a.start - b.start);

printTable([
  ["dataset", "start", "min LRE params", "min LRE std. dev.", "LRE RSS", "iterations", "converged", "reason"],
  ...rows.map((r) => [r.dataset, r.start, r.minParamLre, r.minStdDevLre, r.rssLre, r.iterations, String(r.converged), r.reason]),
]);

const document = {
  source: "NIST StRD, Nonlinear Regression (tests/fixtures/nist-strd/*.dat)",
  measure: "LRE = −log10(|x − c|/|c|), capped at 11; minimum over parameters and over standard deviations",
  required: REQUIRED,
  knownShortfalls: KNOWN_SHORTFALLS,
  rows,
};
const out = path.join(process.cwd(), "bench", "results", "nist-lre.json");
fs.mkdirSync(path.dirname(out), { recursive: true });
fs.writeFileSync(out, `${JSON.stringify(document, null, 2)}\n`);
console.log(`\nWrote ${path.relative(process.cwd(), out)} (${rows.length} fits)`);
