/**
 * NV-NMR spectrum of the proton layer on the oxygen-terminated surface (immersion oil):
 * XY8-16 dynamical decoupling swept in f = 1/(2τ), a Lorentzian dip in normalised contrast at
 * the ¹H Larmor frequency f = (γp/2π)·B (CODATA 2018 via lib/physics/larmor), Gaussian noise.
 */
import type { DemoFile } from "./types";
import { Rng } from "./prng";
import { fixed, linSpace, lorentz } from "./numeric";
import { CONFOCAL, SAMPLE, commentHeader, measuredAt, standardHeader } from "./scenario";
import { PROTON_GAMMA_OVER_2PI } from "@/lib/physics/constants";
import { larmorFrequency } from "@/lib/physics/larmor";
import { odmrResonances } from "@/lib/physics/odmr";

export const NV_NMR_FIELD_T = 0.2093;
const FWHM_MHZ = 0.045;
const DEPTH = 0.065;
const SIGMA = 0.006;

export function nvNmrFiles(): DemoFile[] {
  const rng = new Rng(`nv-nmr/${SAMPLE}/NV12`);
  const group = "oxygen-terminated" as const;
  const larmorMHz = larmorFrequency("1H", NV_NMR_FIELD_T) / 1e6;
  const fDrive = odmrResonances(NV_NMR_FIELD_T).fMinus / 1e6;
  const rows = linSpace(8.4, 9.4, 201).map((f) => {
    const y = 1 - DEPTH * lorentz(f, larmorMHz, FWHM_MHZ) + rng.normal(0, SIGMA);
    return `${fixed(f, 4)},${fixed(y, 5)}`;
  });
  const when = measuredAt(4, 21, 17, 5);
  const header = commentHeader([
    ["title", "NV-NMR, XY8-16, NV12"],
    ...standardHeader(CONFOCAL, group, when),
    ["centre", "NV12"],
    ["sequence", "XY8-16, swept tau; frequency axis f = 1/(2 tau)"],
    ["bias field", `${NV_NMR_FIELD_T * 1000} mT along the NV axis`],
    ["microwave", `ms=0 -> ms=-1 at ${fixed(fDrive, 1)} MHz`],
    ["analyte", "immersion oil on the surface"],
    ["normalisation", "contrast normalised to the pi-pulse reference"],
  ]);
  return [
    {
      fileName: `nvnmr_${SAMPLE}-NV12_XY8-16.csv`,
      name: `NV-NMR (XY8-16), NV12 (sample ${SAMPLE})`,
      kind: "nv_nmr",
      sample: SAMPLE,
      instrument: CONFOCAL,
      measuredAt: when,
      notes:
        `Generated: B = ${NV_NMR_FIELD_T} T (${NV_NMR_FIELD_T * 1000} mT); expected ¹H Larmor frequency ` +
        `f = γp/2π·B = ${fixed(PROTON_GAMMA_OVER_2PI / 1e6, 9)} MHz/T × ${NV_NMR_FIELD_T} T = ${fixed(larmorMHz, 4)} MHz ` +
        `(CODATA 2018, free proton). Lorentzian dip of depth ${DEPTH} and FWHM ${FWHM_MHZ * 1000} kHz at that frequency, ` +
        `Gaussian noise σ = ${SIGMA}.`,
      tags: { group, centre: "NV12", nucleus: "1H" },
      content: header + "frequency (MHz),contrast (norm)\n" + rows.join("\n") + "\n",
    },
  ];
}
