/**
 * Fitter throughput on one core: Hahn-echo fits of 500 points, ¹⁴N-triplet ODMR fits of 2,000
 * points and a batch of 1,000 echo fits, each through the public fitModel (guess, validation,
 * fit, covariance). Synthetic data with σ from a fixed seed so runs are comparable.
 *
 * The SciPy anchor: when python3 with SciPy is on the path, bench/fit-scipy.py fits the same
 * data from the same start values with the same σ and tolerances by scipy.optimize.curve_fit
 * (method "lm", analytic Jacobian) in the same run, timing inside Python so its start-up is not
 * counted. Our fits and SciPy's alternate in rounds so that other work on a shared machine weighs
 * on both alike; `ratio` compares the median fit times (fits per second at the median). The table
 * also gives the largest relative difference of the optima.
 *
 * Two of our timings stand beside SciPy's: the solver alone (fitCurve from the same start, with the
 * covariance, as curve_fit returns it: the like-for-like figure the goal is judged on) and the whole
 * fitModel (the guess, validation, derived values and the quality judge besides, which curve_fit
 * does not do).
 */
import { spawn, spawnSync, type ChildProcessWithoutNullStreams } from "node:child_process";
import os from "node:os";
import path from "node:path";
import { fitModel } from "@/lib/analysis";
import { fitCurve } from "@/lib/analysis/fit/fit-curve";
import { DEFAULT_SOLVER_OPTIONS } from "@/lib/analysis/fit/levenberg-marquardt";
import { getModelOrThrow } from "@/lib/analysis/model-lookup";
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
  /** The model's default bounds on the first dataset (the same data grid throughout). */
  lower: number[];
  upper: number[];
  /** Our optimum per dataset, to compare with SciPy's. */
  optima: number[][];
  warmup: number;
}

/** The start values fitModel uses (the model's guess within its bounds) and the optimum it reaches. */
function anchorCase(name: string, model: string, datasets: Dataset[], warmup: number): AnchorCase {
  const results = datasets.map((d) => fitModel(model, d));
  const bounds = results[0].params.map((p) => p.bounds);
  return {
    name,
    model,
    lower: bounds.map((b) => b[0]),
    upper: bounds.map((b) => b[1]),
    datasets: datasets.map((d, i) => ({ ...d, start: results[i].params.map((p) => p.start) })),
    optima: results.map((r) => r.params.map((p) => p.value)),
    warmup,
  };
}

interface ScipyHello {
  scipy: string;
  numpy: string;
  python: string;
  /** Per case, per dataset, SciPy's optimum. */
  params: number[][][];
}

/** bench/fit-scipy.py as a child answering one JSON line per request line. */
class ScipyChild {
  private readonly child: ChildProcessWithoutNullStreams;
  private readonly lines: string[] = [];
  private waiting: { resolve: (line: string) => void; reject: (error: Error) => void } | undefined;
  private failure = "";
  private exited = false;

  constructor() {
    this.child = spawn("python3", [path.join(process.cwd(), "bench", "fit-scipy.py")]);
    let buffered = "";
    this.child.stdout.setEncoding("utf8");
    this.child.stdout.on("data", (chunk: string) => {
      buffered += chunk;
      for (let end = buffered.indexOf("\n"); end >= 0; end = buffered.indexOf("\n")) {
        const line = buffered.slice(0, end);
        buffered = buffered.slice(end + 1);
        const waiting = this.waiting;
        this.waiting = undefined;
        if (waiting) waiting.resolve(line);
        else this.lines.push(line);
      }
    });
    this.child.stderr.on("data", (chunk: Buffer) => (this.failure += chunk.toString()));
    this.child.on("exit", (code) => {
      this.exited = true;
      this.waiting?.reject(new Error(`SciPy anchor exited (${code}): ${this.failure}`));
    });
  }

  async ask(line: string): Promise<string> {
    if (this.exited) throw new Error(`SciPy anchor exited: ${this.failure}`);
    this.child.stdin.write(`${line}\n`);
    const queued = this.lines.shift();
    if (queued !== undefined) return queued;
    return new Promise((resolve, reject) => (this.waiting = { resolve, reject }));
  }

  close(): void {
    this.child.stdin.end();
  }
}

const ROUNDS = 10;

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

interface AnchorRun {
  hello: ScipyHello;
  /** Per case, the time of each of our solver fits, our whole fitModel calls and SciPy's fits, in ms. */
  ours: number[][];
  oursWhole: number[][];
  theirs: number[][];
}

/**
 * Our fits and SciPy's in alternating rounds, so that whatever else runs on the machine weighs on
 * both alike. Undefined (with a note) when python3 or SciPy is missing.
 */
async function runAnchor(cases: AnchorCase[], fitsPerRound: number[]): Promise<AnchorRun | undefined> {
  const probe = spawnSync("python3", ["-c", "import scipy, numpy"], { encoding: "utf8" });
  if (probe.error || probe.status !== 0) {
    console.log("   note: python3 with SciPy not found; the SciPy anchor is skipped.");
    return undefined;
  }
  const { maxIterations, ftol, xtol, gtol } = DEFAULT_SOLVER_OPTIONS;
  const child = new ScipyChild();
  try {
    const request = {
      cases: cases.map(({ name, model, datasets, warmup }) => ({
        name,
        model,
        datasets,
        warmup,
        tolerances: { ftol, xtol, gtol, maxEvaluations: 20 * maxIterations + 100 },
      })),
    };
    const hello = JSON.parse(await child.ask(JSON.stringify(request))) as ScipyHello;
    const ours = cases.map((): number[] => []);
    const oursWhole = cases.map((): number[] => []);
    const theirs = cases.map((): number[] => []);
    for (let round = 0; round < ROUNDS; round++) {
      for (let c = 0; c < cases.length; c++) {
        const { model, datasets, lower, upper } = cases[c];
        const curve = getModelOrThrow(model);
        for (let i = 0; i < fitsPerRound[c]; i++) {
          const { x, y, sigma, start } = datasets[(round * fitsPerRound[c] + i) % datasets.length];
          const t0 = performance.now();
          fitCurve(curve, { x, y, sigma }, { start, lower, upper });
          ours[c].push(performance.now() - t0);
        }
        for (let i = 0; i < fitsPerRound[c]; i++) {
          const { x, y, sigma } = datasets[(round * fitsPerRound[c] + i) % datasets.length];
          const t0 = performance.now();
          fitModel(model, { x, y, sigma });
          oursWhole[c].push(performance.now() - t0);
        }
        theirs[c].push(...(JSON.parse(await child.ask(`${c} ${fitsPerRound[c]}`)) as number[]));
      }
    }
    return { hello, ours, oursWhole, theirs };
  } finally {
    child.close();
  }
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

/** The batch of echo fits on the server's fit pool with 1 worker thread and with one per core (after a warm-up that starts the threads). */
async function poolBatch(batch: Dataset[]): Promise<Record<string, { workers: number; totalSeconds: number; fitsPerSecond: number }>> {
  const { resetEnvForTests } = await import("@/lib/env");
  const { closeFitPool, fitInPool } = await import("@/lib/server/analyses/fit-pool");
  const saved = process.env.FIT_WORKERS;
  const out: Record<string, { workers: number; totalSeconds: number; fitsPerSecond: number }> = {};
  for (const workers of [1, os.availableParallelism()]) {
    process.env.FIT_WORKERS = String(workers);
    resetEnvForTests();
    const job = (d: Dataset) =>
      fitInPool({ model: "hahn_echo", options: {}, x: Float64Array.from(d.x), y: Float64Array.from(d.y), sigma: Float64Array.from(d.sigma) });
    await Promise.all(batch.slice(0, 50 * workers).map(job));
    const t0 = performance.now();
    await Promise.all(batch.map(job));
    const seconds = (performance.now() - t0) / 1000;
    out[`${workers} worker${workers === 1 ? "" : "s"}`] = {
      workers,
      totalSeconds: Number(seconds.toFixed(3)),
      fitsPerSecond: Math.round(batch.length / seconds),
    };
    await closeFitPool();
  }
  if (saved === undefined) delete process.env.FIT_WORKERS;
  else process.env.FIT_WORKERS = saved;
  resetEnvForTests();
  return out;
}

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
  const pool = await poolBatch(batch);

  const cases = [anchorCase("hahn_echo, 500 points", "hahn_echo", echo, 100), anchorCase("odmr_14n_triplet, 2000 points", "odmr_14n_triplet", triplet, 20)];
  const run = await runAnchor(cases, [100, 20]);
  const anchor = run
    ? Object.fromEntries(
        cases.map((c, k) => {
          const difference = largestRelativeDifference(c.optima, run.hello.params[k]);
          const ours = median(run.ours[k]);
          const oursWhole = median(run.oursWhole[k]);
          const theirs = median(run.theirs[k]);
          return [
            c.name,
            {
              fitsPerSecondAtMedian: Math.round(1000 / ours),
              scipyFitsPerSecondAtMedian: Math.round(1000 / theirs),
              ratio: Number((theirs / ours).toFixed(2)),
              wholeFitModelPerSecondAtMedian: Math.round(1000 / oursWhole),
              wholeFitModelRatio: Number((theirs / oursWhole).toFixed(2)),
              goalRatio: 1.5,
              largestRelativeDifference: Number(difference.toPrecision(2)),
              optimaAgree: difference <= AGREEMENT,
            },
          ];
        }),
      )
    : undefined;

  const table = {
    "hahn_echo, 500 points": hahnEcho500,
    "odmr_14n_triplet, 2000 points": odmrTriplet2000,
    "batch of 1000 hahn_echo fits": {
      fitsPerSecond: Math.round(1000 / batchSeconds),
      totalSeconds: Number(batchSeconds.toFixed(3)),
      converged: batchConverged,
      fits: 1000,
    },
  };
  console.table(table);
  console.log("   The same 1000 echo fits on the server's fit pool (worker threads, data sent to each thread):");
  console.table(pool);
  if (run && anchor) {
    const { hello } = run;
    console.log(
      `   SciPy anchor, ${ROUNDS} rounds alternating with ours: SciPy ${hello.scipy} (NumPy ${hello.numpy}, Python ${hello.python}) curve_fit method "lm", analytic Jacobian, same data, start, σ and tolerances.`,
    );
    console.table(anchor);
    for (const [name, a] of Object.entries(anchor)) {
      console.log(
        `   ${name}: solver ${a.fitsPerSecondAtMedian} against SciPy's ${a.scipyFitsPerSecondAtMedian} fits per second at the median fit time: ${a.ratio}× (goal ${a.goalRatio}×); whole fitModel ${a.wholeFitModelPerSecondAtMedian} (${a.wholeFitModelRatio}×); optima ${a.optimaAgree ? "agree" : "DIFFER"}, largest relative difference ${a.largestRelativeDifference} (limit ${AGREEMENT})`,
      );
    }
  }
  return {
    node: process.version,
    hahnEcho500,
    odmrTriplet2000,
    echoBatch1000: { totalSeconds: Number(batchSeconds.toFixed(3)), converged: batchConverged },
    echoBatch1000OnFitPool: pool,
    scipyAnchor:
      run && anchor
        ? { scipy: run.hello.scipy, numpy: run.hello.numpy, python: run.hello.python, rounds: ROUNDS, cases: anchor }
        : "skipped: python3 with SciPy not found",
  };
}
