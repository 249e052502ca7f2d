/**
 * The multi-dip ODMR formula shown to users is the one computed: every dip is subtracted from the
 * baseline, y = B·(1 − c1·L1 − c2·L2 − …), L the peak-normalised Lorentzian.
 */
import { describe, expect, it } from "vitest";
import { getModel } from "@/lib/analysis";

const L = "L = (w/2)²/((f − f₀)² + (w/2)²)";

describe("multi-dip ODMR formula", () => {
  it("reads 1 − c1·L1 − c2·L2 …, not + for the later dips", () => {
    expect(getModel("odmr_lorentzian_2")!.formula).toBe(`y = B·(1 − c1·L(f; f1, w1) − c2·L(f; f2, w2)),  ${L}`);
    expect(getModel("odmr_lorentzian_3")!.formula).toBe(`y = B·(1 − c1·L(f; f1, w1) − c2·L(f; f2, w2) − c3·L(f; f3, w3)),  ${L}`);
    expect(getModel("odmr_two_resonances")!.formula).toBe(`y = B·(1 − cMinus·L(f; fMinus, wMinus) − cPlus·L(f; fPlus, wPlus)),  ${L}`);
    for (const model of [1, 2, 3, 4].map((k) => getModel(`odmr_lorentzian_${k}`)!)) expect(model.formula).not.toMatch(/\+ c\d/);
  });

  it("computes what it shows: at f1, with dip 2 half a width away, y = B·(1 − c1 − c2/2)", () => {
    // B = 2, c1 = 0.1, c2 = 0.05, w2 = 4 MHz, f2 − f1 = 2 MHz, so L1 = 1 and L2 = 1/(1 + 1) = 0.5:
    // y = 2·(1 − 0.1 − 0.025) = 1.75 by hand (the "+" reading would give 2·(1 − 0.1 + 0.025) = 1.85).
    const y = getModel("odmr_lorentzian_2")!.evaluate(2870, [2, 2870, 3, 0.1, 2872, 4, 0.05]);
    expect(y).toBeCloseTo(1.75, 14);
  });
});
