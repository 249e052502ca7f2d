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
  /** The column whose values weighted the fit as per-point σ (y units); null for an unweighted fit. */
  sigmaColumn: string | null;
  /** The fit window [from, to] in x units (options.xRange); absent when every point was fitted. */
  xRange?: readonly [number, number];
  /** stderr is NaN for a parameter the data do not determine; `fixed` ones were held, not fitted. */
  parameters: Array<{ name: string; value: number; stderr: number; unit: string; fixed?: boolean }>;
  /** Quantities computed from the parameters, errors propagated through the scaled covariance. */
  derived?: Array<{ name: string; value: number; stderr: number; unit: string; formula: string }>;
  /** Percentile intervals from a residual bootstrap, when one was run. */
  bootstrap?: {
    draws: number;
    seed: number;
    used: number;
    intervals: Array<{ name: string; unit: string; interval68: Array<number | null>; interval95: Array<number | null> }>;
  } | null;
  chi2red: number;
  /** Points minus free parameters. */
  dof: number;
  curve: SampledCurve;
  dataX: ArrayLike<number>;
  dataY: ArrayLike<number>;
  residuals: ArrayLike<number>;
}

const fmt = (v: number) => (Number.isFinite(v) ? String(v) : "");

function valueWithError(p: { value: number; stderr: number; unit: string; fixed?: boolean }): string {
  const unit = p.unit ? ` ${p.unit}` : "";
  if (p.fixed) return `${fmt(p.value)}${unit} (held fixed, not fitted)`;
  if (!Number.isFinite(p.stderr)) return `${fmt(p.value)}${unit} (not determined by the data: no standard error)`;
  return `${fmt(p.value)} ± ${fmt(p.stderr)}${unit}`;
}

const bound = (v: number | null) => (v === null ? "" : fmt(v));

function bootstrapLines(b: NonNullable<DerivedFileInput["bootstrap"]>): string[] {
  return [
    `# bootstrap: residual resampling, ${b.draws} draws (seed ${b.seed}), ${b.used} refits converged; percentile intervals, central 68.27 % and 95 %`,
    ...b.intervals.map(
      (q) =>
        `# bootstrap ${q.name}: 68 % [${bound(q.interval68[0])}, ${bound(q.interval68[1])}], 95 % [${bound(q.interval95[0])}, ${bound(q.interval95[1])}]${q.unit ? ` ${q.unit}` : ""}`,
    ),
  ];
}

/**
 * The derived version of an analysis, long format so one table carries all three series:
 * the fitted curve on a fine grid, the data points it was fitted to, and the residuals (y − model).
 * The header block records what it came from and how its errors were obtained (weights, scaling
 * by √χ²ᵣ), so the file is traceable and readable on its own.
 */
export function derivedCsv(d: DerivedFileInput): string {
  const lines = [
    `# derived from version: ${d.sourceVersionId}`,
    `# source sha256: ${d.sourceSha256}`,
    `# model: ${d.modelId} (version ${d.modelVersion})`,
    d.sigmaColumn
      ? `# weights: 1/σ² per point, σ from the column "${d.sigmaColumn}" (y units)`
      : "# weights: none (unweighted least squares: every point counts equally, σ = 1)",
    ...(d.xRange
      ? [`# fit window: only points with ${d.xName} from ${d.xRange[0]} to ${d.xRange[1]}${d.xUnit ? ` ${d.xUnit}` : ""} were fitted (the data rows below)`]
      : []),
    "# errors: ± is one standard error from the covariance scaled by √χ²ᵣ (reduced chi-square below), as SciPy curve_fit with absolute_sigma=False; not a confidence interval",
    ...d.parameters.map((p) => `# parameter ${p.name}: ${valueWithError(p)}`),
    ...(d.derived ?? []).map((q) => `# derived ${q.name}: ${valueWithError(q)} [${q.formula}]`),
    ...(d.bootstrap ? bootstrapLines(d.bootstrap) : []),
    `# reduced chi-square: ${fmt(d.chi2red)} (${d.dof} degrees of freedom)`,
    `series,${axisTitle(d.xName, d.xUnit)},${axisTitle(d.yName, d.yUnit)}`,
  ];
  for (let i = 0; i < d.curve.x.length; i++) lines.push(`curve,${fmt(d.curve.x[i])},${fmt(d.curve.y[i])}`);
  for (let i = 0; i < d.dataX.length; i++) lines.push(`data,${fmt(d.dataX[i])},${fmt(d.dataY[i])}`);
  for (let i = 0; i < d.dataX.length; i++) lines.push(`residual,${fmt(d.dataX[i])},${fmt(d.residuals[i])}`);
  return lines.join("\n") + "\n";
}
