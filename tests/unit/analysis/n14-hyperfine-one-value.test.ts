/**
 * One ¹⁴N hyperfine |A∥| across the product: the constant, the calculators' line positions and
 * texts, and the fit models' descriptions agree on 2.14 MHz.
 * Source: Felton et al., Phys. Rev. B 79, 075203 (2009), doi:10.1103/PhysRevB.79.075203:
 * ¹⁴N A∥ = −2.14(7) MHz in the NV⁻ ground state; the same value in Doherty et al., Phys. Rep. 528, 1
 * (2013), doi:10.1016/j.physrep.2013.02.001 (both from memory).
 */
import { describe, expect, it } from "vitest";
import { listModels } from "@/lib/analysis";
import { listCalculators } from "@/lib/physics/calculators";
import { NV_14N_HYPERFINE_PARALLEL, NV_14N_SPLITTING_MHZ } from "@/lib/physics/constants";
import { hyperfineLines } from "@/lib/physics/odmr";

/** Every "<number> MHz" that a text gives for ¹⁴N (in the same sentence or clause). */
function n14Values(text: string): number[] {
  return [...text.matchAll(/¹⁴N[^.;"]*?(\d+(?:\.\d+)?) MHz/g)].map((m) => Number(m[1]));
}

describe("¹⁴N |A∥|", () => {
  it("is −2.14 MHz in the constants (Felton et al. 2009)", () => {
    expect(NV_14N_HYPERFINE_PARALLEL).toBe(-2.14e6);
    expect(NV_14N_SPLITTING_MHZ).toBe(2.14);
  });

  it("spaces the calculators' ¹⁴N triplet by 2.14 MHz", () => {
    const lines = hyperfineLines(2870e6, "14N");
    expect(lines[1] - lines[0]).toBeCloseTo(2.14e6, 3);
    expect(lines[2] - lines[1]).toBeCloseTo(2.14e6, 3);
  });

  it("is the value every calculator text and every fit model description gives for ¹⁴N", () => {
    const calculatorText = JSON.stringify(listCalculators());
    const modelText = JSON.stringify(listModels().map((m) => ({ title: m.title, formula: m.formula, params: m.params, derived: m.derived })));
    const fromCalculators = n14Values(calculatorText);
    const fromModels = n14Values(modelText);
    expect(fromCalculators.length).toBeGreaterThan(0);
    expect(fromModels.length).toBeGreaterThanOrEqual(2); // ramsey_14n and odmr_14n_triplet
    expect(new Set([...fromCalculators, ...fromModels])).toEqual(new Set([2.14]));
  });
});
