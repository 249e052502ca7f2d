// Round trips through forward and inverse formulas over wide input ranges: ODMR f± = D ± γB, Larmor
// f = (γ/2π)B, the NV-NMR B_rms form of Pham et al., Phys. Rev. B 93, 045425 (2016) (from memory), E = hc/λ.
// No expected values from outside: each direction checks the other.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { runCalculator } from "@/lib/physics/calculators";
import { odmrFieldFromResonances, odmrResonances } from "@/lib/physics/odmr";
import { fieldFromLarmor, larmorFrequency } from "@/lib/physics/larmor";
import { nmrDepthFromRmsField, nmrRmsField } from "@/lib/physics/nv-nmr";
import { photonEnergyEv, photonWavelengthNm } from "@/lib/physics/photon";
import { LARMOR_NUCLEI } from "@/lib/physics/constants";

const close = (a: number, b: number, relTol = 1e-12) => Math.abs(a - b) <= relTol * Math.abs(b);

describe("round trips", () => {
  // Below D/γ (≈ 100 mT) only: past it the lower line folds over and the pair formula no longer applies.
  it("field → ODMR resonances → field and D (f± = D ± γB)", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-6, max: 0.09, noNaN: true }), fc.double({ min: 2.8e9, max: 2.9e9, noNaN: true }), (b, d) => {
        const { fMinus, fPlus } = odmrResonances(b, d);
        const back = odmrFieldFromResonances(fMinus, fPlus);
        return close(back.fieldT, b, 1e-8) && close(back.zfsHz, d);
      }),
    );
  });

  it("through the calculators: 5 mT → f± → 5 mT", () => {
    const f = runCalculator("odmr-resonances", { B: 5, D: 2870 }).outputs;
    const back = runCalculator("odmr-field-from-pair", { f_minus: f.f_minus, f_plus: f.f_plus }).outputs;
    expect(back.B).toBeCloseTo(5, 10);
    expect(back.D).toBeCloseTo(2870, 9);
    const single = runCalculator("odmr-field-from-single-line", { f_minus: f.f_minus, D: 2870 }).outputs;
    expect(single.B).toBeCloseTo(5, 10);
  });

  it("depth → B_rms → depth (Pham et al. 2016 form, from memory)", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-9, max: 1e-6, noNaN: true }), fc.double({ min: 1e27, max: 1e29, noNaN: true }), (d, rho) =>
        close(nmrDepthFromRmsField(nmrRmsField(d, rho), rho), d, 1e-12),
      ),
    );
  });

  it("field → Larmor frequency → field for every nucleus (CODATA 2018, IUPAC 2001)", () => {
    fc.assert(
      fc.property(fc.constantFrom(...LARMOR_NUCLEI), fc.double({ min: 1e-4, max: 30, noNaN: true }), (n, b) =>
        close(fieldFromLarmor(n, larmorFrequency(n, b)), b),
      ),
    );
  });

  it("wavelength → photon energy → wavelength (E = hc/λ)", () => {
    fc.assert(fc.property(fc.double({ min: 100, max: 3000, noNaN: true }), (nm) => close(photonWavelengthNm(photonEnergyEv(nm)), nm)));
  });
});
