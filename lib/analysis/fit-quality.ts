/**
 * Judges a converged fit: "converged" only says the optimiser stopped, not that the model describes
 * the data. Each check below gives findings in words, and together they give one level:
 * - "not supported": the solver did not converge, a parameter is outside its physical range, or
 *   the data have a shape the model cannot take (another model is named);
 * - "questionable": structure left in the residuals, χ²ᵣ outside its 99 % interval (σ given),
 *   a parameter at a bound, parameters not determined, or no degrees of freedom to judge by;
 * - "good": none of these.
 * Pure; values in the units of the fit (x and y columns), statistics dimensionless.
 */
import type { CurveFitResult } from "./fit/fit-curve";
import { findModel } from "./models/registry";
import type { FitModel, ModelSuggestion } from "./models/types";
import { resolveUnit } from "./param-unit";
import { reducedChiSquareInterval } from "./stats/chi-square";
import { durbinWatson, runsTest, type DurbinWatson, type RunsTest } from "./stats/residual-structure";

type FitQualityLevel = "good" | "questionable" | "not supported";

interface FitFinding {
  check: "convergence" | "residual-runs" | "residual-durbin-watson" | "chi2" | "bound" | "physical-range" | "undetermined" | "shape" | "dof";
  level: Exclude<FitQualityLevel, "good">;
  message: string;
}

export interface FitQuality {
  level: FitQualityLevel;
  /** The level in a sentence, for beside the solver's tick. */
  summary: string;
  findings: FitFinding[];
  /** Runs test on the residuals' signs in order of x; absent with fewer than RUNS_MINIMUM of either sign. */
  runs?: RunsTest;
  /** Durbin–Watson on the weighted residuals in order of x; absent below DURBIN_WATSON_MINIMUM points. */
  durbinWatson?: DurbinWatson;
  /** The interval χ²ᵣ falls in with probability CHI2_LEVEL for a right model and right σ; only with σ. */
  chi2Interval?: [number, number];
  suggestion?: ModelSuggestion & { title: string };
}

/**
 * Significance level for structure in the residuals (runs test and Durbin–Watson, each two-sided):
 * 1 %, common practice for a warning that should seldom fire on a right model (at most about 2 % of
 * right fits are flagged by one of the two tests).
 */
export const RESIDUAL_P = 0.01;
/** The runs test's normal approximation needs at least this many residuals of each sign (common practice). */
const RUNS_MINIMUM = 10;
/** Durbin–Watson's large-sample p needs at least this many points (common practice). */
const DURBIN_WATSON_MINIMUM = 20;
/** Probability of the χ²ᵣ interval: outside it, σ and the scatter disagree at the 1 % level. */
export const CHI2_LEVEL = 0.99;
/**
 * A free parameter within this fraction of a bound (relative to the smaller of the range's width and
 * the size of the value and bound) is reported at that bound: the optimiser stopped at the wall, not
 * at a minimum.
 */
export const BOUND_TOLERANCE = 1e-4;

/** Frequency units of the x column (or of 1/x) in MHz. */
const MHZ: Record<string, number> = { Hz: 1e-6, kHz: 1e-3, MHz: 1, GHz: 1e3 };

export interface JudgeInput {
  model: FitModel;
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  sigma?: ArrayLike<number>;
  /** Unit of the x column, for checking physical ranges stated in MHz. */
  xUnit?: string | null;
  result: CurveFitResult;
  bounds: Array<[number, number]>;
}

const show = (v: number): string => String(Number(v.toPrecision(3)));

export function judgeFit({ model, x, y, sigma, xUnit, result, bounds }: JudgeInput): FitQuality {
  const findings: FitFinding[] = [];
  const names = model.params.map((p) => p.name);
  const free = names.map((_, j) => !result.fixed[j]);

  if (!result.converged) {
    findings.push({
      check: "convergence",
      level: "not supported",
      message: `The solver did not converge${result.reason ? ` (${result.reason})` : ""}: these values are not a fit.`,
    });
  }

  // Residual structure, in order of x, weighted by σ when given.
  const weighted = weightedInXOrder(x, result.residuals, sigma);
  const runs = result.dof > 0 ? runsTest(weighted, RUNS_MINIMUM) : undefined;
  const dw = result.dof > 0 ? durbinWatson(weighted, DURBIN_WATSON_MINIMUM) : undefined;
  if (runs && runs.p < RESIDUAL_P) {
    const few = runs.z < 0;
    findings.push({
      check: "residual-runs",
      level: "questionable",
      message: `Structure left in the residuals: ${runs.runs} runs of one sign where ${show(runs.expected)} are expected (runs test z = ${show(runs.z)}, p = ${showP(runs.p)} < ${RESIDUAL_P}); ${few ? "neighbouring points lie on the same side of the curve, so the model misses a feature of the data" : "the residuals alternate more than chance allows"}.`,
    });
  }
  if (dw && dw.p < RESIDUAL_P) {
    findings.push({
      check: "residual-durbin-watson",
      level: "questionable",
      message: `Neighbouring residuals are ${dw.r1 > 0 ? "alike" : "opposed"}: Durbin–Watson d = ${show(dw.d)} (2 for independent residuals; p = ${showP(dw.p)} < ${RESIDUAL_P}).`,
    });
  }

  // χ²ᵣ against its distribution, only when σ are given (otherwise χ²ᵣ is the scatter itself).
  let chi2Interval: [number, number] | undefined;
  if (sigma && result.dof > 0 && Number.isFinite(result.chi2red)) {
    chi2Interval = chi2IntervalFor(result.dof);
    const [lo, hi] = chi2Interval;
    const where = `the ${Math.round(CHI2_LEVEL * 100)} % interval ${show(lo)}–${show(hi)} for ${result.dof} degrees of freedom`;
    if (result.chi2red > hi) {
      findings.push({
        check: "chi2",
        level: "questionable",
        message: `χ²ᵣ = ${show(result.chi2red)} is above ${where}: the points scatter more than σ says, or the model misses a feature.`,
      });
    } else if (result.chi2red < lo) {
      findings.push({
        check: "chi2",
        level: "questionable",
        message: `χ²ᵣ = ${show(result.chi2red)} is below ${where}: σ overstates the scatter (or the points are not independent).`,
      });
    }
  }
  if (result.dof <= 0) {
    findings.push({ check: "dof", level: "questionable", message: "No degrees of freedom are left: nothing in the data can judge this fit." });
  }

  // Parameters at a bound.
  const atBound = names.filter((_, j) => free[j] && (result.atBound[j] || nearBound(result.params[j], bounds[j])));
  for (const name of atBound) {
    const j = names.indexOf(name);
    findings.push({
      check: "bound",
      level: "questionable",
      message: `${name} = ${show(result.params[j])} stopped at its bound [${show(bounds[j][0])}, ${show(bounds[j][1])}]: the best value may lie beyond it, and its error is not reliable.`,
    });
  }

  const undetermined = names.filter((_, j) => free[j] && result.undetermined[j]);
  if (undetermined.length) {
    findings.push({
      check: "undetermined",
      level: "questionable",
      message: `Not determined by these data: ${undetermined.join(", ")}.`,
    });
  }

  // Physical ranges.
  for (const range of model.physicalRanges ?? []) {
    const j = names.indexOf(range.name);
    if (j < 0 || !free[j]) continue;
    const factor = range.unit === "1" ? 1 : MHZ[resolveUnit(model.params[j].unit, xUnit ?? null, null)];
    if (factor === undefined) continue;
    const value = result.params[j] * factor;
    const compared = range.absolute ? Math.abs(value) : value;
    const [lo, hi] = range.range;
    if (compared >= lo && compared <= hi) continue;
    const unit = range.unit === "1" ? "" : ` ${range.unit}`;
    findings.push({
      check: "physical-range",
      level: "not supported",
      message: `${range.absolute ? `|${range.name}|` : range.name} = ${show(compared)}${unit} is outside ${lo}–${hi}${unit}, the range of ${range.what}: the model has matched something else in the data.`,
    });
  }

  // The data's shape.
  const suggested = model.suggest?.(x, y);
  const other = suggested && suggested.modelId !== model.id ? findModel(suggested.modelId) : undefined;
  const suggestion = suggested && other ? { ...suggested, title: other.title } : undefined;
  if (suggestion) {
    findings.push({
      check: "shape",
      level: "not supported",
      message: `The model does not fit the data's shape: ${suggestion.reason}. Try “${suggestion.title}”.`,
    });
  }

  const level: FitQualityLevel = findings.some((f) => f.level === "not supported") ? "not supported" : findings.length ? "questionable" : "good";
  return {
    level,
    summary: SUMMARY[level],
    findings,
    ...(runs ? { runs } : {}),
    ...(dw ? { durbinWatson: dw } : {}),
    ...(chi2Interval ? { chi2Interval } : {}),
    ...(suggestion ? { suggestion } : {}),
  };
}

const SUMMARY: Record<FitQualityLevel, string> = {
  good: "the fit describes the data: no structure in the residuals, nothing at a bound or out of range",
  questionable: "the fit is questionable: read the findings before using its values",
  "not supported": "the data do not support this fit: its values should not be used",
};

const showP = (p: number): string => (p < 1e-4 ? p.toExponential(1) : String(Number(p.toPrecision(2))));

/** Residuals divided by σ (when given), in ascending order of x (stable). */
function weightedInXOrder(x: ArrayLike<number>, residuals: ArrayLike<number>, sigma: ArrayLike<number> | undefined): number[] {
  const m = x.length;
  const out = new Array<number>(m);
  let sorted = true;
  for (let i = 1; i < m && sorted; i++) if (x[i] < x[i - 1]) sorted = false;
  if (sorted) {
    for (let i = 0; i < m; i++) out[i] = sigma ? residuals[i] / sigma[i] : residuals[i];
    return out;
  }
  const order = Array.from({ length: m }, (_, i) => i).sort((a, b) => x[a] - x[b] || a - b);
  for (let k = 0; k < m; k++) out[k] = residuals[order[k]] / (sigma ? sigma[order[k]] : 1);
  return out;
}

/** The χ²ᵣ interval depends on the degrees of freedom alone, and a batch fits many alike. */
const chi2Intervals = new Map<number, [number, number]>();
function chi2IntervalFor(dof: number): [number, number] {
  let interval = chi2Intervals.get(dof);
  if (!interval) {
    interval = reducedChiSquareInterval(dof, CHI2_LEVEL);
    if (chi2Intervals.size > 1000) chi2Intervals.clear();
    chi2Intervals.set(dof, interval);
  }
  return [interval[0], interval[1]];
}

function nearBound(value: number, [lo, hi]: [number, number]): boolean {
  const near = (bound: number): boolean => {
    if (!Number.isFinite(bound)) return false;
    // The smaller of the range's width and the size of the numbers: a T₂ of 39 µs in a range
    // 0.002 µs – 2 s is far from its lower bound, however wide the range.
    const scale = Math.min(Number.isFinite(hi - lo) ? hi - lo : Infinity, Math.max(Math.abs(value), Math.abs(bound)));
    return Math.abs(value - bound) <= BOUND_TOLERANCE * scale;
  };
  return near(lo) || near(hi);
}
