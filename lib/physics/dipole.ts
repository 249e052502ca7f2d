/**
 * Static point-dipole field of one proton (Jackson, Classical Electrodynamics, eq. 5.56):
 * |B| = (μ0/4π) μp √(1 + 3cos²θ) / d³ with μp = ħγp/2 (not ħγp). SI in the pure function;
 * the calculator uses nm, degrees and nT.
 */
import { PROTON_GYROMAGNETIC_RATIO, REDUCED_PLANCK_CONSTANT, VACUUM_PERMEABILITY } from "./constants";
import { type Calculator, withCaution } from "./calculator-types";
import { NANO, degToRad } from "./units";

/** Proton moment ħγp/2 in J/T, the value the dipole formula needs. */
export const PROTON_MOMENT_FROM_GAMMA = (REDUCED_PLANCK_CONSTANT * PROTON_GYROMAGNETIC_RATIO) / 2;

/**
 * Field of a point dipole `momentJT` (J/T) at distance `distanceM` (m) and polar angle `thetaRad`
 * from the moment axis. Returns |B| and the component along the moment, both in T.
 */
export function pointDipoleField(distanceM: number, thetaRad: number, momentJT: number = PROTON_MOMENT_FROM_GAMMA): { magnitude: number; parallel: number } {
  const scale = ((VACUUM_PERMEABILITY / (4 * Math.PI)) * momentJT) / distanceM ** 3;
  const c = Math.cos(thetaRad);
  return { magnitude: scale * Math.sqrt(1 + 3 * c * c), parallel: scale * (3 * c * c - 1) };
}

export const protonDipoleCalculator: Calculator = {
  id: "proton-dipole-field",
  title: "Field of one proton vs distance and angle",
  formula: "|B| = (μ0/4π) μp √(1 + 3cos²θ) / d³,  B∥ = (μ0/4π) μp (3cos²θ − 1) / d³,  μp = ħγp/2",
  assumptions: withCaution(
    "Fully polarised proton moment (static, classical point dipole); a real thermal sample averages to far less.",
    "θ is the angle between the proton moment and the line joining proton and sensor.",
  ),
  source: "Jackson, Classical Electrodynamics, eq. 5.56; γp CODATA 2018",
  inputs: [
    { name: "d", label: "Distance d", unit: "nm", default: 3, min: 0, max: 1e6, exclusiveMin: true },
    { name: "theta", label: "Polar angle θ", unit: "deg", default: 90, min: 0, max: 180 },
  ],
  outputs: [
    { name: "B", label: "Field magnitude |B|", unit: "nT" },
    { name: "B_parallel", label: "Component along the moment B∥", unit: "nT" },
  ],
  compute({ d, theta }) {
    const f = pointDipoleField(d * NANO, degToRad(theta));
    return { B: f.magnitude / NANO, B_parallel: f.parallel / NANO };
  },
};
