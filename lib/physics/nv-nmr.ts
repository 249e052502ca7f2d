/**
 * NV-NMR signal of a semi-infinite proton layer above an NV at depth d (Pham et al., PRB 93,
 * 045425 (2016); Staudacher et al., Science 339, 561 (2013); exact printed form from memory):
 * B_rms² = ρ (μ0 ħ γp / 4π)² · 5π / (96 d³). SI in the pure functions (m⁻³, m, T); the
 * calculators use nm⁻³, nm and nT.
 */
import { PROTON_GYROMAGNETIC_RATIO, REDUCED_PLANCK_CONSTANT, VACUUM_PERMEABILITY } from "./constants";
import { type Calculator, withCaution } from "./calculator-types";
import { NANO } from "./units";

/** (μ0 ħ γp / 4π)² · 5π/96 in T² m⁶. */
const PREFACTOR = ((VACUUM_PERMEABILITY * REDUCED_PLANCK_CONSTANT * PROTON_GYROMAGNETIC_RATIO) / (4 * Math.PI)) ** 2 * ((5 * Math.PI) / 96);

/** 1 nm⁻³ in m⁻³. */
const PER_NM3 = 1e27;

/** RMS field (T) from protons of density `densityPerM3` (m⁻³) above an NV at depth `depthM` (m). */
export function nmrRmsField(depthM: number, densityPerM3: number): number {
  return Math.sqrt((densityPerM3 * PREFACTOR) / depthM ** 3);
}

/** NV depth (m) that gives RMS field `rmsFieldT` (T) for proton density `densityPerM3` (m⁻³). */
export function nmrDepthFromRmsField(rmsFieldT: number, densityPerM3: number): number {
  return Math.cbrt((densityPerM3 * PREFACTOR) / rmsFieldT ** 2);
}

const ASSUMPTIONS = withCaution(
  "Uniform proton layer filling the half-space above a flat (100) surface; the 5π/96 factor takes the transverse spin components (checked by numerical integration).",
  "Thermal (statistical) polarisation, no diffusion, no surface water layer or adsorbates.",
  "d is the distance from the NV to the lower boundary of the proton layer (the diamond surface when the sample wets it directly).",
);
const SOURCE = "Pham et al., PRB 93, 045425 (2016); Staudacher et al., Science 339, 561 (2013) (printed form from memory)";
const DENSITY_INPUT = {
  name: "rho",
  label: "Proton density ρ (water ≈ 67)",
  unit: "nm⁻³",
  default: 67,
  min: 0,
  max: 1000,
  exclusiveMin: true,
};

export const nmrRmsFieldCalculator: Calculator = {
  id: "nv-nmr-brms",
  title: "NV depth → proton NMR field B_rms",
  formula: "B_rms² = ρ (μ0 ħ γp / 4π)² · 5π / (96 d³)",
  assumptions: ASSUMPTIONS,
  source: SOURCE,
  inputs: [{ name: "d", label: "NV depth d", unit: "nm", default: 10, min: 0, max: 1000, exclusiveMin: true }, DENSITY_INPUT],
  outputs: [{ name: "B_rms", label: "RMS field B_rms", unit: "nT" }],
  compute({ d, rho }) {
    return { B_rms: nmrRmsField(d * NANO, rho * PER_NM3) / NANO };
  },
};

export const nmrDepthCalculator: Calculator = {
  id: "nv-nmr-depth",
  title: "Proton NMR field B_rms → NV depth",
  formula: "d = [ρ (μ0 ħ γp / 4π)² · 5π / (96 B_rms²)]^(1/3)",
  assumptions: ASSUMPTIONS,
  source: SOURCE,
  inputs: [{ name: "B_rms", label: "RMS field B_rms", unit: "nT", default: 300, min: 0, max: 1e7, exclusiveMin: true }, DENSITY_INPUT],
  outputs: [{ name: "d", label: "NV depth d", unit: "nm" }],
  compute({ B_rms, rho }) {
    return { d: nmrDepthFromRmsField(B_rms * NANO, rho * PER_NM3) / NANO };
  },
};
