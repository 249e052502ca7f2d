/**
 * Spin-relaxation (T1) curves, two centres per group: normalised PL after a wait time,
 * S(t) = S0 + A·exp(−t/T1) (the model in lib/analysis/models/decay-models.ts) on 50 log-spaced waits from 1 µs to 20 ms.
 */
import type { DemoFile } from "./types";
import { Rng } from "./prng";
import { fixed, logSpace } from "./numeric";
import { CONFOCAL, GROUPS, SAMPLE, type SampleGroup, centreLabel, commentHeader, measuredAt, standardHeader } from "./scenario";

/** T1 range per group in ms (shallow centres near an untreated surface relax faster). */
const T1_RANGE_MS: Readonly<Record<SampleGroup, [number, number]>> = {
  "as-grown": [3, 4.2],
  "annealed-1200C": [3.8, 5.4],
  "oxygen-terminated": [4.5, 6],
};

const RELAXATION_POINTS = 50;

function relaxationFile(group: SampleGroup, groupIndex: number, k: number): DemoFile {
  const centre = centreLabel(groupIndex, k);
  const rng = new Rng(`relaxation/${SAMPLE}/${centre}`);
  const [lo, hi] = T1_RANGE_MS[group];
  const T1 = rng.between(lo, hi);
  const S0 = rng.between(0.9, 0.93);
  const A = rng.between(0.07, 0.09);
  const sigma = rng.between(0.003, 0.005);
  const rows = logSpace(0.001, 20, RELAXATION_POINTS).map((t) => {
    const y = S0 + A * Math.exp(-t / T1) + rng.normal(0, sigma);
    return `${fixed(t, 6)},${fixed(y, 5)}`;
  });
  const when = measuredAt(3 + groupIndex, 12 + 5 * k, 13, 30 + 4 * k);
  const header = commentHeader([
    ["title", `T1 relaxation, ${centre}`],
    ...standardHeader(CONFOCAL, group, when),
    ["centre", centre],
    ["sequence", "532 nm init (3 µs) - wait - readout (300 ns), no microwave"],
    ["normalisation", "readout PL divided by PL of a reference window at the end of the init pulse"],
    ["averages", "5e5 repetitions"],
  ]);
  return {
    fileName: `t1_${SAMPLE}-${centre}.csv`,
    name: `T1 relaxation, ${centre} (sample ${SAMPLE})`,
    kind: "relaxation",
    sample: SAMPLE,
    instrument: CONFOCAL,
    measuredAt: when,
    notes:
      `Generated with S(t) = S0 + A·exp(−t/T1): true T1 = ${fixed(T1, 3)} ms, S0 = ${fixed(S0, 4)}, ` +
      `A = ${fixed(A, 4)}; Gaussian noise σ = ${fixed(sigma, 4)}.`,
    tags: { group, centre },
    content: header + "wait (ms),pl (norm)\n" + rows.join("\n") + "\n",
  };
}

export function relaxationFiles(): DemoFile[] {
  return GROUPS.flatMap((group, g) => [0, 1].map((k) => relaxationFile(group, g, k)));
}
