/**
 * Global fit: one model over several datasets at once, some parameters shared by all (the echo
 * curves of one NV at several pulse numbers sharing S₀ and A; ODMR sweeps sharing D and the width),
 * the others local to each dataset, with one covariance for all. The stacked residual vector is
 * every dataset's weighted residuals in turn; the Jacobian of each dataset comes from its own
 * curve problem (analytic, swept or finite-difference, as for a single fit) and is scattered into
 * the columns of the shared and of that dataset's local parameters.
 */
import { buildCurveProblem, type CurveData, type CurveProblem } from "./fit/curve-problem";
import { computeCovariance } from "./fit/covariance";
import { DEFAULT_SOLVER_OPTIONS, minimizeLeastSquares, type LeastSquaresProblem } from "./fit/levenberg-marquardt";
import { FitInputError } from "./fit-input-error";
import { getModelOrThrow } from "./model-lookup";
import type { FitModel } from "./models/types";

export interface GlobalDataset extends CurveData {
  label: string;
}

export interface GlobalFitInput {
  datasets: GlobalDataset[];
  /** Parameter names that take one value for every dataset. */
  shared: string[];
  /** Start values by name, for every dataset (the rest come from each dataset's guess). */
  start?: Record<string, number>;
  /** Parameters held at these values in every dataset. */
  fixed?: Record<string, number>;
  /** Bounds by name, replacing the model's defaults in every dataset. */
  bounds?: Record<string, [number, number]>;
  maxIterations?: number;
}

/** One entry of the global parameter vector: a shared parameter, or a local one of one dataset. */
interface GlobalParam {
  name: string;
  /** Index of the dataset for a local parameter; null for a shared one. */
  dataset: number | null;
  value: number;
  /** Standard error scaled by the global √χ²ᵣ; NaN when undetermined. */
  stderr: number;
  /** Standard error from (JᵀJ)⁻¹ alone (right when σ are the true errors). */
  stderrUnscaled: number;
  atBound: boolean;
  undetermined: boolean;
  bounds: [number, number];
}

interface GlobalDatasetResult {
  label: string;
  /** Every model parameter's value for this dataset (shared, local and fixed). */
  values: Record<string, number>;
  /** Standard errors (0 for fixed parameters). */
  stderr: Record<string, number>;
  points: number;
  /** This dataset's share of χ², and χ² over its points. */
  chi2: number;
  chi2PerPoint: number;
  /** yᵢ − f(xᵢ) in y units. */
  residuals: number[];
}

export interface GlobalFitResult {
  modelId: string;
  modelVersion: string;
  shared: string[];
  fixed: Record<string, number>;
  /** The fitted vector: shared parameters first, then each dataset's local ones. */
  params: GlobalParam[];
  datasets: GlobalDatasetResult[];
  /** Covariance of the whole vector (order of params), scaled by χ²ᵣ. */
  covariance: number[][];
  correlation: number[][];
  chi2: number;
  dof: number;
  chi2red: number;
  aic: number;
  bic: number;
  converged: boolean;
  reason: string;
  iterations: number;
  warnings: string[];
}

const MAX_DATASETS = 50;
const CORRELATION_WARNING = 0.95;
/** A dataset whose χ² per point exceeds the others' median by this factor does not fit the shared values. */
const OUTLIER_FACTOR = 4;

function median(values: number[]): number {
  const s = values.filter(Number.isFinite).sort((a, b) => a - b);
  if (!s.length) return NaN;
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
}

function validate(model: FitModel, input: GlobalFitInput): void {
  const names = model.params.map((p) => p.name);
  if (input.datasets.length < 2) throw new FitInputError("a global fit needs at least two datasets", "datasets");
  if (input.datasets.length > MAX_DATASETS) throw new FitInputError(`a global fit takes at most ${MAX_DATASETS} datasets`, "datasets");
  for (const field of ["start", "fixed", "bounds"] as const) {
    for (const name of Object.keys(input[field] ?? {})) {
      if (!names.includes(name)) throw new FitInputError(`unknown parameter "${name}" for model ${model.id}`, field);
    }
  }
  for (const name of input.shared) {
    if (!names.includes(name)) throw new FitInputError(`unknown parameter "${name}" for model ${model.id}`, "shared");
    if (input.fixed && name in input.fixed) throw new FitInputError(`"${name}" is held fixed, so it cannot also be shared`, "shared");
  }
  input.datasets.forEach((d, k) => {
    const where = `dataset ${k + 1} (${d.label})`;
    if (d.x.length !== d.y.length) throw new FitInputError(`${where}: y has ${d.y.length} values but x has ${d.x.length}`, "datasets");
    if (d.sigma && d.sigma.length !== d.x.length) throw new FitInputError(`${where}: sigma has ${d.sigma.length} values but x has ${d.x.length}`, "datasets");
    for (let i = 0; i < d.x.length; i++) {
      if (!Number.isFinite(d.x[i]) || !Number.isFinite(d.y[i])) throw new FitInputError(`${where}: point ${i + 1} is not a pair of finite numbers`, "datasets");
      if (d.sigma && !(d.sigma[i] > 0 && Number.isFinite(d.sigma[i])))
        throw new FitInputError(`${where}: sigma of point ${i + 1} must be positive`, "datasets");
    }
  });
}

export function globalFit(modelId: string | FitModel, input: GlobalFitInput): GlobalFitResult {
  const model = getModelOrThrow(modelId);
  validate(model, input);
  const names = model.params.map((p) => p.name);
  const P = names.length;
  const K = input.datasets.length;
  const isFixed = names.map((n) => input.fixed !== undefined && n in input.fixed);
  const isShared = names.map((n) => input.shared.includes(n));
  const freeNames = names.map((_, j) => j).filter((j) => !isFixed[j]);

  // Each dataset's own start values and default bounds, with the user's in place.
  const starts = input.datasets.map((d) => model.guess(d.x, d.y).slice(0, P));
  const bounds = input.datasets.map((d) => model.bounds?.(d.x, d.y) ?? names.map((): [number, number] => [-Infinity, Infinity]));
  for (let k = 0; k < K; k++) {
    names.forEach((name, j) => {
      if (input.bounds?.[name]) bounds[k][j] = input.bounds[name];
      if (isFixed[j]) starts[k][j] = input.fixed![name];
      else if (input.start && name in input.start) starts[k][j] = input.start[name];
      if (!Number.isFinite(starts[k][j])) {
        const [lo, hi] = bounds[k][j];
        starts[k][j] = Number.isFinite(lo) && Number.isFinite(hi) ? (lo + hi) / 2 : Number.isFinite(lo) ? lo + 1 : 1;
      }
    });
  }

  // Layout of the global vector: shared free parameters, then each dataset's local free ones.
  const slots: Array<{ name: string; j: number; dataset: number | null }> = [];
  const slotOf = Array.from({ length: K }, () => new Int32Array(P).fill(-1));
  for (const j of freeNames) {
    if (!isShared[j]) continue;
    for (let k = 0; k < K; k++) slotOf[k][j] = slots.length;
    slots.push({ name: names[j], j, dataset: null });
  }
  for (let k = 0; k < K; k++) {
    for (const j of freeNames) {
      if (isShared[j]) continue;
      slotOf[k][j] = slots.length;
      slots.push({ name: names[j], j, dataset: k });
    }
  }
  const N = slots.length;
  const lower = new Float64Array(N);
  const upper = new Float64Array(N);
  const start = new Float64Array(N);
  slots.forEach((s, q) => {
    const ks = s.dataset === null ? [...Array(K).keys()] : [s.dataset];
    // A shared parameter may move over the widest of the datasets' default ranges, and starts at their median guess.
    lower[q] = input.bounds?.[s.name]?.[0] ?? Math.min(...ks.map((k) => bounds[k][s.j][0]));
    upper[q] = input.bounds?.[s.name]?.[1] ?? Math.max(...ks.map((k) => bounds[k][s.j][1]));
    start[q] = Math.min(upper[q], Math.max(lower[q], input.start?.[s.name] ?? median(ks.map((k) => starts[k][s.j]))));
  });

  const fixedMask = isFixed;
  const problems: CurveProblem[] = input.datasets.map((d, k) =>
    buildCurveProblem(
      model,
      d,
      starts[k],
      fixedMask,
      names.map((_, j) => lower[slotOf[k][j]] ?? bounds[k][j][0]),
      names.map((_, j) => upper[slotOf[k][j]] ?? bounds[k][j][1]),
    ),
  );
  const sizes = input.datasets.map((d) => d.x.length);
  const offsets = sizes.map((_, k) => sizes.slice(0, k).reduce((a, b) => a + b, 0));
  const m = sizes.reduce((a, b) => a + b, 0);
  if (m <= N) throw new FitInputError(`${m} points in all cannot determine ${N} free parameters`, "datasets");

  const localFree = problems.map((p) => new Float64Array(p.n));
  const localOut = problems.map((p) => new Float64Array(p.m));
  const localJac = problems.map((p) => new Float64Array(p.m * p.n));
  const scatter = (g: ArrayLike<number>, k: number): Float64Array => {
    const free = localFree[k];
    problems[k].freeIndex.forEach((j, a) => (free[a] = g[slotOf[k][j]]));
    return free;
  };
  const stacked: LeastSquaresProblem = {
    m,
    n: N,
    lower,
    upper,
    residuals(g, out) {
      for (let k = 0; k < K; k++) {
        problems[k].residuals(scatter(g, k), localOut[k]);
        out.set(localOut[k], offsets[k]);
      }
    },
    jacobian(g, out) {
      out.fill(0);
      for (let k = 0; k < K; k++) {
        const p = problems[k];
        p.jacobian(scatter(g, k), localJac[k]);
        p.freeIndex.forEach((j, a) => {
          const column = slotOf[k][j] * m + offsets[k];
          out.set(localJac[k].subarray(a * p.m, (a + 1) * p.m), column);
        });
      }
    },
  };

  const outcome = minimizeLeastSquares(stacked, start, { ...DEFAULT_SOLVER_OPTIONS, ...(input.maxIterations ? { maxIterations: input.maxIterations } : {}) });
  const jac = new Float64Array(m * N);
  stacked.jacobian(outcome.params, jac);
  const { covariance: cov, undetermined } = computeCovariance(jac, m, N);
  const chi2 = outcome.sumOfSquares;
  const dof = m - N;
  const chi2red = chi2 / dof;

  const params: GlobalParam[] = slots.map((s, q) => {
    const value = outcome.params[q];
    const width = upper[q] - lower[q];
    const tol = 1e-9 * (Number.isFinite(width) ? width : Math.max(Math.abs(value), 1e-300));
    return {
      name: s.name,
      dataset: s.dataset,
      value,
      stderr: Math.sqrt(cov[q * N + q] * chi2red),
      stderrUnscaled: Math.sqrt(cov[q * N + q]),
      atBound: (Number.isFinite(lower[q]) && value - lower[q] <= tol) || (Number.isFinite(upper[q]) && upper[q] - value <= tol),
      undetermined: undetermined[q],
      bounds: [lower[q], upper[q]],
    };
  });
  const covariance = slots.map((_, a) => slots.map((__, b) => cov[a * N + b] * chi2red));
  const correlation = slots.map((_, a) => slots.map((__, b) => cov[a * N + b] / Math.sqrt(cov[a * N + a] * cov[b * N + b])));

  const datasets: GlobalDatasetResult[] = input.datasets.map((d, k) => {
    const values: Record<string, number> = {};
    const stderr: Record<string, number> = {};
    names.forEach((name, j) => {
      const q = slotOf[k][j];
      values[name] = q >= 0 ? params[q].value : input.fixed![name];
      stderr[name] = q >= 0 ? params[q].stderr : 0;
    });
    const p = names.map((n) => values[n]);
    const residuals = Array.from(d.x, (x, i) => d.y[i] - model.evaluate(x, p));
    let share = 0;
    for (let i = 0; i < residuals.length; i++) share += (residuals[i] / (d.sigma ? d.sigma[i] : 1)) ** 2;
    return { label: d.label, values, stderr, points: d.x.length, chi2: share, chi2PerPoint: share / d.x.length, residuals };
  });

  const logLikelihoodTerm = m * Math.log(chi2 / m);
  return {
    modelId: model.id,
    modelVersion: model.version,
    shared: names.filter((_, j) => isShared[j]),
    fixed: { ...input.fixed },
    params,
    datasets,
    covariance,
    correlation,
    chi2,
    dof,
    chi2red,
    aic: logLikelihoodTerm + 2 * N,
    bic: logLikelihoodTerm + N * Math.log(m),
    converged: outcome.converged,
    reason: outcome.reason,
    iterations: outcome.iterations,
    warnings: describeProblems(params, correlation, datasets, outcome.converged),
  };
}

const label = (p: GlobalParam, datasets: GlobalDatasetResult[]) => (p.dataset === null ? `${p.name} (shared)` : `${p.name} of ${datasets[p.dataset].label}`);

function describeProblems(params: GlobalParam[], correlation: number[][], datasets: GlobalDatasetResult[], converged: boolean): string[] {
  const warnings: string[] = [];
  if (!converged) warnings.push("did not converge");
  params.forEach((p) => {
    if (p.atBound) warnings.push(`hit a bound: ${label(p, datasets)}`);
    if (p.undetermined) warnings.push(`not determined by the data: ${label(p, datasets)}`);
  });
  for (let a = 0; a < params.length; a++) {
    for (let b = a + 1; b < params.length; b++) {
      if (Math.abs(correlation[a][b]) > CORRELATION_WARNING)
        warnings.push(`correlation > ${CORRELATION_WARNING} between ${label(params[a], datasets)} and ${label(params[b], datasets)}`);
    }
  }
  // With shared parameters, one dataset that fits far worse than the rest says the sharing does not hold for it.
  const typical = median(datasets.map((d) => d.chi2PerPoint));
  for (const d of datasets) {
    if (datasets.length > 1 && typical > 0 && d.chi2PerPoint > OUTLIER_FACTOR * typical) {
      warnings.push(
        `${d.label} fits ${Number((d.chi2PerPoint / typical).toPrecision(2))}× worse per point than the median dataset: the shared values may not hold for it.`,
      );
    }
  }
  return warnings;
}
