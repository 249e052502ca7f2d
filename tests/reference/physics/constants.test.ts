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

describe("CODATA 2018 constants", () => {
  it("match the published values", () => {
    expect(PROTON_GAMMA_OVER_2PI).toBe(42.577478518e6); // CODATA 2018
    expect(PROTON_GYROMAGNETIC_RATIO).toBe(2.6752218744e8); // CODATA 2018
    expect(SHIELDED_PROTON_GAMMA_OVER_2PI).toBe(42.57638474e6); // CODATA 2018 (H₂O, sphere, 25 °C)
    expect(PROTON_MAGNETIC_MOMENT).toBe(1.41060679736e-26); // CODATA 2018
    expect(VACUUM_PERMEABILITY).toBe(1.25663706212e-6); // CODATA 2018
    expect(REDUCED_PLANCK_CONSTANT).toBe(1.054571817e-34); // CODATA 2018 (exact)
    expect(PLANCK_CONSTANT).toBe(6.62607015e-34); // CODATA 2018 (exact)
    expect(BOHR_MAGNETON).toBe(9.2740100783e-24); // CODATA 2018
    expect(FREE_ELECTRON_G).toBe(2.00231930436256); // CODATA 2018 (magnitude)
    expect(SPEED_OF_LIGHT).toBe(299792458); // CODATA 2018 (exact, defining constant)
    expect(ELEMENTARY_CHARGE).toBe(1.602176634e-19); // CODATA 2018 (exact, defining constant)
  });

  it("are consistent with each other", () => {
    // CODATA 2018: γp/2π = γp / 2π, ħ = h / 2π, μp = ħγp/2 (to the digits published)
    expect(rel(PROTON_GYROMAGNETIC_RATIO / (2 * Math.PI), PROTON_GAMMA_OVER_2PI)).toBeLessThan(1e-9);
    expect(rel(PLANCK_CONSTANT / (2 * Math.PI), REDUCED_PLANCK_CONSTANT)).toBeLessThan(1e-9);
    expect(rel(PROTON_MOMENT_FROM_GAMMA, PROTON_MAGNETIC_MOMENT)).toBeLessThan(1e-9);
    // Pitfall named in REFERENCES.md item 1: μp = ħγp/2, not ħγp
    expect(rel(REDUCED_PLANCK_CONSTANT * PROTON_GYROMAGNETIC_RATIO, PROTON_MAGNETIC_MOMENT)).toBeGreaterThan(0.9);
  });
});

describe("NV centre constants", () => {
  it("g = 2.0028 gives γ_NV = 28.0317 GHz/T", () => {
    expect(NV_G_FACTOR).toBe(2.0028); // Loubser & van Wyk, Rep. Prog. Phys. 41, 1201 (1978) (from memory)
    expectDigits(NV_GAMMA / 1e9, "28.0317"); // γ_NV = gμB/h, CODATA 2018 μB and h
  });

  it("D, dD/dT, hyperfine and ZPL values", () => {
    expect(NV_ZERO_FIELD_SPLITTING).toBe(2.87e9); // Acosta et al., PRL 104, 070801 (2010) (from memory)
    expect(NV_ZFS_TEMPERATURE_COEFFICIENT).toBe(-74e3); // Acosta et al. 2010; Doherty et al., Phys. Rep. 528, 1 (2013) (from memory)
    expect(NV_14N_HYPERFINE_PARALLEL).toBe(-2.14e6); // Felton et al., PRB 79, 075203 (2009) (from memory)
    expect(NV_15N_HYPERFINE_PARALLEL).toBe(3.03e6); // Felton et al. 2009 (from memory)
    expect(NV_MINUS_ZPL_ENERGY_EV).toBe(1.945); // Davies & Hamer, Proc. R. Soc. A 348, 285 (1976) (from memory)
    expect(NV_ZERO_ZPL_ENERGY_EV).toBe(2.156); // Davies & Hamer 1976 (from memory)
  });
});

describe("nuclear gyromagnetic ratios γ/2π", () => {
  it("match CODATA 2018 (¹H) and IUPAC 2001 (others)", () => {
    expect(NUCLEI["1H"].gammaOver2Pi).toBe(42.577478518e6); // CODATA 2018
    expect(NUCLEI["1H-shielded"].gammaOver2Pi).toBe(42.57638474e6); // CODATA 2018
    expect(NUCLEI["13C"].gammaOver2Pi).toBe(10.7084e6); // IUPAC 2001, Harris et al., Pure Appl. Chem. 73, 1795
    expect(NUCLEI["19F"].gammaOver2Pi).toBe(40.0776e6); // IUPAC 2001, Harris et al.
    expect(NUCLEI["14N"].gammaOver2Pi).toBe(3.0777e6); // IUPAC 2001, Harris et al.
    expect(NUCLEI["15N"].gammaOver2Pi).toBe(-4.3173e6); // IUPAC 2001, Harris et al. (negative γ)
  });
});
