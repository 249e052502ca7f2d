/**
 * Nuclear Larmor frequency f = |γ/2π| B, its inverse, "which nucleus matches this peak", and the
 * dynamical-decoupling dip τ = 1/(2f). Pure functions use SI (Hz, T, s); calculators MHz, mT, ns.
 */
import { LARMOR_NUCLEI, NUCLEI, type Nucleus } from "./constants";
import { type Calculator, withCaution } from "./calculator-types";
import { MEGA, MILLI, NANO } from "./units";

const SOURCE_GAMMA = "γ/2π: ¹H CODATA 2018; ¹³C, ¹⁹F, ¹⁴N, ¹⁵N IUPAC 2001 (Harris et al., Pure Appl. Chem. 73, 1795)";
const BARE = "Bare gyromagnetic ratios: chemical shift and Knight shift (ppm level) are ignored; ¹H uses the free proton, not shielded water.";
/** Best relative mismatch above which the matcher says nothing fits (common practice). */
const NO_MATCH_RELATIVE = 0.01;

/** Larmor frequency in Hz (magnitude) of `nucleus` in a field of `fieldT` tesla. */
export function larmorFrequency(nucleus: Nucleus, fieldT: number): number {
  return Math.abs(NUCLEI[nucleus].gammaOver2Pi) * fieldT;
}

/** Field in T at which `nucleus` precesses at `frequencyHz`. */
export function fieldFromLarmor(nucleus: Nucleus, frequencyHz: number): number {
  return frequencyHz / Math.abs(NUCLEI[nucleus].gammaOver2Pi);
}

export interface NucleusMatch {
  nucleus: Nucleus;
  /** Expected Larmor frequency at the given field, Hz. */
  expectedHz: number;
  /** Signed (f_peak − f_expected)/f_expected, dimensionless. */
  relativeMismatch: number;
}

/** Nuclei ranked by |relative mismatch| between a peak (Hz) and their Larmor frequency at `fieldT` (T). */
export function matchNucleus(peakHz: number, fieldT: number, nuclei: readonly Nucleus[] = LARMOR_NUCLEI): NucleusMatch[] {
  return nuclei
    .map((nucleus) => {
      const expectedHz = larmorFrequency(nucleus, fieldT);
      return { nucleus, expectedHz, relativeMismatch: (peakHz - expectedHz) / expectedHz };
    })
    .sort((a, b) => Math.abs(a.relativeMismatch) - Math.abs(b.relativeMismatch));
}

/** First-order dynamical-decoupling dip: pulse spacing τ = 1/(2f) in s for a signal at f (Hz). */
export function decouplingDipSpacing(frequencyHz: number): number {
  return 1 / (2 * frequencyHz);
}

const FIELD_INPUT = { name: "B", label: "Magnetic field B", unit: "mT", default: 100, min: 0, max: 30_000, exclusiveMin: true };
const FREQ_INPUT = { name: "f", label: "Frequency f", unit: "MHz", default: 4.2577, min: 0, max: 2_000, exclusiveMin: true };

export const larmorFrequencyCalculator: Calculator = {
  id: "larmor-frequency",
  title: "Field → nuclear Larmor frequencies",
  formula: "f = |γ/2π| · B",
  assumptions: withCaution(BARE, "¹⁵N has negative γ; the frequency shown is its magnitude."),
  source: SOURCE_GAMMA,
  inputs: [FIELD_INPUT],
  outputs: LARMOR_NUCLEI.map((n) => ({ name: `f_${n}`, label: `${NUCLEI[n].label} Larmor frequency`, unit: "MHz" })),
  compute({ B }) {
    return Object.fromEntries(LARMOR_NUCLEI.map((n) => [`f_${n}`, larmorFrequency(n, B * MILLI) / MEGA]));
  },
};

export const larmorFieldCalculator: Calculator = {
  id: "larmor-field",
  title: "Nuclear Larmor frequency → field",
  formula: "B = f / |γ/2π|",
  assumptions: withCaution(BARE, "One field per candidate nucleus; which one applies is for you to decide."),
  source: SOURCE_GAMMA,
  inputs: [FREQ_INPUT],
  outputs: LARMOR_NUCLEI.map((n) => ({ name: `B_${n}`, label: `Field if the peak is ${NUCLEI[n].label}`, unit: "mT" })),
  compute({ f }) {
    return Object.fromEntries(LARMOR_NUCLEI.map((n) => [`B_${n}`, fieldFromLarmor(n, f * MEGA) / MILLI]));
  },
};

export const nucleusMatchCalculator: Calculator = {
  id: "nucleus-match",
  title: "Which nucleus matches this peak at this field?",
  formula: "mismatch = |f_peak − |γ/2π| B| / (|γ/2π| B); rank 1 = smallest mismatch",
  assumptions: withCaution(
    BARE,
    "The peak is a first-order Larmor response; dynamical-decoupling harmonics and spurious ¹³C dips from finite pulses can mimic other nuclei (common practice).",
  ),
  source: SOURCE_GAMMA,
  inputs: [{ ...FREQ_INPUT, name: "f_peak", label: "Peak frequency" }, FIELD_INPUT],
  outputs: LARMOR_NUCLEI.flatMap((n) => [
    { name: `mismatch_${n}`, label: `${NUCLEI[n].label} relative mismatch`, unit: "1" },
    { name: `rank_${n}`, label: `${NUCLEI[n].label} rank`, unit: "1" },
  ]),
  compute({ f_peak, B }) {
    const ranked = matchNucleus(f_peak * MEGA, B * MILLI);
    const out: Record<string, number> = {};
    ranked.forEach((m, i) => {
      out[`mismatch_${m.nucleus}`] = Math.abs(m.relativeMismatch);
      out[`rank_${m.nucleus}`] = i + 1;
    });
    return out;
  },
  warn({ f_peak, B }) {
    const [best] = matchNucleus(f_peak * MEGA, B * MILLI);
    const pct = (Math.abs(best.relativeMismatch) * 100).toPrecision(3);
    if (Math.abs(best.relativeMismatch) > NO_MATCH_RELATIVE) {
      return [`No nucleus within 1 % (closest: ${NUCLEI[best.nucleus].label}, ${pct} % off). Check the field or consider harmonics.`];
    }
    return [`Closest match: ${NUCLEI[best.nucleus].label}, ${pct} % off.`];
  },
};

export const decouplingDipCalculator: Calculator = {
  id: "decoupling-dip",
  title: "Dynamical-decoupling dip position",
  formula: "τ = 1 / (2f)",
  assumptions: withCaution(
    "τ is the centre-to-centre spacing of the π pulses (CPMG / XY-n), pulses treated as instantaneous.",
    "Higher-order dips appear at τ = k/(2f) for odd k (common practice).",
  ),
  source: "Filter-function picture of dynamical decoupling (common practice)",
  inputs: [{ ...FREQ_INPUT, label: "Signal (Larmor) frequency f" }],
  outputs: [{ name: "tau", label: "Pulse spacing τ", unit: "ns" }],
  compute({ f }) {
    return { tau: decouplingDipSpacing(f * MEGA) / NANO };
  },
};
