// Rules of thumb a working NV physicist checks by eye. No single source: "common practice",
// except where a paper is named beside the check.
import { describe, expect, it } from "vitest";
import { runCalculator } from "@/lib/physics/calculators";
import { NV_MINUS_ZPL_ENERGY_EV, NV_ZERO_ZPL_ENERGY_EV } from "@/lib/physics/constants";
import { photonWavelengthNm } from "@/lib/physics/photon";
import { matchNucleus } from "@/lib/physics/larmor";
import { expectDigits } from "./expect-digits";

describe("orders of magnitude", () => {
  it("a single proton about 5 nm away gives a field of order 10 nT (common practice)", () => {
    for (const theta of [0, 45, 90]) {
      const b = runCalculator("proton-dipole-field", { d: 5, theta }).outputs.B;
      expect(b).toBeGreaterThan(3);
      expect(b).toBeLessThan(30);
    }
  });

  it("a proton Larmor peak near 8.9 MHz means a field near 0.209 T (common practice)", () => {
    const b = runCalculator("larmor-field", { f: 8.9 }).outputs.B_1H;
    expect(b).toBeCloseTo(209, 0); // mT
    expect(matchNucleus(8.9e6, 0.209)[0].nucleus).toBe("1H");
  });

  it("NV⁻ ZPL near 637 nm from 1.945 eV (Davies & Hamer 1976, from memory; common practice)", () => {
    const nm = photonWavelengthNm(NV_MINUS_ZPL_ENERGY_EV);
    expect(Math.abs(nm - 637)).toBeLessThan(1);
    // Davies & Hamer, Proc. R. Soc. Lond. A 348, 285 (1976) (from memory): 1.945 eV, quoted as 637.4 nm.
    // hc/E = 6.62607015e-34 × 299792458 / (1.945 × 1.602176634e-19) m = 637.45 nm (vacuum; CODATA 2018 exact h, c, e);
    // 1.945 eV carries 4 digits (±0.0005 eV ≈ ±0.16 nm), so only agreement within that is meaningful.
    expect(Math.abs(nm - 637.4)).toBeLessThan(0.16);
  });

  it("NV⁰ ZPL 2.156 eV = 575.1 nm (hc/E = 575.07 nm; the value as tabulated by Doherty et al., Phys. Rep. 528, 1 (2013), from memory)", () => {
    expectDigits(photonWavelengthNm(NV_ZERO_ZPL_ENERGY_EV), "575.1");
  });
});
