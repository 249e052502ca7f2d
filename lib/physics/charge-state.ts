/**
 * Charge-state indicator from PL spectra: the ratio of the NV⁻ (637 nm) and NV⁰ (575 nm)
 * zero-phonon-line areas. Areas in any common unit (counts, counts·nm); the result is dimensionless.
 */
import { type Calculator, withCaution } from "./calculator-types";

/** Simple ZPL-area ratio A(NV⁻)/A(NV⁰) and the NV⁻ share A(NV⁻)/(A(NV⁻)+A(NV⁰)). */
function zplAreaRatio(areaNvMinus: number, areaNvZero: number): { ratio: number; fractionNvMinus: number } {
  return { ratio: areaNvMinus / areaNvZero, fractionNvMinus: areaNvMinus / (areaNvMinus + areaNvZero) };
}

export const chargeStateRatioCalculator: Calculator = {
  id: "charge-state-ratio",
  title: "NV⁻ / NV⁰ zero-phonon-line area ratio",
  formula: "R = A(NV⁻) / A(NV⁰);  share = A(NV⁻) / (A(NV⁻) + A(NV⁰))",
  assumptions: withCaution(
    "A simple ratio of line areas, not of populations: the two charge states differ in Debye–Waller factor, absorption at the excitation wavelength and detection efficiency, none of which is corrected here.",
    "Background-subtracted ZPL areas from the same spectrum and excitation power; use it to compare samples measured the same way.",
  ),
  source: "ZPLs at 1.945 eV (NV⁻) and 2.156 eV (NV⁰): Davies & Hamer, Proc. R. Soc. A 348, 285 (1976) (from memory); ratio: common practice",
  inputs: [
    { name: "A_minus", label: "NV⁻ ZPL area", unit: "arb.", default: 1, min: 0 },
    { name: "A_zero", label: "NV⁰ ZPL area", unit: "arb.", default: 1, min: 0, exclusiveMin: true },
  ],
  outputs: [
    { name: "ratio", label: "A(NV⁻)/A(NV⁰)", unit: "1" },
    { name: "share_minus", label: "NV⁻ share of ZPL area", unit: "1" },
  ],
  compute({ A_minus, A_zero }) {
    const r = zplAreaRatio(A_minus, A_zero);
    return { ratio: r.ratio, share_minus: r.fractionNvMinus };
  },
  warn() {
    return ["ZPL area ratio is not the NV⁻/NV⁰ population ratio; compare only spectra taken the same way."];
  },
};
