import "server-only";
import type { SampledCurve } from "@/lib/analysis";
import { axisTitle } from "@/lib/data/format";

export interface DerivedFileInput {
  sourceVersionId: string;
  sourceSha256: string;
  modelId: string;
  modelVersion: string;
  xName: string;
  xUnit: string | null;
  yName: string;
  yUnit: string | null;
  parameters: Array<{ name: string; value: number; stderr: number; unit: string }>;
  chi2red: number;
  curve: SampledCurve;
  dataX: ArrayLike<number>;
  dataY: ArrayLike<number>;
  residuals: ArrayLike<number>;
}

const fmt = (v: number) => (Number.isFinite(v) ? String(v) : "");

/**
 * The derived version of an analysis, long format so one table carries all three series:
 * the fitted curve on a fine grid, the data points it was fitted to, and the residuals (y − model).
 * The header block records what it came from, so the file is traceable on its own.
 */
export function derivedCsv(d: DerivedFileInput): string {
  const lines = [
    `# derived from version: ${d.sourceVersionId}`,
    `# source sha256: ${d.sourceSha256}`,
    `# model: ${d.modelId} (version ${d.modelVersion})`,
    ...d.parameters.map((p) => `# parameter ${p.name}: ${fmt(p.value)} ± ${fmt(p.stderr)} ${p.unit}`.trimEnd()),
    `# reduced chi-square: ${fmt(d.chi2red)}`,
    `series,${axisTitle(d.xName, d.xUnit)},${axisTitle(d.yName, d.yUnit)}`,
  ];
  for (let i = 0; i < d.curve.x.length; i++) lines.push(`curve,${fmt(d.curve.x[i])},${fmt(d.curve.y[i])}`);
  for (let i = 0; i < d.dataX.length; i++) lines.push(`data,${fmt(d.dataX[i])},${fmt(d.dataY[i])}`);
  for (let i = 0; i < d.dataX.length; i++) lines.push(`residual,${fmt(d.dataX[i])},${fmt(d.residuals[i])}`);
  return lines.join("\n") + "\n";
}
