/**
 * AC magnetic sensitivity of one NV with a Hahn echo (Taylor et al., Nat. Phys. 4, 810 (2008)):
 * η = (π/2) · ħ/(g μB) · 1/(C √T2) in T/√Hz; minimum detectable field δB = η/√T_total in T.
 * Pure functions use SI (s, T); the calculator uses µs, s, nT/√Hz and nT.
 */
import { BOHR_MAGNETON, NV_G_FACTOR, PLANCK_CONSTANT, REDUCED_PLANCK_CONSTANT } from "./constants";
import { type Calculator, withCaution } from "./calculator-types";
import { MICRO, NANO } from "./units";

/** Hahn-echo AC sensitivity η in T/√Hz for coherence time `t2S` (s) and readout factor `c` (0 < C ≤ 1). */
function hahnEchoSensitivity(t2S: number, c: number, g: number = NV_G_FACTOR): number {
  return ((Math.PI / 2) * REDUCED_PLANCK_CONSTANT) / (g * BOHR_MAGNETON) / (c * Math.sqrt(t2S));
}

/** Minimum detectable field δB = η/√T_total in T, for η in T/√Hz and total time in s. */
function minimumDetectableField(sensitivityTPerRootHz: number, totalTimeS: number): number {
  return sensitivityTPerRootHz / Math.sqrt(totalTimeS);
}

export const hahnEchoSensitivityCalculator: Calculator = {
  id: "hahn-echo-sensitivity",
  title: "Hahn-echo AC sensitivity and minimum detectable field",
  formula: "η = (π/2) · ħ/(g μB) · 1/(C √T2);  δB = η / √T_total",
  assumptions: withCaution(
    "Single NV, echo time τ ≈ T2, signal at the best phase, white noise, no dead time (readout and initialisation ignored).",
    "C is the overall readout-efficiency factor (≤ 1) folding in contrast and photon shot noise, not the raw ODMR dip depth.",
    "g = 2.0028.",
  ),
  source: "Taylor et al., Nat. Phys. 4, 810 (2008); constants CODATA 2018",
  inputs: [
    { name: "T2", label: "Coherence time T2", unit: "µs", default: 100, min: 0, max: 1e9, exclusiveMin: true },
    { name: "C", label: "Readout-efficiency factor C", unit: "1", default: 0.03, min: 0, max: 1, exclusiveMin: true },
    { name: "T_total", label: "Total measurement time", unit: "s", default: 1, min: 0, max: 1e9, exclusiveMin: true },
  ],
  outputs: [
    { name: "eta", label: "Sensitivity η", unit: "nT/√Hz" },
    { name: "dB_min", label: "Minimum detectable field δB", unit: "nT" },
  ],
  compute({ T2, C, T_total }) {
    const eta = hahnEchoSensitivity(T2 * MICRO, C);
    return { eta: eta / NANO, dB_min: minimumDetectableField(eta, T_total) / NANO };
  },
};

/** Line-shape factor P_F of a Lorentzian dip, 4/(3√3) ≈ 0.770 (Dréau et al. 2011). */
const LORENTZIAN_SHAPE_FACTOR = 4 / (3 * Math.sqrt(3));

/**
 * Shot-noise-limited DC sensitivity of continuous-wave ODMR in T/√Hz (Dréau et al., PRB 84,
 * 195204 (2011)): η ≈ P_F · h/(g μB) · Δν/(C √R), for full linewidth Δν (Hz), contrast C and
 * detected count rate R (counts/s).
 */
function cwOdmrSensitivity(linewidthHz: number, contrast: number, countRate: number, g: number = NV_G_FACTOR): number {
  return (LORENTZIAN_SHAPE_FACTOR * PLANCK_CONSTANT * linewidthHz) / (g * BOHR_MAGNETON * contrast * Math.sqrt(countRate));
}

export const cwOdmrSensitivityCalculator: Calculator = {
  id: "cw-odmr-sensitivity",
  title: "CW-ODMR shot-noise sensitivity",
  formula: "η ≈ P_F · h/(g μB) · Δν/(C √R),  P_F = 4/(3√3) for a Lorentzian dip",
  assumptions: withCaution(
    "Photon shot noise only (no laser or microwave noise), a Lorentzian dip read at its steepest slope, field along the NV axis.",
    "Δν is the full width at half maximum, C the dip depth (contrast), R the detected count rate off resonance.",
    "Power broadening ties Δν and C together: the best sensitivity sits at a compromise, not at the largest contrast.",
    "g = 2.0028.",
  ),
  source: "Dréau et al., Phys. Rev. B 84, 195204 (2011); constants CODATA 2018",
  inputs: [
    { name: "linewidth", label: "Linewidth Δν (FWHM)", unit: "MHz", default: 1, min: 0, max: 1e4, exclusiveMin: true },
    { name: "C", label: "Contrast C", unit: "1", default: 0.01, min: 0, max: 1, exclusiveMin: true },
    { name: "R", label: "Count rate R", unit: "kcps", default: 100, min: 0, max: 1e9, exclusiveMin: true },
  ],
  outputs: [{ name: "eta", label: "Sensitivity η", unit: "nT/√Hz" }],
  compute({ linewidth, C, R }) {
    return { eta: cwOdmrSensitivity(linewidth * 1e6, C, R * 1e3) / NANO };
  },
};
