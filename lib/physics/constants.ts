/**
 * Physical constants for the NV calculators, all in SI units unless the name says otherwise.
 *
 * Fundamental constants: CODATA 2018 recommended values (Tiesinga et al., Rev. Mod. Phys. 93,
 * 025010 (2021); NIST, physics.nist.gov/constants). CODATA 2022 differs only past the 8th digit.
 * NV-centre and nuclear values carry their own source beside them; "(from memory)" marks a
 * source that was recalled rather than re-read.
 */

// ---- CODATA 2018 -------------------------------------------------------------------------

/** Planck constant h in J s (exact in the 2019 SI). */
export const PLANCK_CONSTANT = 6.62607015e-34;
/** Reduced Planck constant ħ = h/2π in J s (exact, truncated to the CODATA digits). */
export const REDUCED_PLANCK_CONSTANT = 1.054571817e-34;
/** Speed of light in vacuum c in m/s (exact). */
export const SPEED_OF_LIGHT = 299_792_458;
/** Elementary charge e in C (exact); also the J-per-eV factor. */
export const ELEMENTARY_CHARGE = 1.602176634e-19;
/** Vacuum magnetic permeability μ0 in N/A² (= T m/A). */
export const VACUUM_PERMEABILITY = 1.25663706212e-6;
/** Bohr magneton μB in J/T. */
export const BOHR_MAGNETON = 9.2740100783e-24;
/** Free-electron g-factor, magnitude (dimensionless). */
export const FREE_ELECTRON_G = 2.00231930436256;
/** Proton gyromagnetic ratio γp in s⁻¹ T⁻¹ (angular). */
export const PROTON_GYROMAGNETIC_RATIO = 2.6752218744e8;
/** Proton γp/2π in Hz/T. */
export const PROTON_GAMMA_OVER_2PI = 42.577478518e6;
/** Shielded proton γ′p/2π (H₂O, spherical sample, 25 °C) in Hz/T. */
export const SHIELDED_PROTON_GAMMA_OVER_2PI = 42.57638474e6;
/** Proton magnetic moment μp in J/T (CODATA value; equals ħγp/2). */
export const PROTON_MAGNETIC_MOMENT = 1.41060679736e-26;

// ---- NV centre in diamond ----------------------------------------------------------------

/** NV⁻ ground-state g-factor, dimensionless: 2.0028(3). Loubser & van Wyk, Rep. Prog. Phys. 41, 1201 (1978) (from memory). */
export const NV_G_FACTOR = 2.0028;
/** NV electron gyromagnetic ratio γ_NV = g μB / h in Hz/T (≈ 28.0317 GHz/T). */
export const NV_GAMMA = (NV_G_FACTOR * BOHR_MAGNETON) / PLANCK_CONSTANT;
/** Ground-state zero-field splitting D at room temperature in Hz. Acosta et al., PRL 104, 070801 (2010) (from memory). */
export const NV_ZERO_FIELD_SPLITTING = 2.87e9;
/** Temperature coefficient dD/dT near room temperature in Hz/K. Acosta et al. 2010 (from memory). */
export const NV_ZFS_TEMPERATURE_COEFFICIENT = -74e3;
/**
 * ¹⁴N ground-state hyperfine A∥ in Hz: −2.14(7) MHz. Felton et al., Phys. Rev. B 79, 075203 (2009),
 * doi:10.1103/PhysRevB.79.075203, the value tabulated by Doherty et al., Phys. Rep. 528, 1 (2013),
 * doi:10.1016/j.physrep.2013.02.001 (both from memory). Later, narrower-line measurements put it
 * near −2.16 MHz (e.g. Steiner et al., PRB 81, 035205 (2010); from memory), inside that
 * uncertainty. The one value used throughout: the calculators' line positions and the ¹⁴N fit
 * models' descriptions both read it from here (a fit measures |A∥|, it never assumes it).
 */
export const NV_14N_HYPERFINE_PARALLEL = -2.14e6;
/** ¹⁵N hyperfine A∥ in Hz: +3.03(3) MHz. Felton et al. 2009 (from memory). */
export const NV_15N_HYPERFINE_PARALLEL = 3.03e6;
/** |A∥| of ¹⁴N in MHz (2.14), the spacing of the triplet's lines, for text and calculators in MHz. */
export const NV_14N_SPLITTING_MHZ = Math.abs(NV_14N_HYPERFINE_PARALLEL) / 1e6;
/** |A∥| of ¹⁵N in MHz (3.03), the spacing of the doublet's lines. */
export const NV_15N_SPLITTING_MHZ = Math.abs(NV_15N_HYPERFINE_PARALLEL) / 1e6;
/** NV⁻ zero-phonon line photon energy in eV (≈ 637.4 nm). Davies & Hamer, Proc. R. Soc. A 348, 285 (1976) (from memory). */
export const NV_MINUS_ZPL_ENERGY_EV = 1.945;
/** NV⁰ zero-phonon line photon energy in eV (≈ 575.1 nm). Davies & Hamer 1976 (from memory). */
export const NV_ZERO_ZPL_ENERGY_EV = 2.156;

// ---- Nuclear gyromagnetic ratios γ/2π in Hz/T --------------------------------------------

export type Nucleus = "1H" | "1H-shielded" | "13C" | "19F" | "14N" | "15N";

export interface NucleusInfo {
  id: Nucleus;
  /** Display label, e.g. "¹H". */
  label: string;
  /** Signed γ/2π in Hz/T. */
  gammaOver2Pi: number;
  source: string;
}

/** Nuclear γ/2π (signed, Hz/T). ¹H values from CODATA 2018; others from IUPAC 2001 (Harris et al., Pure Appl. Chem. 73, 1795). */
export const NUCLEI: Readonly<Record<Nucleus, NucleusInfo>> = {
  "1H": { id: "1H", label: "¹H", gammaOver2Pi: PROTON_GAMMA_OVER_2PI, source: "CODATA 2018" },
  "1H-shielded": {
    id: "1H-shielded",
    label: "¹H (shielded, H₂O, 25 °C)",
    gammaOver2Pi: SHIELDED_PROTON_GAMMA_OVER_2PI,
    source: "CODATA 2018",
  },
  "13C": { id: "13C", label: "¹³C", gammaOver2Pi: 10.7084e6, source: "IUPAC 2001, Harris et al., Pure Appl. Chem. 73, 1795" },
  "19F": { id: "19F", label: "¹⁹F", gammaOver2Pi: 40.0776e6, source: "IUPAC 2001, Harris et al., Pure Appl. Chem. 73, 1795" },
  "14N": { id: "14N", label: "¹⁴N", gammaOver2Pi: 3.0777e6, source: "IUPAC 2001, Harris et al., Pure Appl. Chem. 73, 1795" },
  "15N": { id: "15N", label: "¹⁵N", gammaOver2Pi: -4.3173e6, source: "IUPAC 2001, Harris et al., Pure Appl. Chem. 73, 1795" },
};

/** The nuclei offered by the Larmor and "which nucleus" calculators (free proton, not shielded). */
export const LARMOR_NUCLEI: readonly Nucleus[] = ["1H", "13C", "19F", "14N", "15N"];
