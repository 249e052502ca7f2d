/**
 * Fitter throughput on one core: Hahn-echo fits of 500 points, ¹⁴N-triplet ODMR fits of 2,000
 * points and a batch of 1,000 echo fits, each through the public fitModel (guess, validation,
 * fit, covariance). Synthetic data with σ from a fixed seed so runs are comparable.
 *
 * The SciPy anchor: when python3 with SciPy is on the path, bench/fit-scipy.py fits the same
 * data from the same start values with the same σ and tolerances by scipy.optimize.curve_fit
 * (method "lm", analytic Jacobian) in the same run, timing inside Python so its start-up is not
 * counted. The table gives the ratio of fits per second and the largest relative difference of
 * the optima. `ratio` compares median fit times (fits per second at the median), which other work
 * on a shared machine skews far less than the wall-clock throughput (`throughputRatio`, also
 * given). Our timing includes the guess and the checks of fitModel; SciPy's does not.
 */
import { spawnSync } from "node:child_process";
import path from "node:path";
import { fitModel } from "@/lib/analysis";
import { DEFAULT_SOLVER_OPTIONS } from "@/lib/analysis/fit/levenberg-marquardt";
import { mulberry32 } from "@/lib/demo-data/prng";

function gaussianNoise(uniform: () => number): number {
  return Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
}

interface Dataset {
  x: number[];
  y: number[];
  sigma: number[];
}

function echoDatasets(count: number, points: number): Dataset[] {
  const uniform = mulberry32(1);
  const x = Array.from({ length: points }, (_, i) => (300 * i) / (points - 1)); // µs
  const sigma = x.map(() => 0.01);
  return Array.from({ length: count }, () => ({
    x,
    y: x.map((t) => 0.5 + 0.3 * Math.exp(-((t / 80) ** 2)) + 0.01 * gaussianNoise(uniform)),
    sigma,
  }));
}

function tripletDatasets(count: number, points: number): Dataset[] {
  const uniform = mulberry32(2);
  const x = Array.from({ length: points }, (_, i) => 2860 + (20 * i) / (points - 1)); // MHz
  const sigma = x.map(() => 0.005);
  const line = (f: number, centre: number): number => 1 / (1 + ((2 * (f - centre)) / 0.6) ** 2);
  return Array.from({ length: count }, () => ({
    x,
    y: x.map((f) => 1 - 0.05 * (line(f, 2868.14) + line(f, 2870.3) + line(f, 2872.46)) + 0.005 * gaussianNoise(uniform)),
    sigma,
  }));
}

interface Timing {
  fitsPerSecond: number;
  medianMs: number;
  p95Ms: number;
  converged: number;
  fits: number;
}

function timeFits(modelId: string, datasets: Dataset[], fits: number, warmup: number): Timing {
  for (let i = 0; i < warmup; i++) fitModel(modelId, datasets[i % datasets.length]);
  const times: number[] = [];
  let converged = 0;
  const start = performance.now();
  for (let i = 0; i < fits; i++) {
    const t0 = performance.now();
    const result = fitModel(modelId, datasets[i % datasets.length]);
    times.push(performance.now() - t0);
    if (result.converged) converged++;
  }
  const total = (performance.now() - start) / 1000;
  times.sort((a, b) => a - b);
  return {
    fitsPerSecond: Math.round(fits / total),
    medianMs: Number(times[Math.floor(fits / 2)].toFixed(4)),
    p95Ms: Number(times[Math.floor(fits * 0.95)].toFixed(3)),
    converged,
    fits,
  };
}

interface AnchorCase {
  name: string;
  model: string;
  datasets: Array<Dataset & { start: number[] }>;
  /** Our optimum per dataset, to compare with SciPy's. */
  optima: number[][];
  fits: number;
  warmup: number;
}

/** The start values fitModel uses (the model's guess within its bounds) and the optimum it reaches. */
function anchorCase(name: string, model: string, datasets: Dataset[], fits: number, warmup: number): AnchorCase {
  const results = datasets.map((d) => fitModel(model, d));
  return {
    name,
    model,
    datasets: datasets.map((d, i) => ({ ...d, start: results[i].params.map((p) => p.start) })),
    optima: results.map((r) => r.params.map((p) => p.value)),
    fits,
    warmup,
  };
}

interface ScipyCase {
  fitsPerSecond: number;
  medianMs: number;
  fits: number;
  params: number[][];
}

interface ScipyRun {
  scipy: string;
  numpy: string;
  python: string;
  cases: Record<string, ScipyCase>;
}

/** Runs bench/fit-scipy.py on the cases; undefined (with a note) when python3 or SciPy is missing. */
function runScipy(cases: AnchorCase[]): ScipyRun | undefined {
  const probe = spawnSync("python3", ["-c", "import scipy, numpy"], { encoding: "utf8" });
  if (probe.error || probe.status !== 0) {
    console.log("   note: python3 with SciPy not found; the SciPy anchor is skipped.");
    return undefined;
  }
  const { maxIterations, ftol, xtol, gtol } = DEFAULT_SOLVER_OPTIONS;
  const request = {
    cases: cases.map(({ name, model, datasets, fits, warmup }) => ({
      name,
      model,
      datasets,
      fits,
      warmup,
      tolerances: { ftol, xtol, gtol, maxEvaluations: 20 * maxIterations + 100 },
    })),
  };
  const run = spawnSync("python3", [path.join(process.cwd(), "bench", "fit-scipy.py")], {
    input: JSON.stringify(request),
    encoding: "utf8",
    maxBuffer: 64 * 2 ** 20,
  });
  if (run.error || run.status !== 0) throw new Error(`SciPy anchor failed: ${run.error?.message ?? run.stderr}`);
  return JSON.parse(run.stdout) as ScipyRun;
}

/** Largest |ours − SciPy's| / max(|SciPy's|, 1e-300) over all parameters of all datasets. */
function largestRelativeDifference(ours: number[][], theirs: number[][]): number {
  let worst = 0;
  ours.forEach((params, i) =>
    params.forEach((v, j) => {
      const s = theirs[i][j];
      worst = Math.max(worst, Math.abs(v - s) / Math.max(Math.abs(s), 1e-300));
    }),
  );
  return worst;
}

const AGREEMENT = 1e-6;

export async function benchFit(): Promise<Record<string, unknown>> {
  const echo = echoDatasets(50, 500);
  const triplet = tripletDatasets(20, 2000);
  const hahnEcho500 = timeFits("hahn_echo", echo, 2000, 300);
  const odmrTriplet2000 = timeFits("odmr_14n_triplet", triplet, 300, 50);

  const batch = echoDatasets(1000, 500);
  const batchStart = performance.now();
  let batchConverged = 0;
  for (const data of batch) if (fitModel("hahn_echo", data).converged) batchConverged++;
  const batchSeconds = (performance.now() - batchStart) / 1000;

  const cases = [
    anchorCase("hahn_echo, 500 points", "hahn_echo", echo, 1000, 100),
    anchorCase("odmr_14n_triplet, 2000 points", "odmr_14n_triplet", triplet, 200, 20),
  ];
  const scipy = runScipy(cases);
  const ours: Record<string, Timing> = { "hahn_echo, 500 points": hahnEcho500, "odmr_14n_triplet, 2000 points": odmrTriplet2000 };
  const anchor = scipy
    ? Object.fromEntries(
        cases.map((c) => {
          const theirs = scipy.cases[c.name];
          const difference = largestRelativeDifference(c.optima, theirs.params);
          return [
            c.name,
            {
              scipyFitsPerSecond: Math.round(theirs.fitsPerSecond),
              scipyMedianMs: Number(theirs.medianMs.toFixed(3)),
              ratio: Number((theirs.medianMs / ours[c.name].medianMs).toFixed(2)),
              throughputRatio: Number((ours[c.name].fitsPerSecond / theirs.fitsPerSecond).toFixed(2)),
              goalRatio: 1.5,
              largestRelativeDifference: Number(difference.toPrecision(2)),
              optimaAgree: difference <= AGREEMENT,
            },
          ];
        }),
      )
    : undefined;

  const row = (name: string, timing: Timing) => ({ ...timing, ...(anchor?.[name] ?? {}) });
  const table = {
    "hahn_echo, 500 points": row("hahn_echo, 500 points", hahnEcho500),
    "odmr_14n_triplet, 2000 points": row("odmr_14n_triplet, 2000 points", odmrTriplet2000),
    "batch of 1000 hahn_echo fits": {
      fitsPerSecond: Math.round(1000 / batchSeconds),
      totalSeconds: Number(batchSeconds.toFixed(3)),
      converged: batchConverged,
      fits: 1000,
    },
  };
  console.table(table);
  if (scipy && anchor) {
    console.log(
      `   SciPy ${scipy.scipy} (NumPy ${scipy.numpy}, Python ${scipy.python}): curve_fit method "lm", analytic Jacobian, same data, start, σ and tolerances.`,
    );
    for (const [name, a] of Object.entries(anchor)) {
      console.log(
        `   ${name}: ${a.ratio}× SciPy's fits per second at the median fit time (goal ${a.goalRatio}×; ${a.throughputRatio}× by wall-clock throughput); optima ${a.optimaAgree ? "agree" : "DIFFER"}, largest relative difference ${a.largestRelativeDifference} (limit ${AGREEMENT})`,
      );
    }
  }
  return {
    node: process.version,
    hahnEcho500,
    odmrTriplet2000,
    echoBatch1000: { totalSeconds: Number(batchSeconds.toFixed(3)), converged: batchConverged },
    scipyAnchor: scipy && anchor ? { scipy: scipy.scipy, numpy: scipy.numpy, python: scipy.python, cases: anchor } : "skipped: python3 with SciPy not found",
  };
}
