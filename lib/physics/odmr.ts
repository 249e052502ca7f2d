/**
 * ODMR of the NV⁻ ground state with the field along the NV axis: f± = D ± γ_NV B.
 * Pure functions take and return SI (Hz, T); the calculators use MHz and mT.
 */
import {
  NV_GAMMA,
  NV_ZERO_FIELD_SPLITTING,
  NV_14N_HYPERFINE_PARALLEL,
  NV_15N_HYPERFINE_PARALLEL,
  NV_14N_SPLITTING_MHZ,
  NV_15N_SPLITTING_MHZ,
} from "./constants";
import { type Calculator, CalculatorInputError, withCaution } from "./calculator-types";
import { MEGA, MILLI } from "./units";

const SOURCE_ODMR =
  "f± = D ± γB with γ = gμB/h, g = 2.0028 (Loubser & van Wyk 1978, from memory); D = 2.870 GHz (Acosta et al., PRL 104, 070801 (2010), from memory)";
const AXIAL = "Field along the NV axis (no transverse component), NV⁻ ground state, room temperature.";
const HYPERFINE = `Line centres only: with ¹⁴N each line is a triplet spaced |A∥| ≈ ${NV_14N_SPLITTING_MHZ} MHz, with ¹⁵N a doublet spaced ${NV_15N_SPLITTING_MHZ} MHz.`;
/** |D − 2870 MHz| above which the pair calculator warns (common practice). */
const D_DEVIATION_WARN_HZ = 2e6;

/** Transition frequencies (Hz) for an axial field `fieldT` (T). Past the crossing f₋ is |D − γB|. */
export function odmrResonances(fieldT: number, zfsHz: number = NV_ZERO_FIELD_SPLITTING): { fMinus: number; fPlus: number } {
  return { fMinus: Math.abs(zfsHz - NV_GAMMA * fieldT), fPlus: zfsHz + NV_GAMMA * fieldT };
}

/** Axial field (T) and D (Hz) from both resonances (Hz): B = (f₊ − f₋)/(2γ), D = (f₊ + f₋)/2. */
export function odmrFieldFromResonances(fMinusHz: number, fPlusHz: number): { fieldT: number; zfsHz: number } {
  return { fieldT: (fPlusHz - fMinusHz) / (2 * NV_GAMMA), zfsHz: (fPlusHz + fMinusHz) / 2 };
}

/** Axial field (T) from the lower line alone: B = (D − f₋)/γ, valid only below D/γ. */
function odmrFieldFromLowerLine(fMinusHz: number, zfsHz: number = NV_ZERO_FIELD_SPLITTING): number {
  return (zfsHz - fMinusHz) / NV_GAMMA;
}

/** Field (T) at which the lower transition reaches zero frequency: D/γ ≈ 102.38 mT. */
function odmrSingleLineLimit(zfsHz: number = NV_ZERO_FIELD_SPLITTING): number {
  return zfsHz / NV_GAMMA;
}

/** Hyperfine line positions (Hz) around one electron-spin line centre (Hz), ascending. */
export function hyperfineLines(centreHz: number, isotope: "14N" | "15N"): number[] {
  if (isotope === "14N") {
    const a = Math.abs(NV_14N_HYPERFINE_PARALLEL);
    return [centreHz - a, centreHz, centreHz + a];
  }
  const half = Math.abs(NV_15N_HYPERFINE_PARALLEL) / 2;
  return [centreHz - half, centreHz + half];
}

const D_INPUT = { name: "D", label: "Zero-field splitting D", unit: "MHz", default: 2870, min: 2500, max: 3200 };

export const odmrFieldFromPairCalculator: Calculator = {
  id: "odmr-field-from-pair",
  title: "ODMR resonances → axial field and D",
  formula: "B = (f₊ − f₋) / (2γ_NV);  D = (f₊ + f₋) / 2;  γ_NV = g μB / h ≈ 28.0317 MHz/mT",
  assumptions: withCaution(AXIAL, "Both lines belong to the same NV orientation and B < D/γ ≈ 102.38 mT.", HYPERFINE),
  source: SOURCE_ODMR,
  inputs: [
    { name: "f_minus", label: "Lower resonance f₋", unit: "MHz", default: 2750, min: 0, max: 300_000, exclusiveMin: true },
    { name: "f_plus", label: "Upper resonance f₊", unit: "MHz", default: 2990, min: 0, max: 300_000, exclusiveMin: true },
  ],
  outputs: [
    { name: "B", label: "Axial field B", unit: "mT" },
    { name: "D", label: "Zero-field splitting D", unit: "MHz" },
  ],
  compute({ f_minus, f_plus }) {
    if (!(f_plus > f_minus)) throw new CalculatorInputError("f_plus", "must be above f_minus");
    const r = odmrFieldFromResonances(f_minus * MEGA, f_plus * MEGA);
    return { B: r.fieldT / MILLI, D: r.zfsHz / MEGA };
  },
  warn(_inputs, { D }) {
    const dev = D * MEGA - NV_ZERO_FIELD_SPLITTING;
    if (Math.abs(dev) <= D_DEVIATION_WARN_HZ) return [];
    return [
      `(f₊ + f₋)/2 = ${D.toFixed(2)} MHz differs from 2870 MHz by ${(dev / MEGA).toFixed(2)} MHz: ` +
        "a field component off the NV axis, strain or temperature (dD/dT ≈ −74 kHz/K) shifts it, " +
        "so B is then not the axial field alone.",
    ];
  },
};

export const odmrFieldFromSingleLineCalculator: Calculator = {
  id: "odmr-field-from-single-line",
  title: "One ODMR line → axial field",
  formula: "B = (D − f₋) / γ_NV, valid only for B < D/γ_NV ≈ 102.38 mT",
  assumptions: withCaution(AXIAL, "The line is the lower (m_s = 0 ↔ −1) transition and D is known.", HYPERFINE),
  source: SOURCE_ODMR,
  inputs: [{ name: "f_minus", label: "Lower resonance f₋", unit: "MHz", default: 2750, min: 0, max: 300_000, exclusiveMin: true }, D_INPUT],
  outputs: [
    { name: "B", label: "Axial field B", unit: "mT" },
    { name: "B_limit", label: "Validity limit D/γ", unit: "mT" },
  ],
  compute({ f_minus, D }) {
    if (!(f_minus < D)) throw new CalculatorInputError("f_minus", "must be below D for the lower line");
    return { B: odmrFieldFromLowerLine(f_minus * MEGA, D * MEGA) / MILLI, B_limit: odmrSingleLineLimit(D * MEGA) / MILLI };
  },
  warn({ f_minus, D }, { B_limit }) {
    const alt = ((D + f_minus) * MEGA) / NV_GAMMA / MILLI;
    return [
      `Valid only below D/γ = ${B_limit.toFixed(2)} mT; above it the lower line is f₋ = γB − D, ` +
        `and this frequency would mean B = ${alt.toFixed(2)} mT. Measure both lines to decide.`,
    ];
  },
};

export const odmrResonancesCalculator: Calculator = {
  id: "odmr-resonances",
  title: "Axial field → ODMR resonances",
  formula: "f± = D ± γ_NV B  (f₋ = |D − γ_NV B| past D/γ)",
  assumptions: withCaution(AXIAL, HYPERFINE),
  source: SOURCE_ODMR,
  inputs: [{ name: "B", label: "Axial field B", unit: "mT", default: 5, min: 0, max: 10_000 }, D_INPUT],
  outputs: [
    { name: "f_minus", label: "Lower resonance f₋", unit: "MHz" },
    { name: "f_plus", label: "Upper resonance f₊", unit: "MHz" },
  ],
  compute({ B, D }) {
    const r = odmrResonances(B * MILLI, D * MEGA);
    return { f_minus: r.fMinus / MEGA, f_plus: r.fPlus / MEGA };
  },
  warn({ B, D }) {
    const limit = odmrSingleLineLimit(D * MEGA) / MILLI;
    if (B < limit * 0.95) return [];
    return [
      `B is near or above D/γ = ${limit.toFixed(2)} mT, where the m_s = 0 and −1 levels cross; ` +
        "transverse fields and hyperfine mixing make the simple formula unreliable there.",
    ];
  },
};
