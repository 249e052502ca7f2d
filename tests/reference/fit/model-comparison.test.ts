/**
 * Model comparison against SciPy: χ², AIC, BIC and the nested F-test of each candidate computed
 * independently (model-comparison.py beside this file: scipy.optimize.curve_fit, method "lm", and
 * scipy.stats.f.sf, SciPy 1.17.1), with AIC = m·ln(χ²/m) + 2k and BIC = m·ln(χ²/m) + k·ln m.
 */
import { describe, expect, it } from "vitest";
import { compareModels } from "@/lib/analysis/model-comparison";

const relative = (a: number, b: number) => Math.abs(a / b - 1);

/** An echo with n = 2 and a hand-made wobble in place of noise, 80 points. */
const echo = (() => {
  const x = Array.from({ length: 80 }, (_, i) => 2 + 4 * i);
  return { x, y: x.map((t, i) => 0.5 + 0.3 * Math.exp(-((t / 60) ** 2)) + 0.004 * Math.sin(5 * i)) };
})();

/** T1 curves (30 log-spaced points) whose true decay is stretched with exponent n, rounded as a file would be. */
function t1(n: number) {
  const x = Array.from({ length: 30 }, (_, j) => 0.05 * 1.25 ** j);
  return { x, y: x.map((t, j) => Number((0.7 + 0.3 * Math.exp(-((t / 4) ** n)) + 0.002 * Math.sin(7 * j + 1)).toFixed(5))) };
}

describe("model comparison", () => {
  it("echo: n free, n = 1 and n = 2 give SciPy's χ², AIC and BIC; n = 2 is preferred, n = 1 rejected", () => {
    const result = compareModels(
      [
        { label: "n free", model: "hahn_echo" },
        { label: "n = 1", model: "hahn_echo", fixed: { n: 1 } },
        { label: "n = 2", model: "hahn_echo", fixed: { n: 2 } },
      ],
      echo,
    );
    // [χ², AIC, BIC] from model-comparison.py.
    const scipy: Record<string, number[]> = {
      "n free": [0.00063301558945269, -931.7633714327917, -922.2352648940962],
      "n = 1": [0.021144217740508675, -653.0732350740903, -645.9271551700687],
      "n = 2": [0.0006340886978443737, -933.6278676818849, -926.4817877778632],
    };
    for (const c of result.candidates) {
      const [chi2, aic, bic] = scipy[c.label];
      expect(relative(c.fit.chi2, chi2), `χ² of ${c.label}`).toBeLessThan(1e-7);
      expect(Math.abs(c.fit.aic - aic), `AIC of ${c.label}`).toBeLessThan(1e-6);
      expect(Math.abs(c.fit.bic - bic), `BIC of ${c.label}`).toBeLessThan(1e-6);
    }
    expect(result.candidates.map((c) => c.k)).toEqual([4, 3, 3]);
    // Nested pairs: each held-n candidate in the free one (n = 1 and n = 2 are not nested in each other).
    const byPair = Object.fromEntries(result.tests.map((t) => [`${t.simpler} ⊂ ${t.fuller}`, t]));
    expect(Object.keys(byPair).sort()).toEqual(["n = 1 ⊂ n free", "n = 2 ⊂ n free"]);
    expect(relative(byPair["n = 1 ⊂ n free"].f, 2462.5797365086214)).toBeLessThan(1e-5);
    expect(byPair["n = 1 ⊂ n free"].rejectsSimpler).toBe(true);
    expect(relative(byPair["n = 2 ⊂ n free"].f, 0.12883764495986313)).toBeLessThan(1e-4);
    expect(Math.abs(byPair["n = 2 ⊂ n free"].p - 0.7206355323400181)).toBeLessThan(1e-5);
    expect(byPair["n = 2 ⊂ n free"].rejectsSimpler).toBe(false);
    expect(result.preferred).toBe("n = 2");
    expect(result.reason).toMatch(/^n = 2: lowest AIC, 1\.9 below n free/);
    // Akaike weights: exp(−ΔAIC/2) normalised, from the SciPy AICs.
    const w = [-931.7633714327917, -653.0732350740903, -933.6278676818849].map((a) => Math.exp(-(a + 933.6278676818849) / 2));
    const sum = w.reduce((a, b) => a + b, 0);
    result.candidates.forEach((c, i) => expect(Math.abs(c.akaikeWeight - w[i] / sum)).toBeLessThan(1e-6));
  });

  it("T1 with a slight stretch: AIC leans to the stretched model by 1.77, but the F-test keeps the exponential", () => {
    const result = compareModels(
      [
        { label: "exponential", model: "relaxation" },
        { label: "stretched", model: "relaxation_stretched" },
      ],
      t1(0.975),
    );
    const [exp, str] = result.candidates;
    expect(relative(exp.fit.chi2, 6.42928113319979e-5)).toBeLessThan(1e-6);
    expect(relative(str.fit.chi2, 5.669654953106225e-5)).toBeLessThan(1e-6);
    expect(Math.abs(exp.fit.aic - -385.59780340539294)).toBeLessThan(1e-5);
    expect(Math.abs(str.fit.aic - -387.3698375672742)).toBeLessThan(1e-5);
    const [test] = result.tests;
    expect(test.simpler).toBe("exponential");
    expect(relative(test.f, 3.4835066411955324)).toBeLessThan(1e-4);
    expect(Math.abs(test.p - 0.07330127654218699)).toBeLessThan(1e-5);
    expect(result.preferred).toBe("exponential");
    expect(result.reason).toMatch(/^exponential: stretched has 1 more free parameter but lowers AIC by only 1\.8 \(below 2\), and the F-test does not reject/);
  });

  it("T1 with a clear stretch: the F-test rejects the exponential and the stretched model is preferred", () => {
    const result = compareModels(
      [
        { label: "exponential", model: "relaxation" },
        { label: "stretched", model: "relaxation_stretched" },
      ],
      t1(0.96),
    );
    expect(relative(result.tests[0].f, 11.67852532740927)).toBeLessThan(1e-4);
    expect(Math.abs(result.tests[0].p - 0.002091011250461048)).toBeLessThan(1e-6);
    expect(result.preferred).toBe("stretched");
    expect(result.reason).toMatch(/^stretched: lowest AIC, 9\.1 below exponential .*; the F-test rejects exponential \(p = 0\.0021\)\.$/);
  });

  it("refuses too few or too many candidates, twin labels, and names the candidate the fitter refuses", () => {
    const one = [{ label: "a", model: "relaxation" }];
    expect(() => compareModels(one, t1(1))).toThrow("compare 2 to 4 candidates (1 given)");
    const five = Array.from({ length: 5 }, (_, i) => ({ label: `c${i}`, model: "relaxation" }));
    expect(() => compareModels(five, t1(1))).toThrow("compare 2 to 4 candidates (5 given)");
    expect(() => compareModels([one[0], { label: "a", model: "relaxation_stretched" }], t1(1))).toThrow('two candidates are called "a"');
    expect(() => compareModels([one[0], { label: "b", model: "relaxation", fixed: { T9: 1 } }], t1(1))).toThrow('candidate 2 (b): unknown parameter "T9"');
  });
});
