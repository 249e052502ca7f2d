/**
 * Laser saturation calibration as JSON (array of records): count rate of one centre vs laser
 * power, R(P) = R_sat·P/(P + P_sat) + b·P, with Poisson noise for 1 s per point and the
 * background measured 1 µm off the centre.
 */
import type { DemoFile } from "./types";
import { Rng } from "./prng";
import { fixed } from "./numeric";
import { CONFOCAL, LAB, SAMPLE, measuredAt } from "./scenario";

const POWERS_MW = [0.05, 0.1, 0.2, 0.3, 0.5, 0.75, 1, 1.5, 2, 3, 4, 5];
const R_SAT_KCPS = 185;
const P_SAT_MW = 0.85;
const BACKGROUND_KCPS_PER_MW = 7.5;
const INTEGRATION_S = 1;

export function calibrationFiles(): DemoFile[] {
  const rng = new Rng(`calibration/${SAMPLE}/NV07`);
  const group = "annealed-1200C" as const;
  const when = measuredAt(2, 24, 10, 0);
  const counts = (kcps: number) => rng.poisson(kcps * 1000 * INTEGRATION_S) / (1000 * INTEGRATION_S);
  const records = POWERS_MW.map((p) => {
    const background = BACKGROUND_KCPS_PER_MW * p;
    const signal = (R_SAT_KCPS * p) / (p + P_SAT_MW);
    return {
      "laser power (mW)": p,
      "count rate (kcounts/s)": Number(fixed(counts(signal + background), 3)),
      "background (kcounts/s)": Number(fixed(counts(background), 3)),
    };
  });
  return [
    {
      fileName: `saturation_${SAMPLE}-NV07.json`,
      name: `Laser saturation calibration, NV07 (sample ${SAMPLE})`,
      kind: "other",
      sample: SAMPLE,
      instrument: CONFOCAL,
      measuredAt: when,
      notes:
        `Generated with R(P) = R_sat·P/(P + P_sat) + b·P: R_sat = ${R_SAT_KCPS} kcounts/s, P_sat = ${P_SAT_MW} mW, ` +
        `b = ${BACKGROUND_KCPS_PER_MW} kcounts/s per mW (background column = b·P alone); Poisson noise for ` +
        `${INTEGRATION_S} s per point. ${LAB}, power measured before the objective.`,
      tags: { group, centre: "NV07", calibration: "saturation" },
      content: JSON.stringify(records, null, 2) + "\n",
    },
  ];
}
