/**
 * Ramsey fringes with the ¹⁴N hyperfine triplet resolved (the model in lib/analysis/models/ramsey-models.ts):
 * S(t) = S0 + A·exp(−(t/T2*)²)·Σₘ cos(2π(δ + m·|A∥|)t + φ), m = −1, 0, +1, equal weights.
 * Time is in ns, so frequencies enter as 1/ns: δ = 2.5 MHz is 0.0025 ns⁻¹.
 */
import type { DemoFile } from "./types";
import { Rng } from "./prng";
import { fixed } from "./numeric";
import { DEMO_14N_SPLITTING_MHZ } from "./odmr";
import { CONFOCAL, SAMPLE, commentHeader, measuredAt, standardHeader } from "./scenario";

const RAMSEY_POINTS = 400;
const STEP_NS = 10;

const RAMSEY_TRUTH = {
  S0: 0.985,
  /** Amplitude of each of the three cosines. */
  A: 0.011,
  T2StarNs: 1520,
  deltaMHz: 2.5,
  splittingMHz: DEMO_14N_SPLITTING_MHZ,
  phi: 0.35,
  sigma: 0.0025,
} as const;

/** Noise-free signal at t (ns). */
function ramseySignal(tNs: number): number {
  const p = RAMSEY_TRUTH;
  const perNs = 1e-3; // 1 MHz = 1e-3 ns⁻¹
  const envelope = Math.exp(-((tNs / p.T2StarNs) ** 2));
  let sum = 0;
  for (const m of [-1, 0, 1]) sum += Math.cos(2 * Math.PI * (p.deltaMHz + m * p.splittingMHz) * perNs * tNs + p.phi);
  return p.S0 + p.A * envelope * sum;
}

export function ramseyFiles(): DemoFile[] {
  const rng = new Rng(`ramsey/${SAMPLE}/NV11`);
  const group = "oxygen-terminated" as const;
  const p = RAMSEY_TRUTH;
  const rows = Array.from({ length: RAMSEY_POINTS }, (_, i) => {
    const t = i * STEP_NS;
    return `${t},${fixed(ramseySignal(t) + rng.normal(0, p.sigma), 5)}`;
  });
  const when = measuredAt(4, 8, 14, 45);
  const header = commentHeader([
    ["title", "Ramsey, NV11"],
    ...standardHeader(CONFOCAL, group, when),
    ["centre", "NV11"],
    ["sequence", "pi/2 - t - pi/2, microwave detuned from the mI = 0 line"],
    ["detuning", `${p.deltaMHz} MHz`],
    ["bias field", "4.2 mT along the NV axis"],
    ["averages", "1e6 sweeps"],
  ]);
  return [
    {
      fileName: `ramsey_${SAMPLE}-NV11.csv`,
      name: `Ramsey fringes, NV11 (sample ${SAMPLE})`,
      kind: "ramsey",
      sample: SAMPLE,
      instrument: CONFOCAL,
      measuredAt: when,
      notes:
        `Generated with S(t) = S0 + A·exp(−(t/T2*)²)·Σ_{m=−1,0,1} cos(2π(δ + m·|A∥|)t + φ): true T2* = ${p.T2StarNs} ns ` +
        `(${p.T2StarNs / 1000} µs), δ = ${p.deltaMHz} MHz (= ${p.deltaMHz / 1000} ns⁻¹), |A∥| = ${p.splittingMHz} MHz ` +
        `(= ${p.splittingMHz / 1000} ns⁻¹, ¹⁴N), φ = ${p.phi} rad, S0 = ${p.S0}, A = ${p.A} per line; ` +
        `Gaussian noise σ = ${p.sigma}. Time column in ns, so fitted frequencies come out in ns⁻¹ (×1000 → MHz).`,
      tags: { group, centre: "NV11" },
      content: header + "t (ns),pl (norm)\n" + rows.join("\n") + "\n",
    },
  ];
}
