/**
 * Fits a registered (or caller-supplied) model to x/y data: validates the input, takes start
 * values from the model's guess unless given, applies default and user bounds, runs the
 * Levenberg–Marquardt fitter and names every parameter in the result. Values and standard
 * errors are in the units given by each parameter's UnitRole (x and y column units).
 */
import { fitCurve, type CurveFitResult } from "./fit/fit-curve";
import type { SolverOptions } from "./fit/levenberg-marquardt";
import { FitInputError } from "./fit-input-error";
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
  /** The model's judgement of the derived values in words (e.g. whether g⁽²⁾(0) shows a single emitter). */
  verdicts: string[];
  /** Fitted values by parameter name. */
  values: Record<string, number>;
  warnings: string[];
}

const CORRELATION_WARNING = 0.95;

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

  warnings.push(...describeProblems(result, names));
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
    verdicts: model.verdict?.(derived) ?? [],
    values: Object.fromEntries(params.map((p) => [p.name, p.value])),
    warnings,
  };
}

/** √(gᵀ·C·g): first-order error propagation (JCGM 100:2008 (GUM), eq. 13). */
function propagate(g: number[], c: number[][]): number {
  let v = 0;
  for (let i = 0; i < g.length; i++) for (let j = 0; j < g.length; j++) v += g[i] * c[i][j] * g[j];
  return v >= 0 ? Math.sqrt(v) : NaN;
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
