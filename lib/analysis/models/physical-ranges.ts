/**
 * Plausible values of the NV centre's nitrogen hyperfine splitting |A∥| in MHz, for judging fits:
 * windows around the measured splittings (2.14 MHz for ¹⁴N, 3.03 MHz for ¹⁵N; Felton et al., PRB 79,
 * 075203 (2009), the constants in lib/physics/constants) wide enough for fit error and the small
 * differences between centres. A fitted |A∥| outside means the lines the model matched are not a
 * hyperfine multiplet (e.g. the 235 MHz between f₋ and f₊ at 4.2 mT).
 */
import type { PhysicalRange } from "./types";

export const N14_SPLITTING_RANGE: PhysicalRange = {
  name: "Apar",
  range: [1.5, 3],
  unit: "MHz",
  absolute: true,
  what: "the ¹⁴N hyperfine splitting |A∥| of the NV centre",
};

export const N15_SPLITTING_RANGE: PhysicalRange = {
  name: "Apar",
  range: [2.5, 3.5],
  unit: "MHz",
  absolute: true,
  what: "the ¹⁵N hyperfine splitting |A∥| of the NV centre",
};
