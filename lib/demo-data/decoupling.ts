/**
 * A CPMG decoupling series on one centre (NV13, annealed-1200C group; not fitted by the demo story): echo decays with N = 1, 2, 4, 8, 16
 * π pulses, S(τ) = S0 + A·exp(−(τ/T2)ⁿ) with T2 = 95 µs · N^(2/3) (invented; the exponent expected
 * for spin-bath-limited decoupling, de Lange et al., Science 330, 60 (2010); from memory), on 80
 * log-spaced total evolution times with a per-point σ in the `sigma` column. The dataset's `pulses`
 * tag carries N, which the decoupling-scaling fit reads.
 */
import type { DemoFile } from "./types";
import { Rng } from "./prng";
import { fixed, logSpace } from "./numeric";
import { CONFOCAL, SAMPLE, commentHeader, measuredAt, standardHeader } from "./scenario";

const DECOUPLING_PULSES = [1, 2, 4, 8, 16] as const;
const CENTRE = "NV13";
const GROUP = "annealed-1200C";
const T2_ONE_US = 95;
const EXPONENT = 2 / 3;

function cpmgFile(pulses: number, k: number): DemoFile {
  const rng = new Rng(`cpmg/${SAMPLE}/${CENTRE}/${pulses}`);
  const truth = {
    S0: rng.between(0.49, 0.51),
    A: rng.between(0.44, 0.49),
    T2: T2_ONE_US * pulses ** EXPONENT,
    n: rng.between(1.8, 2.2),
    sigma: rng.between(0.012, 0.016),
  };
  const rows = logSpace(2, 8000, 80).map((tau) => {
    const sigma = truth.sigma * rng.between(0.85, 1.15);
    const y = truth.S0 + truth.A * Math.exp(-((tau / truth.T2) ** truth.n)) + rng.normal(0, sigma);
    return `${fixed(tau, 4)},${fixed(y, 5)},${fixed(sigma, 5)}`;
  });
  const when = measuredAt(5, 11, 9 + k, 5 + 9 * k);
  const sequence = pulses === 1 ? "Hahn echo (CPMG-1)" : `CPMG-${pulses}`;
  const header = commentHeader([
    ["title", `${sequence}, ${CENTRE}`],
    ...standardHeader(CONFOCAL, GROUP, when),
    ["centre", CENTRE],
    ["sequence", `pi/2 - (tau/2N - pi - tau/2N) x ${pulses} - pi/2, tau = total free evolution time`],
    ["pulses", String(pulses)],
    ["pi pulse", "52 ns"],
    ["bias field", "4.2 mT along the NV axis"],
    ["sigma", "standard error of the mean over 20 blocks"],
  ]);
  return {
    fileName: `cpmg${pulses}_${SAMPLE}-${CENTRE}.csv`,
    name: `${sequence}, ${CENTRE} (sample ${SAMPLE})`,
    kind: "decoupling",
    sample: SAMPLE,
    instrument: CONFOCAL,
    measuredAt: when,
    notes:
      `Generated with S(τ) = S0 + A·exp(−(τ/T2)^n): true T2 = ${fixed(truth.T2, 2)} µs (${T2_ONE_US} µs · N^(2/3), N = ${pulses}), ` +
      `n = ${fixed(truth.n, 3)}, S0 = ${fixed(truth.S0, 4)}, A = ${fixed(truth.A, 4)}; Gaussian noise, σ ≈ ${fixed(truth.sigma, 4)}.`,
    tags: { group: GROUP, centre: CENTRE, sequence: "CPMG", pulses: String(pulses) },
    content: header + "tau (µs),signal (norm),sigma (norm)\n" + rows.join("\n") + "\n",
  };
}

export function decouplingFiles(): DemoFile[] {
  return DECOUPLING_PULSES.map((n, k) => cpmgFile(n, k));
}
