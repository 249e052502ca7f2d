/**
 * Residual-resampling bootstrap of a fitted curve (Efron & Tibshirani, "An Introduction to the
 * Bootstrap", Chapman & Hall 1993, §9.5 "bootstrapping residuals"): each draw adds residuals drawn
 * with replacement to the fitted curve and fits again from the fitted values. With σ given, the
 * weighted residuals (yᵢ − fᵢ)/σᵢ are resampled and put back at each point's own σ, so a noisier
 * point stays noisier. Residuals are inflated by √(m/(m − k)) (m points, k free parameters) because
 * fitted residuals are smaller than the errors they stand for (Davison & Hinkley, "Bootstrap Methods
 * and their Application", CUP 1997, §6.2.3); this matches the dof in χ²ᵣ. The spread of the refitted
 * parameters gives percentile intervals that do not lean on the linearised covariance.
 *
 * Draw i takes its random numbers from its own generator, seeded from (seed, i): the result depends
 * on the seed and the number of draws only, not on how the draws are split into chunks.
 */
import { mulberry32 } from "@/lib/demo-data/prng";
import { fitCurve } from "./fit/fit-curve";
import type { FitInput, ModelFitResult } from "./fit-model";
import type { FitModel } from "./models/types";
import { quantileSorted } from "./stats/describe";

export interface BootstrapSettings {
  draws: number;
  seed: number;
}

/** Above this ratio (either way) between the bootstrap's 68 % half-width and the standard error, the two disagree. */
const DISAGREEMENT_FACTOR = 1.5;
/** ±1σ of a normal distribution as a central probability: 68.27 %. */
const ONE_SIGMA_TAILS: [number, number] = [0.158655253931457, 0.841344746068543];
const TWO_SIDED_95: [number, number] = [0.025, 0.975];

export interface BootstrapInterval {
  name: string;
  /** The fitted value and its covariance standard error (NaN when not determined). */
  value: number;
  stderr: number;
  /** Percentile intervals of the refitted values: central 68.27 % (±1σ-equivalent) and 95 %. */
  interval68: [number, number];
  interval95: [number, number];
  /** Half the 68 % interval divided by the standard error; NaN when the standard error is not a number. */
  ratio: number;
  /** True when the ratio is above DISAGREEMENT_FACTOR or below its inverse. */
  disagrees: boolean;
}

export interface BootstrapSummary {
  method: "residual resampling";
  draws: number;
  seed: number;
  /** Draws whose refit converged; the intervals come from these alone. */
  used: number;
  parameters: BootstrapInterval[];
  derived: BootstrapInterval[];
  warnings: string[];
}

/** Mixes the seed and the draw's index into one 32-bit seed (a SplitMix32-style finaliser), so neighbouring draws are unrelated. */
function drawSeed(seed: number, index: number): number {
  let h = (Math.imul(seed >>> 0, 0x9e3779b1) + Math.imul(index + 1, 0x85ebca77)) >>> 0;
  h = Math.imul(h ^ (h >>> 16), 0x7feb352d);
  h = Math.imul(h ^ (h >>> 15), 0x846ca68b);
  return (h ^ (h >>> 16)) >>> 0;
}

/**
 * Draws from..to−1: each the full parameter vector of one refit, or null when the refit did not
 * converge. `fitted` is the fit of `input` by `model`.
 */
export function bootstrapDraws(model: FitModel, input: FitInput, fitted: ModelFitResult, seed: number, from: number, to: number): Array<number[] | null> {
  const m = input.x.length;
  const sigma = input.sigma;
  const curve = new Float64Array(m);
  const scaled = new Float64Array(m);
  const inflation = fitted.dof > 0 ? Math.sqrt(m / fitted.dof) : 1;
  for (let i = 0; i < m; i++) {
    const s = sigma ? sigma[i] : 1;
    curve[i] = input.y[i] - fitted.residuals[i];
    scaled[i] = (fitted.residuals[i] / s) * inflation;
  }
  const start = fitted.params.map((p) => p.value);
  const fixed = fitted.params.map((p) => p.fixed);
  const lower = fitted.params.map((p) => p.bounds[0]);
  const upper = fitted.params.map((p) => p.bounds[1]);
  const y = new Float64Array(m);
  const out: Array<number[] | null> = [];
  for (let draw = from; draw < to; draw++) {
    const uniform = mulberry32(drawSeed(seed, draw));
    for (let i = 0; i < m; i++) {
      const pick = Math.min(m - 1, Math.floor(uniform() * m));
      y[i] = curve[i] + scaled[pick] * (sigma ? sigma[i] : 1);
    }
    const refit = fitCurve(model, { x: input.x, y, sigma }, { start, fixed, lower, upper });
    out.push(refit.converged && refit.params.every(Number.isFinite) ? refit.params : null);
  }
  return out;
}

function interval(name: string, value: number, stderr: number, samples: number[]): BootstrapInterval {
  const sorted = samples.filter(Number.isFinite).sort((a, b) => a - b);
  const at = (p: number) => (sorted.length ? quantileSorted(sorted, p) : NaN);
  const interval68: [number, number] = [at(ONE_SIGMA_TAILS[0]), at(ONE_SIGMA_TAILS[1])];
  const interval95: [number, number] = [at(TWO_SIDED_95[0]), at(TWO_SIDED_95[1])];
  const ratio = Number.isFinite(stderr) && stderr > 0 ? (interval68[1] - interval68[0]) / 2 / stderr : NaN;
  return {
    name,
    value,
    stderr,
    interval68,
    interval95,
    ratio,
    disagrees: Number.isFinite(ratio) && (ratio > DISAGREEMENT_FACTOR || ratio < 1 / DISAGREEMENT_FACTOR),
  };
}

const show = (v: number) => String(Number(v.toPrecision(3)));

/** Percentile intervals of the free parameters and derived quantities from the draws, with warnings where they disagree with the covariance. */
export function summariseBootstrap(model: FitModel, fitted: ModelFitResult, draws: Array<number[] | null>, settings: BootstrapSettings): BootstrapSummary {
  const good = draws.filter((d): d is number[] => d !== null);
  const parameters = fitted.params
    .map((p, j) => ({ p, j }))
    .filter(({ p }) => !p.fixed)
    .map(({ p, j }) =>
      interval(
        p.name,
        p.value,
        p.stderr,
        good.map((d) => d[j]),
      ),
    );
  const derived = (model.derived ?? []).map((q, k) =>
    interval(
      q.name,
      fitted.derived[k]?.value ?? NaN,
      fitted.derived[k]?.stderr ?? NaN,
      good.map((d) => q.value(d)),
    ),
  );
  const warnings: string[] = [];
  const failed = draws.length - good.length;
  if (failed > 0) warnings.push(`${failed} of ${draws.length} bootstrap refits did not converge and are left out of the intervals.`);
  for (const b of [...parameters, ...derived]) {
    if (!b.disagrees) continue;
    warnings.push(
      `${b.name}: the bootstrap's 68 % interval is ${show(b.ratio)}× the standard error (${b.ratio > 1 ? "wider" : "narrower"}); ` +
        `the covariance error assumes a locally linear model and should not be quoted alone.`,
    );
  }
  return { method: "residual resampling", draws: draws.length, seed: settings.seed, used: good.length, parameters, derived, warnings };
}

/** The whole bootstrap in one call (workers, tests). */
export function bootstrapFit(model: FitModel, input: FitInput, fitted: ModelFitResult, settings: BootstrapSettings): BootstrapSummary {
  return summariseBootstrap(model, fitted, bootstrapDraws(model, input, fitted, settings.seed, 0, settings.draws), settings);
}
