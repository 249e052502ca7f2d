/** Reads a NIST StRD nonlinear-regression .dat file (public domain, NIST/ITL). */
import { readFileSync } from "node:fs";
import { basename } from "node:path";

export interface NistDataset {
  name: string;
  start1: number[];
  start2: number[];
  certified: number[];
  certifiedStdDev: number[];
  residualSumOfSquares: number;
  residualStdDev: number;
  degreesOfFreedom: number;
  observations: number;
  /** Response column. */
  y: number[];
  /** Predictor columns: predictors[0] is x (or x1), predictors[1] is x2 when present. */
  predictors: number[][];
}

function headerNumber(text: string, label: string): number {
  const match = new RegExp(`${label}:\\s+(\\S+)`).exec(text);
  if (!match) throw new Error(`missing "${label}"`);
  return Number(match[1]);
}

export function parseNistFile(path: string): NistDataset {
  const text = readFileSync(path, "utf8").replace(/\r/g, "");
  const lines = text.split("\n");
  const start1: number[] = [];
  const start2: number[] = [];
  const certified: number[] = [];
  const certifiedStdDev: number[] = [];
  const paramLine = /^\s*b(\d+)\s*=\s*(\S+)\s+(\S+)\s+(\S+)\s+(\S+)\s*$/;
  for (const line of lines) {
    const match = paramLine.exec(line);
    if (!match) continue;
    const index = Number(match[1]) - 1;
    start1[index] = Number(match[2]);
    start2[index] = Number(match[3]);
    certified[index] = Number(match[4]);
    certifiedStdDev[index] = Number(match[5]);
  }
  const dataHeader = lines.findIndex((line) => /^\s*Data:\s+y\s/.test(line));
  if (dataHeader < 0) throw new Error(`${path}: no data header`);
  const columns = lines[dataHeader].trim().split(/\s+/).length - 1;
  const y: number[] = [];
  const predictors: number[][] = Array.from({ length: columns - 1 }, () => []);
  for (const line of lines.slice(dataHeader + 1)) {
    const fields = line.trim().split(/\s+/).filter(Boolean).map(Number);
    if (fields.length !== columns) continue;
    y.push(fields[0]);
    fields.slice(1).forEach((v, c) => predictors[c].push(v));
  }
  const dataset: NistDataset = {
    name: basename(path, ".dat"),
    start1,
    start2,
    certified,
    certifiedStdDev,
    residualSumOfSquares: headerNumber(text, "Residual Sum of Squares"),
    residualStdDev: headerNumber(text, "Residual Standard Deviation"),
    degreesOfFreedom: headerNumber(text, "Degrees of Freedom"),
    observations: headerNumber(text, "Number of Observations"),
    y,
    predictors,
  };
  if (y.length !== dataset.observations) throw new Error(`${path}: read ${y.length} rows`);
  if ([start1, start2, certified, certifiedStdDev].some((a) => a.length === 0 || a.some(Number.isNaN))) {
    throw new Error(`${path}: bad parameter table`);
  }
  return dataset;
}
