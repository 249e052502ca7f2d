/**
 * Fits a registered (or caller-supplied) model to x/y data: validates the input, takes start
 * values from the model's guess unless given, applies default and user bounds, runs the
 * Levenberg–Marquardt fitter and names every parameter in the result. Values and standard
 * errors are in the units given by each parameter's UnitRole (x and y column units).
 */
import type { BootstrapSummary } from "./bootstrap";
import { fitCurve, type CurveFitResult } from "./fit/fit-curve";
import type { SolverOptions } from "./fit/levenberg-marquardt";
import { FitInputError } from "./fit-input-error";
import { judgeFit, type FitQuality } from "./fit-quality";
import { getModelOrThrow } from "./model-lookup";
import type { FitModel, UnitRole } from "./models/types";

export interface FitInput {
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  /** Per-point standard deviation of y, in y units. */
  sigma?: ArrayLike<number>;
  /** Start values by parameter name; the others come from the model's guess. */
  start?: Record<string, number>;
  /** Parameters held at these values. */
  fixed?: Record<string, number>;
  /** Bounds by parameter name, replacing the model's defaults. */
  bounds?: Record<string, [number, number]>;
  maxIterations?: number;
  /** Unit of the x column (e.g. "MHz", "µs"): lets the fit be checked against physical ranges. */
  xUnit?: string | null;
  /** Solver tolerances, for reference tests; the defaults suit measured data. */
  solver?: Partial<Omit<SolverOptions, "maxIterations">>;
}

interface FittedParam {
  name: string;
  value: number;
  /** Standard error scaled by √χ²ᵣ; 0 for fixed parameters, NaN when undetermined. */
  stderr: number;
  unit: UnitRole;
  fixed: boolean;
  atBound: boolean;
  start: number;
  bounds: [number, number];
}

/** A quantity computed from the fitted parameters, with its error propagated through the covariance. */
interface DerivedValue {
  name: string;
  value: number;
  /** √(gᵀ·C·g) with the scaled covariance C and the gradient g; NaN when the covariance is undetermined. */
  stderr: number;
  unit: UnitRole;
  description: string;
  formula: string;
}

export interface ModelFitResult extends Omit<CurveFitResult, "params"> {
  modelId: string;
  modelVersion: string;
  params: FittedParam[];
  derived: DerivedValue[];
  /**
   * Judgements in words: the model's on its derived values (e.g. whether g⁽²⁾(0) shows a single
   * emitter), and why parameters are reported as not determined when the data cannot support them.
   */
  verdicts: string[];
  /** Fitted values by parameter name. */
  values: Record<string, number>;
  warnings: string[];
  /** Whether the fit describes the data, beyond the solver having converged (lib/analysis/fit-quality). */
  quality: FitQuality;
  /** Bootstrap percentile intervals, when asked for (lib/analysis/bootstrap; fitModel never fills it). */
  bootstrap?: BootstrapSummary;
}

const CORRELATION_WARNING = 0.95;
/** An amplitude within this many standard errors of zero cannot be told from zero (≈ 95 % two-sided). */
const AMPLITUDE_Z = 2;
/**
 * Weighted residuals this small against the largest weighted |y| are rounding error: the curve
 * passes through every point, and errors scaled by √χ²ᵣ would come out as zero.
 */
const EXACT_FIT_RELATIVE = 1e-13;

export function fitModel(modelId: string | FitModel, input: FitInput): ModelFitResult {
  const model = getModelOrThrow(modelId);
  validateData(input);
  const names = model.params.map((p) => p.name);
  const indexOf = (field: string, name: string): number => {
    const j = names.indexOf(name);
    if (j < 0) throw new FitInputError(`unknown parameter "${name}" for model ${model.id}`, field);
    return j;
  };

  const bounds: Array<[number, number]> = model.bounds?.(input.x, input.y) ?? names.map(() => [-Infinity, Infinity]);
  for (const [name, range] of Object.entries(input.bounds ?? {})) {
    const j = indexOf("bounds", name);
    const [lo, hi] = range ?? [];
    if (typeof lo !== "number" || typeof hi !== "number" || Number.isNaN(lo) || Number.isNaN(hi) || !(lo < hi)) {
      throw new FitInputError(`bounds for "${name}" must satisfy lo < hi`, "bounds");
    }
    bounds[j] = [lo, hi];
  }

  const fixed = names.map(() => false);
  const start = model.guess(input.x, input.y).slice(0, names.length);
  const warnings: string[] = [];
  names.forEach((name, j) => {
    if (Number.isFinite(start[j])) return;
    const [lo, hi] = bounds[j];
    start[j] = Number.isFinite(lo) && Number.isFinite(hi) ? (lo + hi) / 2 : Number.isFinite(lo) ? lo + 1 : 1;
    warnings.push(`no automatic start value for ${name}`);
  });
  for (const [name, value] of Object.entries(input.start ?? {})) {
    const j = indexOf("start", name);
    if (!Number.isFinite(value)) throw new FitInputError(`start value for "${name}" must be finite`, "start");
    start[j] = value;
  }
  for (const [name, value] of Object.entries(input.fixed ?? {})) {
    const j = indexOf("fixed", name);
    if (!Number.isFinite(value)) throw new FitInputError(`fixed value for "${name}" must be finite`, "fixed");
    start[j] = value;
    fixed[j] = true;
  }
  for (let j = 0; j < names.length; j++) {
    if (!fixed[j]) start[j] = Math.min(bounds[j][1], Math.max(bounds[j][0], start[j]));
  }

  const freeCount = fixed.filter((f) => !f).length;
  if (input.x.length < freeCount) {
    throw new FitInputError(`${input.x.length} points cannot determine ${freeCount} free parameters`, "x");
  }
  if (input.maxIterations !== undefined && !(Number.isInteger(input.maxIterations) && input.maxIterations > 0)) {
    throw new FitInputError("maxIterations must be a positive integer", "maxIterations");
  }

  const result = fitCurve(model, input, {
    start,
    fixed,
    lower: bounds.map((b) => b[0]),
    upper: bounds.map((b) => b[1]),
    solver: { ...input.solver, ...(input.maxIterations ? { maxIterations: input.maxIterations } : {}) },
  });

  const notes = markUndetermined(model, result, names, input, bounds);
  warnings.push(...describeProblems(result, names));
  warnings.push(...(model.checkFit?.(result.params, input.x) ?? []));
  const derived = (model.derived ?? []).map((d) => ({
    name: d.name,
    value: d.value(result.params),
    stderr: propagate(d.gradient(result.params), result.covariance),
    unit: d.unit,
    description: d.description,
    formula: d.formula,
  }));
  const params: FittedParam[] = model.params.map((param, j) => ({
    name: param.name,
    value: result.params[j],
    stderr: result.stderr[j],
    unit: param.unit,
    fixed: fixed[j],
    atBound: result.atBound[j],
    start: start[j],
    bounds: bounds[j],
  }));
  return {
    ...result,
    modelId: model.id,
    modelVersion: model.version,
    params,
    derived,
    verdicts: [...notes, ...(model.verdict?.(derived) ?? [])],
    values: Object.fromEntries(params.map((p) => [p.name, p.value])),
    warnings,
    quality: judgeFit({ model, x: input.x, y: input.y, sigma: input.sigma, xUnit: input.xUnit, result, bounds }),
  };
}

/**
 * √(gᵀ·C·g): first-order error propagation (JCGM 100:2008 (GUM), eq. 13). Parameters the quantity
 * does not depend on (gᵢ = 0) are left out, so an undetermined one elsewhere does not spoil it.
 */
function propagate(g: number[], c: number[][]): number {
  let v = 0;
  for (let i = 0; i < g.length; i++) {
    if (g[i] === 0) continue;
    for (let j = 0; j < g.length; j++) if (g[j] !== 0) v += g[i] * c[i][j] * g[j];
  }
  return v >= 0 ? Math.sqrt(v) : NaN;
}

/** Reports parameter j as not determined: no standard error, no covariance, no correlation. */
function forget(result: CurveFitResult, j: number): void {
  result.undetermined[j] = true;
  result.stderr[j] = NaN;
  result.stderrUnscaled[j] = NaN;
  for (let i = 0; i < result.params.length; i++) {
    result.covariance[i][j] = result.covariance[j][i] = NaN;
    result.correlation[i][j] = result.correlation[j][i] = NaN;
  }
}

const show = (v: number): string => String(Number(v.toPrecision(3)));

/**
 * Marks the parameters whose standard error the data cannot support as not determined, beyond the
 * rank-deficient ones the covariance already finds, and says why in sentences:
 * - the curve passes through every point (χ² ≈ 0): errors scaled by √χ²ᵣ would all be zero;
 * - an amplitude within AMPLITUDE_Z standard errors of zero: its shape parameters (the decay time
 *   of an echo that is not there, the centre of an absent dip) are not seen by the data;
 * - a standard error wider than the parameter's whole allowed range.
 * SciPy's curve_fit reports such covariances as inf with an OptimizeWarning; here they are NaN.
 */
function markUndetermined(model: FitModel, result: CurveFitResult, names: string[], input: FitInput, bounds: Array<[number, number]>): string[] {
  const free = names.map((_, j) => !result.fixed[j]);
  if (!free.some(Boolean) || result.dof <= 0) return [];
  const notes: string[] = [];

  let largest = 0;
  for (let i = 0; i < input.y.length; i++) largest = Math.max(largest, Math.abs(input.y[i] / (input.sigma ? input.sigma[i] : 1)));
  if (Math.sqrt(result.chi2 / input.y.length) <= EXACT_FIT_RELATIVE * largest) {
    names.forEach((_, j) => free[j] && forget(result, j));
    notes.push(
      "No scatter: the curve passes through every point to rounding error (χ²ᵣ ≈ 0), so the data give no estimate of the errors; standard errors are not reported.",
    );
    return notes;
  }

  for (const { amplitude, shapes } of model.amplitudes ?? []) {
    const a = names.indexOf(amplitude);
    if (a < 0 || !free[a]) continue;
    const value = result.params[a];
    const error = result.stderr[a];
    if (Math.abs(value) >= AMPLITUDE_Z * error) continue;
    const lost = shapes.map((s) => names.indexOf(s)).filter((j) => j >= 0 && free[j] && !result.undetermined[j]);
    if (!lost.length) continue;
    lost.forEach((j) => forget(result, j));
    const told = Number.isFinite(error)
      ? `${amplitude} = ${show(value)} ± ${show(error)} is within ${AMPLITUDE_Z} standard errors of zero`
      : `${amplitude} is not determined`;
    const list = lost.map((j) => names[j]);
    const listed = list.length > 1 ? `${list.slice(0, -1).join(", ")} and ${list[list.length - 1]} are` : `${list[0]} is`;
    notes.push(`No clear signal: ${told}, so ${listed} not determined by these data.`);
  }

  names.forEach((name, j) => {
    if (!free[j] || result.undetermined[j]) return;
    const [lo, hi] = bounds[j];
    if (Number.isFinite(hi - lo) && result.stderr[j] > hi - lo) {
      forget(result, j);
      notes.push(`${name}: its standard error exceeds the whole range allowed for it, so it is not determined by these data.`);
    }
  });
  return notes;
}

function validateData(input: FitInput): void {
  const { x, y, sigma } = input;
  if (!x || !y || typeof x.length !== "number" || typeof y.length !== "number") {
    throw new FitInputError("x and y must be arrays of numbers", "x");
  }
  if (x.length === 0) throw new FitInputError("no data points", "x");
  if (y.length !== x.length) throw new FitInputError(`y has ${y.length} values but x has ${x.length}`, "y");
  if (sigma && sigma.length !== x.length) {
    throw new FitInputError(`sigma has ${sigma.length} values but x has ${x.length}`, "sigma");
  }
  for (let i = 0; i < x.length; i++) {
    if (typeof x[i] !== "number" || !Number.isFinite(x[i])) throw new FitInputError(`x[${i}] is not a finite number`, "x");
    if (typeof y[i] !== "number" || !Number.isFinite(y[i])) throw new FitInputError(`y[${i}] is not a finite number`, "y");
    if (sigma && !(Number.isFinite(sigma[i]) && sigma[i] > 0)) {
      throw new FitInputError(`sigma[${i}] must be a positive finite number`, "sigma");
    }
  }
  // A curve cannot be told from a constant without two distinct x values, nor fitted to a y that
  // never changes: every time constant or width would come out with a meaningless "± 0".
  if (x.length > 1 && allEqual(x)) {
    throw new FitInputError(`every x value is ${x[0]}: a curve needs at least two different x values`, "x");
  }
  if (y.length > 1 && allEqual(y)) {
    throw new FitInputError(`every y value is ${y[0]}: there is no signal to fit`, "y");
  }
}

function allEqual(values: ArrayLike<number>): boolean {
  for (let i = 1; i < values.length; i++) if (values[i] !== values[0]) return false;
  return true;
}

function describeProblems(result: CurveFitResult, names: string[]): string[] {
  const warnings: string[] = [];
  if (!result.converged) warnings.push("did not converge");
  names.forEach((name, j) => {
    if (result.atBound[j]) warnings.push(`hit a bound: ${name}`);
    if (result.undetermined[j]) warnings.push(`not determined by the data: ${name}`);
  });
  if (result.dof === 0) warnings.push("no degrees of freedom: standard errors are undefined");
  for (let i = 0; i < names.length; i++) {
    for (let j = i + 1; j < names.length; j++) {
      if (Math.abs(result.correlation[i][j]) > CORRELATION_WARNING) {
        warnings.push(`correlation > ${CORRELATION_WARNING} between ${names[i]} and ${names[j]}`);
      }
    }
  }
  return warnings;
}
