/**
 * A parameter's unit in terms of the data's x and y column units. "1" is dimensionless
 * (radians for phases). The polynomial roles ("y/x", "y/x^2", "y/x^3") extend the original
 * five so that slopes and curvatures can be labelled.
 */
import type { CurveSweep } from "../fit/curve-problem";

export type UnitRole = "x" | "y" | "1/x" | "1" | "x*y" | "y/x" | "y/x^2" | "y/x^3";

export interface ModelParam {
  name: string;
  unit: UnitRole;
  description: string;
}

/**
 * A quantity computed from the fitted parameters (t_π = 1/(2f), g⁽²⁾(0) = 1 − β …); its standard
 * error comes from the parameters' covariance through the gradient: σ² = gᵀ·C·g.
 */
export interface DerivedQuantity {
  name: string;
  unit: UnitRole;
  description: string;
  /** Readable formula with Unicode. */
  formula: string;
  value: (p: ArrayLike<number>) => number;
  /** ∂value/∂pⱼ, one per parameter. */
  gradient: (p: ArrayLike<number>) => number[];
}

/**
 * The range a parameter takes in a physical system, for judging a fit: a value outside it means the
 * model converged onto something other than what it describes (e.g. a ¹⁴N "splitting" of 235 MHz
 * that is really the distance between f₋ and f₊). Frequencies are stated in MHz and compared after
 * converting the parameter's unit (from the x column: Hz, kHz, MHz, GHz, or 1/s … 1/ns); the check
 * is left out when the unit is not known.
 */
export interface PhysicalRange {
  name: string;
  /** Lowest and highest plausible |value| (or value, when not `absolute`), in `unit`. */
  range: [number, number];
  unit: "MHz" | "1";
  /** Compare |value|: a splitting whose sign the data do not show. */
  absolute?: boolean;
  /** What the parameter is physically, as a phrase ("the ¹⁴N hyperfine splitting |A∥|"). */
  what: string;
}

/** Another model that fits the shape of the data better, and why, in words. */
export interface ModelSuggestion {
  modelId: string;
  reason: string;
}

/**
 * A curve model y = f(x; p). Everything is in the data's own units: the model never assumes
 * that x is in µs or MHz, so start values come from the data (extrema, periodograms,
 * log-linear regressions), not from physical constants.
 */
export interface FitModel {
  id: string;
  title: string;
  /** Readable formula with Unicode. */
  formula: string;
  /** Bumped whenever the mathematics changes; stored with every analysis run. */
  version: string;
  kinds: string[];
  params: ModelParam[];
  evaluate: (x: number, p: Float64Array | number[]) => number;
  /** Writes ∂f/∂pⱼ at x into out (length params.length). */
  jacobian?: (x: number, p: ArrayLike<number>, out: Float64Array) => void;
  /**
   * Optional fast path: returns f(x) and writes ∂f/∂pⱼ into out in one pass, so the fitter
   * needs one model sweep per step instead of two. Must agree with evaluate and jacobian.
   */
  valueAndJacobian?: (x: number, p: ArrayLike<number>, out: Float64Array) => number;
  /**
   * Optional fastest path: set up once per dataset, returns a sweep writing the weighted
   * residuals and the full weighted Jacobian (column-major) at every x. Must agree with
   * evaluate and jacobian.
   */
  prepareSweep?: (x: Float64Array, y: Float64Array, weight: Float64Array) => CurveSweep;
  /** Automatic start values from the data, one per parameter. */
  guess(x: ArrayLike<number>, y: ArrayLike<number>): number[];
  /** Sensible default bounds for the data, one [lo, hi] per parameter (±Infinity allowed). */
  bounds?(x: ArrayLike<number>, y: ArrayLike<number>): Array<[number, number]>;
  /** Quantities derived from the parameters, reported with propagated errors. */
  derived?: DerivedQuantity[];
  /** Plain sentences judging the result from the derived values (e.g. single emitter or not). */
  verdict?(derived: Array<{ name: string; value: number; stderr: number }>): string[];
  /**
   * Amplitudes and the parameters that only shape the term they scale (the echo's A and its T₂
   * and n; a dip's contrast and its centre and width). When the fitted amplitude cannot be told
   * from zero, the data say nothing about its shape parameters, which are then reported as not
   * determined rather than with a misleading standard error.
   */
  amplitudes?: Array<{ amplitude: string; shapes: string[] }>;
  /**
   * Warnings about the fitted values that depend on how x was sampled (e.g. a frequency near the
   * Nyquist limit 1/(2Δt), where its alias fits the samples as well).
   */
  checkFit?(p: ArrayLike<number>, x: ArrayLike<number>): string[];
  /** Where the parameters lie in the system the model describes (checked after the fit). */
  physicalRanges?: PhysicalRange[];
  /** Looks at the shape of the data (e.g. how many groups of dips) and names a model that matches it better. */
  suggest?(x: ArrayLike<number>, y: ArrayLike<number>): ModelSuggestion | undefined;
}
