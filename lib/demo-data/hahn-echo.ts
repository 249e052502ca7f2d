/**
 * Hahn-echo decays, four centres per sample group: S(τ) = S0 + A·exp(−(τ/T2)ⁿ)
 * (the model in lib/analysis/models/decay-models.ts) on 80 log-spaced τ from 1 to 2000 µs, Gaussian noise with a per-point σ
 * that is written in the `sigma` column. The true T2 and n go into each file's notes.
 */
import type { DemoFile } from "./types";
import { Rng } from "./prng";
import { fixed, logSpace } from "./numeric";
import { CONFOCAL, GROUPS, SAMPLE, type SampleGroup, centreLabel, commentHeader, measuredAt, standardHeader } from "./scenario";

/** T2 distribution per group (mean ± sd, µs), drawn per centre and kept above `min`. */
const ECHO_T2_BY_GROUP: Readonly<Record<SampleGroup, { mean: number; sd: number; min: number }>> = {
  "as-grown": { mean: 60, sd: 15, min: 25 },
  "annealed-1200C": { mean: 150, sd: 30, min: 70 },
  "oxygen-terminated": { mean: 220, sd: 40, min: 110 },
};

const ECHO_POINTS = 80;
/**
 * Seed salt, chosen (among the first few tried) so that each group's four drawn T2 values
 * average within half a standard error of the nominal mean: with only four centres per group
 * an unlucky draw would blur the group contrast the demo is meant to show.
 */
const ECHO_SEED_SALT = 16;
const ECHO_CENTRES_PER_GROUP = 4;

export interface EchoTruth {
  S0: number;
  A: number;
  T2: number;
  n: number;
  sigma: number;
}

/** The model used to generate the data, S0 + A·exp(−(τ/T2)ⁿ). */
export function echoSignal(tau: number, p: EchoTruth): number {
  return p.S0 + p.A * Math.exp(-((tau / p.T2) ** p.n));
}

function echoFile(group: SampleGroup, groupIndex: number, k: number): DemoFile {
  const centre = centreLabel(groupIndex, k);
  const rng = new Rng(`hahn-echo/${ECHO_SEED_SALT}/${SAMPLE}/${centre}`);
  const dist = ECHO_T2_BY_GROUP[group];
  const truth: EchoTruth = {
    S0: rng.between(0.49, 0.51),
    A: rng.between(0.44, 0.49),
    T2: rng.normalWithin(dist.mean, dist.sd, dist.min, 3 * dist.mean),
    n: rng.between(1.5, 2.5),
    sigma: rng.between(0.012, 0.022),
  };
  const rows = logSpace(1, 2000, ECHO_POINTS).map((tau) => {
    const sigma = truth.sigma * rng.between(0.85, 1.15);
    const y = echoSignal(tau, truth) + rng.normal(0, sigma);
    return `${fixed(tau, 4)},${fixed(y, 5)},${fixed(sigma, 5)}`;
  });
  const when = measuredAt(2 + groupIndex, 2 + 3 * k, 9 + 2 * k, 10 + 7 * k);
  const header = commentHeader([
    ["title", `Hahn echo, ${centre}`],
    ...standardHeader(CONFOCAL, group, when),
    ["centre", centre],
    ["sequence", "pi/2 - tau - pi - tau - pi/2, both final phases, difference normalised to Rabi contrast"],
    ["pi pulse", "52 ns"],
    ["bias field", "4.2 mT along the NV axis"],
    ["averages", "2e5 sweeps"],
    ["sigma", "standard error of the mean over 20 blocks"],
  ]);
  return {
    fileName: `echo_${SAMPLE}-${centre}.csv`,
    name: `Hahn echo, ${centre} (sample ${SAMPLE})`,
    kind: "hahn_echo",
    sample: SAMPLE,
    instrument: CONFOCAL,
    measuredAt: when,
    notes:
      `Generated with S(τ) = S0 + A·exp(−(τ/T2)^n): true T2 = ${fixed(truth.T2, 2)} µs, n = ${fixed(truth.n, 3)}, ` +
      `S0 = ${fixed(truth.S0, 4)}, A = ${fixed(truth.A, 4)}; Gaussian noise, σ ≈ ${fixed(truth.sigma, 4)} ` +
      `(per-point σ in the sigma column). Group T2 drawn from ${dist.mean} ± ${dist.sd} µs.`,
    tags: { group, centre },
    content: header + "tau (µs),signal (norm),sigma (norm)\n" + rows.join("\n") + "\n",
  };
}

export function hahnEchoFiles(): DemoFile[] {
  return GROUPS.flatMap((group, g) => Array.from({ length: ECHO_CENTRES_PER_GROUP }, (_, k) => echoFile(group, g, k)));
}
