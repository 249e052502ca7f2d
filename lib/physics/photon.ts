/**
 * Photon energy ↔ vacuum wavelength, E = hc/λ. Pure functions use SI (J, m); the calculators
 * use eV and nm (hc ≈ 1239.842 eV nm).
 */
import { ELEMENTARY_CHARGE, PLANCK_CONSTANT, SPEED_OF_LIGHT } from "./constants";
import { type Calculator, withCaution } from "./calculator-types";
import { NANO } from "./units";

/** hc in eV·nm. */
const HC_EV_NM = (PLANCK_CONSTANT * SPEED_OF_LIGHT) / ELEMENTARY_CHARGE / NANO;

/** Photon energy in eV for a vacuum wavelength in nm. */
export function photonEnergyEv(wavelengthNm: number): number {
  return HC_EV_NM / wavelengthNm;
}

/** Vacuum wavelength in nm for a photon energy in eV. */
export function photonWavelengthNm(energyEv: number): number {
  return HC_EV_NM / energyEv;
}

const VACUUM = "Vacuum wavelength; spectrometers calibrated in air read about 0.03 % (≈ 0.18 nm at 637 nm) shorter (common practice).";
const SOURCE = "E = hc/λ with h, c, e exact (CODATA 2018)";

export const photonEnergyCalculator: Calculator = {
  id: "photon-energy",
  title: "Wavelength → photon energy",
  formula: "E = hc / λ",
  assumptions: withCaution(VACUUM),
  source: SOURCE,
  inputs: [{ name: "lambda", label: "Wavelength λ", unit: "nm", default: 637, min: 0, max: 1e7, exclusiveMin: true }],
  outputs: [{ name: "E", label: "Photon energy E", unit: "eV" }],
  compute({ lambda }) {
    return { E: photonEnergyEv(lambda) };
  },
};

export const photonWavelengthCalculator: Calculator = {
  id: "photon-wavelength",
  title: "Photon energy → wavelength",
  formula: "λ = hc / E",
  assumptions: withCaution(VACUUM),
  source: SOURCE,
  inputs: [{ name: "E", label: "Photon energy E", unit: "eV", default: 1.945, min: 0, max: 1e6, exclusiveMin: true }],
  outputs: [{ name: "lambda", label: "Wavelength λ", unit: "nm" }],
  compute({ E }) {
    return { lambda: photonWavelengthNm(E) };
  },
};
