/**
 * Fitter throughput on one core: Hahn-echo fits of 500 points, ¹⁴N-triplet ODMR fits of 2,000
 * points and a batch of 1,000 echo fits, each through the public fitModel (guess, validation,
 * fit, covariance). Synthetic data from a fixed seed so runs are comparable.
 */
import { fitModel } from "@/lib/analysis";
import { mulberry32 } from "@/lib/demo-data/prng";

function gaussianNoise(uniform: () => number): number {
  return Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
}

interface Dataset {
  x: number[];
  y: number[];
}

function echoDatasets(count: number, points: number): Dataset[] {
  const uniform = mulberry32(1);
  const x = Array.from({ length: points }, (_, i) => (300 * i) / (points - 1)); // µs
  return Array.from({ length: count }, () => ({
    x,
    y: x.map((t) => 0.5 + 0.3 * Math.exp(-((t / 80) ** 2)) + 0.01 * gaussianNoise(uniform)),
  }));
}

function tripletDatasets(count: number, points: number): Dataset[] {
  const uniform = mulberry32(2);
  const x = Array.from({ length: points }, (_, i) => 2860 + (20 * i) / (points - 1)); // MHz
  const line = (f: number, centre: number): number => 1 / (1 + ((2 * (f - centre)) / 0.6) ** 2);
  return Array.from({ length: count }, () => ({
    x,
    y: x.map((f) => 1 - 0.05 * (line(f, 2868.14) + line(f, 2870.3) + line(f, 2872.46)) + 0.005 * gaussianNoise(uniform)),
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
    medianMs: Number(times[Math.floor(fits / 2)].toFixed(3)),
    p95Ms: Number(times[Math.floor(fits * 0.95)].toFixed(3)),
    converged,
    fits,
  };
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

  const table = {
    "hahn_echo, 500 points": { ...hahnEcho500, goalFitsPerSecond: 2000 },
    "odmr_14n_triplet, 2000 points": { ...odmrTriplet2000, goalFitsPerSecond: 300 },
    "batch of 1000 hahn_echo fits": {
      fitsPerSecond: Math.round(1000 / batchSeconds),
      totalSeconds: Number(batchSeconds.toFixed(3)),
      converged: batchConverged,
      fits: 1000,
    },
  };
  console.table(table);
  return {
    node: process.version,
    hahnEcho500,
    odmrTriplet2000,
    echoBatch1000: { totalSeconds: Number(batchSeconds.toFixed(3)), converged: batchConverged },
  };
}
