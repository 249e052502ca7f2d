/**
 * Fits a curve model to (x, y, σ) data with bounds and fixed parameters, and reports the
 * conventional statistics. Parameter values and standard errors are in the model's own units.
 */
import { buildCurveProblem, type CurveData, type CurveFunction } from "./curve-problem";
import { computeCovariance } from "./covariance";
import { DEFAULT_SOLVER_OPTIONS, minimizeLeastSquares, releaseScratch, type SolverOptions } from "./levenberg-marquardt";

export interface CurveFitOptions {
  /** Start values for every parameter (the fixed ones keep these values). */
  start: ArrayLike<number>;
  /** true for parameters held at their start value. */
  fixed?: ArrayLike<boolean>;
  lower?: ArrayLike<number>;
  upper?: ArrayLike<number>;
  solver?: Partial<SolverOptions>;
}

export interface CurveFitResult {
  /** Fitted values of all parameters, fixed ones included. */
  params: number[];
  /** Standard errors from the covariance scaled by χ²ᵣ (0 for fixed, NaN if undetermined). */
  stderr: number[];
  /** Standard errors from (JᵀJ)⁻¹ alone: right when σ are the true per-point errors. */
  stderrUnscaled: number[];
  /** Covariance scaled by χ²ᵣ, consistent with stderr; rows of fixed parameters are 0. */
  covariance: number[][];
  correlation: number[][];
  /** Σ((yᵢ − f(xᵢ))/σᵢ)². */
  chi2: number;
  /** χ²/dof. */
  chi2red: number;
  /** Points minus free parameters. */
  dof: number;
  /** Weighted coefficient of determination. */
  r2: number;
  /** n·ln(χ²/n) + 2k, as lmfit. */
  aic: number;
  /** n·ln(χ²/n) + k·ln n. */
  bic: number;
  /** yᵢ − f(xᵢ), in y units (unweighted). */
  residuals: number[];
  iterations: number;
  evaluations: number;
  converged: boolean;
  reason: string;
  fixed: boolean[];
  atBound: boolean[];
  /** Free parameters the data do not determine (singular Jacobian). */
  undetermined: boolean[];
}

/** Within 1e-9 of the bound, relative to the box width (or to the value's scale if open). */
function isAtBound(value: number, lo: number, hi: number): boolean {
  const scale = Number.isFinite(hi - lo) ? hi - lo : Math.max(Math.abs(value), Number.isFinite(lo) ? Math.abs(lo) : Math.abs(hi), 1e-300);
  const tol = 1e-9 * scale;
  return (Number.isFinite(lo) && value - lo <= tol) || (Number.isFinite(hi) && hi - value <= tol);
}

export function fitCurve(model: CurveFunction, data: CurveData, options: CurveFitOptions): CurveFitResult {
  const nAll = options.start.length;
  const fixed = Array.from({ length: nAll }, (_, j) => Boolean(options.fixed?.[j]));
  const lower = Array.from({ length: nAll }, (_, j) => options.lower?.[j] ?? -Infinity);
  const upper = Array.from({ length: nAll }, (_, j) => options.upper?.[j] ?? Infinity);
  const problem = buildCurveProblem(model, data, options.start, fixed, lower, upper);
  const { m, n, freeIndex } = problem;
  const start = new Float64Array(n);
  for (let k = 0; k < n; k++) start[k] = options.start[freeIndex[k]];

  const outcome = minimizeLeastSquares(problem, start, { ...DEFAULT_SOLVER_OPTIONS, ...options.solver });
  const params = Array.from(problem.expand(outcome.params));

  let jacobian = outcome.jacobian;
  if (!jacobian) {
    jacobian = new Float64Array(m * n);
    problem.jacobian(outcome.params, jacobian);
  }
  const { covariance: cov, undetermined: undeterminedFree } = computeCovariance(jacobian, m, n);
  // computeCovariance has overwritten the Jacobian; its storage (and, below, the residuals') serves the next fit.
  releaseScratch(jacobian);

  const chi2 = outcome.sumOfSquares;
  const dof = m - n;
  const chi2red = dof > 0 ? chi2 / dof : Number.NaN;

  const stderr = new Array<number>(nAll).fill(0);
  const stderrUnscaled = new Array<number>(nAll).fill(0);
  const covariance = Array.from({ length: nAll }, () => new Array<number>(nAll).fill(0));
  const correlation = Array.from({ length: nAll }, () => new Array<number>(nAll).fill(0));
  const undetermined = new Array<boolean>(nAll).fill(false);
  for (let a = 0; a < n; a++) {
    const i = freeIndex[a];
    undetermined[i] = undeterminedFree[a];
    stderrUnscaled[i] = Math.sqrt(cov[a * n + a]);
    stderr[i] = Math.sqrt(cov[a * n + a] * chi2red);
    for (let b = 0; b < n; b++) {
      const j = freeIndex[b];
      covariance[i][j] = cov[a * n + b] * chi2red;
      correlation[i][j] = cov[a * n + b] / Math.sqrt(cov[a * n + a] * cov[b * n + b]);
    }
  }

  const residuals = new Array<number>(m);
  let sumW = 0;
  let sumWY = 0;
  for (let i = 0; i < m; i++) {
    const s = data.sigma ? data.sigma[i] : 1;
    residuals[i] = -outcome.residuals[i] * s;
    const w = 1 / (s * s);
    sumW += w;
    sumWY += w * data.y[i];
  }
  releaseScratch(outcome.residuals);
  const meanY = sumWY / sumW;
  let total = 0;
  for (let i = 0; i < m; i++) {
    const s = data.sigma ? data.sigma[i] : 1;
    total += ((data.y[i] - meanY) / s) ** 2;
  }
  const r2 = total > 0 ? 1 - chi2 / total : Number.NaN;
  const logLikelihoodTerm = m * Math.log(chi2 / m);

  return {
    params,
    stderr,
    stderrUnscaled,
    covariance,
    correlation,
    chi2,
    chi2red,
    dof,
    r2,
    aic: logLikelihoodTerm + 2 * n,
    bic: logLikelihoodTerm + n * Math.log(m),
    residuals,
    iterations: outcome.iterations,
    evaluations: outcome.evaluations,
    converged: outcome.converged,
    reason: outcome.reason,
    fixed,
    atBound: params.map((v, j) => !fixed[j] && isAtBound(v, lower[j], upper[j])),
    undetermined,
  };
}
