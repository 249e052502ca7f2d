/**
 * Turns a curve model y = f(x; p), data with per-point σ and a set of fixed parameters into a
 * weighted least-squares problem over the free parameters: rᵢ = (f(xᵢ; p) − yᵢ)/σᵢ.
 * The Jacobian is the model's analytic one when it has it, otherwise central differences with a
 * step scaled by each parameter's typical size (see typicalSize).
 */
import type { LeastSquaresProblem } from "./levenberg-marquardt";

/** A curve y = f(x; p); FitModel satisfies this shape. */
export interface CurveFunction {
  evaluate: (x: number, p: Float64Array | number[]) => number;
  /** Writes ∂f/∂pⱼ at x into out (length = number of parameters). */
  jacobian?: (x: number, p: ArrayLike<number>, out: Float64Array) => void;
  /** Optional: f(x) with ∂f/∂pⱼ written into out, in one pass (saves a sweep per step). */
  valueAndJacobian?: (x: number, p: ArrayLike<number>, out: Float64Array) => number;
  /**
   * Optional, the fastest path: set up once per dataset (e.g. logarithms of x), returns a sweep
   * over all points (see CurveSweep).
   */
  prepareSweep?: (x: Float64Array, y: Float64Array, weight: Float64Array) => CurveSweep;
}

/**
 * Weighted residuals (f(xᵢ; p) − yᵢ)·wᵢ into residuals[i] and wᵢ·∂f/∂pⱼ into jac[j·m + i], for
 * all i and every parameter j (fixed ones too), in one pass over the data.
 */
export type CurveSweep = (p: ArrayLike<number>, residuals: Float64Array, jac: Float64Array) => void;

export interface CurveData {
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  /** Per-point standard deviation of y (same units as y); all ones when absent. */
  sigma?: ArrayLike<number>;
}

export interface CurveProblem extends LeastSquaresProblem {
  /** Indices (into the full parameter vector) of the free parameters, in solver order. */
  freeIndex: Int32Array;
  /** Full parameter vector with the fixed values in place, updated by expand(). */
  full: Float64Array;
  /** Copies the free values into the full vector and returns it. */
  expand(free: ArrayLike<number>): Float64Array;
}

/** Central-difference step ≈ ε^(1/3) of the parameter's typical size, balancing truncation and rounding error. */
const CENTRAL_STEP = 6.0554544523933395e-6;

/**
 * The size on which a parameter's effect is judged for the difference step: the smaller of |p|
 * and the width of its bounds. A step relative to |p| alone is far too coarse for a parameter
 * that sits far from zero: a line centre at 2801 MHz would be stepped by 0.017 MHz, a fair part of
 * a 0.8 MHz line, while its bounds (the sweep) say it moves on a scale of tens of MHz at most.
 * Unbounded parameters keep the relative step (1 at zero).
 */
export function typicalSize(value: number, lower: number, upper: number): number {
  const width = upper - lower;
  const size = Math.abs(value);
  if (Number.isFinite(width) && width > 0) return size > 0 ? Math.min(size, width) : width;
  return size > 0 ? size : 1;
}

export function buildCurveProblem(
  model: CurveFunction,
  data: CurveData,
  startFull: ArrayLike<number>,
  fixed: ArrayLike<boolean>,
  lowerFull: ArrayLike<number>,
  upperFull: ArrayLike<number>,
): CurveProblem {
  const m = data.x.length;
  const nAll = startFull.length;
  const freeList: number[] = [];
  for (let j = 0; j < nAll; j++) if (!fixed[j]) freeList.push(j);
  const n = freeList.length;
  const freeIndex = Int32Array.from(freeList);
  const x = new Float64Array(data.x);
  const y = new Float64Array(data.y);
  const weight = new Float64Array(m);
  for (let i = 0; i < m; i++) weight[i] = data.sigma ? 1 / data.sigma[i] : 1;
  const full = new Float64Array(startFull);
  const lower = new Float64Array(n);
  const upper = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    lower[k] = lowerFull[freeIndex[k]];
    upper[k] = upperFull[freeIndex[k]];
  }
  const row = new Float64Array(nAll);

  const expand = (free: ArrayLike<number>): Float64Array => {
    for (let k = 0; k < n; k++) full[freeIndex[k]] = free[k];
    return full;
  };

  const evaluateInto = (p: Float64Array, out: Float64Array): void => {
    for (let i = 0; i < m; i++) out[i] = model.evaluate(x[i], p);
  };

  const residuals = (free: Float64Array, out: Float64Array): void => {
    const p = expand(free);
    for (let i = 0; i < m; i++) out[i] = (model.evaluate(x[i], p) - y[i]) * weight[i];
  };

  const analyticJacobian = (free: Float64Array, out: Float64Array): void => {
    const p = expand(free);
    for (let i = 0; i < m; i++) {
      model.jacobian!(x[i], p, row);
      const w = weight[i];
      for (let k = 0; k < n; k++) out[k * m + i] = row[freeIndex[k]] * w;
    }
  };

  const valueAndJacobian = model.valueAndJacobian;
  const allFree = n === nAll;
  const residualsAndJacobian = (free: Float64Array, out: Float64Array, jac: Float64Array): void => {
    const p = expand(free);
    for (let i = 0; i < m; i++) {
      const w = weight[i];
      out[i] = (valueAndJacobian!(x[i], p, row) - y[i]) * w;
      if (allFree) for (let k = 0, c = i; k < n; k++, c += m) jac[c] = row[k] * w;
      else for (let k = 0, c = i; k < n; k++, c += m) jac[c] = row[freeIndex[k]] * w;
    }
  };

  // The whole-dataset sweep writes weighted residuals and columns at once. With fixed parameters
  // it fills a full-width scratch and the free columns are copied out.
  const sweep = model.prepareSweep?.(x, y, weight);
  const sweepJac = sweep && !allFree ? new Float64Array(m * nAll) : undefined;
  const sweptResidualsAndJacobian = (free: Float64Array, out: Float64Array, jac: Float64Array): void => {
    const p = expand(free);
    if (!sweepJac) return sweep!(p, out, jac);
    sweep!(p, out, sweepJac);
    for (let k = 0; k < n; k++) jac.set(sweepJac.subarray(freeIndex[k] * m, freeIndex[k] * m + m), k * m);
  };

  let sweptResiduals: Float64Array | undefined;
  const sweptJacobian = (free: Float64Array, out: Float64Array): void => {
    sweptResiduals ??= new Float64Array(m);
    sweptResidualsAndJacobian(free, sweptResiduals, out);
  };

  let plus: Float64Array | undefined;
  let minus: Float64Array | undefined;
  const finiteDifferenceJacobian = (free: Float64Array, out: Float64Array): void => {
    plus ??= new Float64Array(m);
    minus ??= new Float64Array(m);
    const p = expand(free);
    for (let k = 0; k < n; k++) {
      const j = freeIndex[k];
      const value = p[j];
      const h = CENTRAL_STEP * typicalSize(value, lower[k], upper[k]);
      let hi = value + h;
      let lo = value - h;
      // Stay inside the box: a model may be undefined beyond its bounds.
      if (hi > upper[k]) hi = value;
      if (lo < lower[k]) lo = value;
      if (hi === lo) {
        hi = value + h;
        lo = value;
      }
      p[j] = hi;
      evaluateInto(p, plus);
      p[j] = lo;
      evaluateInto(p, minus);
      p[j] = value;
      const span = hi - lo;
      const c = k * m;
      for (let i = 0; i < m; i++) out[c + i] = ((plus[i] - minus[i]) / span) * weight[i];
    }
  };

  return {
    m,
    n,
    lower,
    upper,
    freeIndex,
    full,
    expand,
    residuals,
    jacobian: sweep ? sweptJacobian : model.jacobian ? analyticJacobian : finiteDifferenceJacobian,
    ...(sweep ? { residualsAndJacobian: sweptResidualsAndJacobian } : valueAndJacobian ? { residualsAndJacobian } : {}),
  };
}
