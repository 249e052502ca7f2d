import { describe, expect, it } from "vitest";
import {
  BOHR_MAGNETON,
  ELEMENTARY_CHARGE,
  FREE_ELECTRON_G,
  NUCLEI,
  NV_14N_HYPERFINE_PARALLEL,
  NV_15N_HYPERFINE_PARALLEL,
  NV_G_FACTOR,
  NV_GAMMA,
  NV_MINUS_ZPL_ENERGY_EV,
  NV_ZERO_FIELD_SPLITTING,
  NV_ZERO_ZPL_ENERGY_EV,
  NV_ZFS_TEMPERATURE_COEFFICIENT,
  PLANCK_CONSTANT,
  PROTON_GAMMA_OVER_2PI,
  PROTON_GYROMAGNETIC_RATIO,
  PROTON_MAGNETIC_MOMENT,
  REDUCED_PLANCK_CONSTANT,
  SHIELDED_PROTON_GAMMA_OVER_2PI,
  SPEED_OF_LIGHT,
  VACUUM_PERMEABILITY,
} from "@/lib/physics/constants";
import { PROTON_MOMENT_FROM_GAMMA } from "@/lib/physics/dipole";
import { expectDigits } from "./expect-digits";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

// CODATA 2018: Tiesinga, Mohr, Newell & Taylor, Rev. Mod. Phys. 93, 025010 (2021),
// doi:10.1103/RevModPhys.93.025010; names as in NIST's list of the 2018 values (physics.nist.gov/constants).
// CODATA 2022 differs from these only past the 8th significant digit where it differs at all (from memory).
describe("CODATA 2018 constants", () => {
  it("match the published values", () => {
    expect(PROTON_GAMMA_OVER_2PI).toBe(42.577478518e6); // CODATA 2018 "proton gyromag. ratio in MHz/T" 42.577 478 518
    expect(PROTON_GYROMAGNETIC_RATIO).toBe(2.6752218744e8); // CODATA 2018 "proton gyromag. ratio" 2.675 221 8744 e8 s⁻¹ T⁻¹
    expect(SHIELDED_PROTON_GAMMA_OVER_2PI).toBe(42.57638474e6); // CODATA 2018 "shielded proton gyromag. ratio in MHz/T" (H₂O, sphere, 25 °C)
    expect(PROTON_MAGNETIC_MOMENT).toBe(1.41060679736e-26); // CODATA 2018 "proton mag. mom." 1.410 606 797 36 e-26 J/T
    expect(VACUUM_PERMEABILITY).toBe(1.25663706212e-6); // CODATA 2018 "vacuum mag. permeability" 1.256 637 062 12 e-6 N/A²
    expect(REDUCED_PLANCK_CONSTANT).toBe(1.054571817e-34); // CODATA 2018 "reduced Planck constant" 1.054 571 817... e-34 J s (exact = h/2π, shown truncated)
    expect(PLANCK_CONSTANT).toBe(6.62607015e-34); // CODATA 2018 "Planck constant" 6.626 070 15 e-34 J/Hz (exact)
    expect(BOHR_MAGNETON).toBe(9.2740100783e-24); // CODATA 2018 "Bohr magneton" 9.274 010 0783 e-24 J/T
    expect(FREE_ELECTRON_G).toBe(2.00231930436256); // CODATA 2018 "electron g factor" −2.002 319 304 362 56 (magnitude)
    expect(SPEED_OF_LIGHT).toBe(299792458); // CODATA 2018 "speed of light in vacuum" (exact, defining constant)
    expect(ELEMENTARY_CHARGE).toBe(1.602176634e-19); // CODATA 2018 "elementary charge" (exact, defining constant)
  });

  it("are consistent with each other", () => {
    // CODATA 2018: γp/2π = γp / 2π, ħ = h / 2π, μp = ħγp/2 (to the digits published)
    expect(rel(PROTON_GYROMAGNETIC_RATIO / (2 * Math.PI), PROTON_GAMMA_OVER_2PI)).toBeLessThan(1e-9);
    expect(rel(PLANCK_CONSTANT / (2 * Math.PI), REDUCED_PLANCK_CONSTANT)).toBeLessThan(1e-9);
    expect(rel(PROTON_MOMENT_FROM_GAMMA, PROTON_MAGNETIC_MOMENT)).toBeLessThan(1e-9);
    // The pitfall in the point-dipole field: μp = ħγp/2 for the spin-½ proton, not ħγp
    expect(rel(REDUCED_PLANCK_CONSTANT * PROTON_GYROMAGNETIC_RATIO, PROTON_MAGNETIC_MOMENT)).toBeGreaterThan(0.9);
  });
});

describe("NV centre constants", () => {
  it("g = 2.0028 gives γ_NV = 28.0317 GHz/T", () => {
    expect(NV_G_FACTOR).toBe(2.0028); // Loubser & van Wyk, Rep. Prog. Phys. 41, 1201 (1978), doi:10.1088/0034-4885/41/8/002 (value from memory)
    expectDigits(NV_GAMMA / 1e9, "28.0317"); // γ_NV = gμB/h = 2.0028 × 9.2740100783e-24 / 6.62607015e-34 = 28.03168 GHz/T (CODATA 2018 μB, h)
  });

  it("D, dD/dT, hyperfine and ZPL values", () => {
    expect(NV_ZERO_FIELD_SPLITTING).toBe(2.87e9); // Acosta et al., Phys. Rev. Lett. 104, 070801 (2010), doi:10.1103/PhysRevLett.104.070801 (from memory)
    expect(NV_ZFS_TEMPERATURE_COEFFICIENT).toBe(-74e3); // Acosta et al. 2010 (−74.2 kHz/K at room temperature); Doherty et al., Phys. Rep. 528, 1 (2013), doi:10.1016/j.physrep.2013.02.001 (from memory)
    expect(NV_14N_HYPERFINE_PARALLEL).toBe(-2.14e6); // Felton et al., Phys. Rev. B 79, 075203 (2009), doi:10.1103/PhysRevB.79.075203: A∥ = −2.14(7) MHz (from memory)
    expect(NV_15N_HYPERFINE_PARALLEL).toBe(3.03e6); // Felton et al. 2009: A∥ = +3.03(3) MHz (from memory)
    expect(NV_MINUS_ZPL_ENERGY_EV).toBe(1.945); // Davies & Hamer, Proc. R. Soc. Lond. A 348, 285 (1976), the 1.945 eV band (from memory)
    expect(NV_ZERO_ZPL_ENERGY_EV).toBe(2.156); // 2.156 eV (575 nm) NV⁰ line as tabulated by Doherty et al. 2013 (from memory; not from Davies & Hamer 1976, which treats the 1.945 eV band)
  });
});

describe("nuclear gyromagnetic ratios γ/2π", () => {
  // IUPAC 2001: Harris et al., Pure Appl. Chem. 73, 1795 (2001), doi:10.1351/pac200173111795, Table 1,
  // magnetogyric ratio γ in 10⁷ rad s⁻¹ T⁻¹ divided by 2π here (table values from memory).
  it("match CODATA 2018 (¹H) and IUPAC 2001 (others)", () => {
    expect(NUCLEI["1H"].gammaOver2Pi).toBe(42.577478518e6); // CODATA 2018 "proton gyromag. ratio in MHz/T"
    expect(NUCLEI["1H-shielded"].gammaOver2Pi).toBe(42.57638474e6); // CODATA 2018 "shielded proton gyromag. ratio in MHz/T"
    expect(NUCLEI["13C"].gammaOver2Pi).toBe(10.7084e6); // Harris et al. 2001, Table 1: 6.728284 / 2π = 1.07084
    expect(NUCLEI["19F"].gammaOver2Pi).toBe(40.0776e6); // Harris et al. 2001, Table 1: 25.18148 / 2π = 4.00776
    expect(NUCLEI["14N"].gammaOver2Pi).toBe(3.0777e6); // Harris et al. 2001, Table 1: 1.9337792 / 2π = 0.307771
    expect(NUCLEI["15N"].gammaOver2Pi).toBe(-4.3173e6); // Harris et al. 2001, Table 1: −2.71261804 / 2π = −0.431727 (negative γ)
  });
});
