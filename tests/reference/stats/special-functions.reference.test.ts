// Special functions of lib/analysis/stats/special-functions.ts against values computed outside this code:
// SciPy 1.17.1 (python3 -c "from scipy import special; print(repr(special.gammaln(3.7)))" etc.), each literal with the
// expression beside it. Every literal was also recomputed with mpmath 1.3.0 at 40–50 significant digits; where
// SciPy itself is off by more than 2e-13 the mpmath value is used and the comment says so.
// Tolerances are relative unless stated; the deepest tails (values < 1e-100) carry the rounding of an exponent
// of several hundred (≈ |ln value|·ε ≈ 1e-13), so they get 1e-12 like the rest.
import { describe, expect, it } from "vitest";
import {
  erfc,
  logBeta,
  logGamma,
  regularizedGammaP,
  regularizedGammaQ,
  regularizedIncompleteBeta,
  regularizedIncompleteBetaPair,
} from "@/lib/analysis/stats/special-functions";

function expectRel(actual: number, expected: number, tol: number, label: string) {
  const err = expected === 0 ? Math.abs(actual) : Math.abs(actual - expected) / Math.abs(expected);
  expect(err, `${label}: got ${actual}, expected ${expected}`).toBeLessThanOrEqual(tol);
}

describe("logGamma (Lanczos / Stirling)", () => {
  // [x, ln Γ(x)]
  const cases: [number, number][] = [
    [1e-300, 690.7755278982137], // scipy 1.17.1: special.gammaln(1e-300)
    [1e-8, 18.42068073818021], // scipy 1.17.1: special.gammaln(1e-08)
    [0.1, 2.252712651734206], // scipy 1.17.1: special.gammaln(0.1)
    [0.5, 0.5723649429247], // scipy 1.17.1: special.gammaln(0.5)
    [1.5, -0.12078223763524526], // scipy 1.17.1: special.gammaln(1.5)
    [2.5, 0.2846828704729192], // scipy 1.17.1: special.gammaln(2.5)
    [3.7, 1.428072326665388], // scipy 1.17.1: special.gammaln(3.7)
    [7.3, 7.147892523022249], // scipy 1.17.1: special.gammaln(7.3)
    [9.99, 12.779315214350195], // scipy 1.17.1: special.gammaln(9.99)
    [10.0, 12.801827480081469], // scipy 1.17.1: special.gammaln(10.0)
    [10.5, 13.940625219403763], // scipy 1.17.1: special.gammaln(10.5)
    [33.3, 82.60372358165493], // scipy 1.17.1: special.gammaln(33.3)
    [1000.0, 5905.220423209181], // scipy 1.17.1: special.gammaln(1000.0)
    [1000000.0, 12815504.569147611], // scipy 1.17.1: special.gammaln(1000000.0)
    [1000000000000000.0, 3.3538776394910668e16], // scipy 1.17.1: special.gammaln(1000000000000000.0)
    [1e300, 6.897755278982137e302], // scipy 1.17.1: special.gammaln(1e+300)
  ];
  it("matches SciPy to 1e-14 relative (away from the zeros at 1 and 2)", () => {
    for (const [x, v] of cases) expectRel(logGamma(x), v, 1e-14, `logGamma(${x})`);
  });
  it("is ≈ 0 at x = 1 and x = 2 (Γ(1) = Γ(2) = 1): absolute error ≤ 1e-15", () => {
    expect(Math.abs(logGamma(1))).toBeLessThanOrEqual(1e-15);
    expect(Math.abs(logGamma(2))).toBeLessThanOrEqual(1e-15);
  });
  it("ln Γ(½) = ln √π (DLMF 5.4.6)", () => {
    expectRel(logGamma(0.5), 0.5 * Math.log(Math.PI), 1e-15, "logGamma(0.5)");
  });
});

describe("logBeta", () => {
  // [a, b, ln B(a, b)]
  const cases: [number, number, number][] = [
    [0.5, 0.5, 1.1447298858494], // scipy 1.17.1: special.betaln(0.5, 0.5)
    [3.7, 0.5, -0.048118367370502145], // scipy 1.17.1: special.betaln(3.7, 0.5)
    [2.5, 7.3, -4.921019785234066], // scipy 1.17.1: special.betaln(2.5, 7.3)
    [15.0, 3.5, -8.551120991791063], // scipy 1.17.1: special.betaln(15.0, 3.5)
    [50.0, 80.0, -87.40844929421458], // scipy 1.17.1: special.betaln(50.0, 80.0)
    [100000000.0, 100000000.0, -138629444.05681705], // scipy 1.17.1: special.betaln(100000000.0, 100000000.0)
    [500000000000.0, 0.5, -12.896572024759351], // scipy 1.17.1: special.betaln(500000000000.0, 0.5)
    [1000000.0, 0.5, -6.335390211057437], // mpmath 1.3.0: mp.log(mp.beta(1e6, 0.5)) at 50 digits (scipy 1.17.1's special.betaln(1e6, 0.5) = -6.3353902120143175 is 1.5e-10 off)
  ];
  it("matches SciPy/mpmath to 1e-13 relative, including a + b up to 1e12", () => {
    for (const [a, b, v] of cases) expectRel(logBeta(a, b), v, 1e-13, `logBeta(${a}, ${b})`);
  });
});

describe("regularizedIncompleteBeta I_x(a, b)", () => {
  // [x, a, b, I_x(a, b)]
  const lower: [number, number, number, number][] = [
    [0.3, 2.5, 7.3, 0.6642381992386518], // scipy 1.17.1: special.betainc(2.5, 7.3, 0.3)
    [0.5, 0.5, 0.5, 0.5000000000000001], // scipy 1.17.1: special.betainc(0.5, 0.5, 0.5)
    [1e-12, 0.5, 3.2, 1.9414783853142393e-6], // scipy 1.17.1: special.betainc(0.5, 3.2, 1e-12)
    [1e-12, 15.0, 12.0, 7.726159999920325e-174], // scipy 1.17.1: special.betainc(15.0, 12.0, 1e-12)
    [0.9999999999, 3.7, 0.5, 0.9999790141021287], // scipy 1.17.1: special.betainc(3.7, 0.5, 0.9999999999)
    [0.999, 10000.0, 0.5, 7.705811569294884e-6], // scipy 1.17.1: special.betainc(10000.0, 0.5, 0.999)
    [0.9999, 500000.0, 2.5, 5.27195491409021e-20], // scipy 1.17.1: special.betainc(500000.0, 2.5, 0.9999)
    [0.01, 100.0, 10000.0, 0.5528969545546817], // scipy 1.17.1: special.betainc(100.0, 10000.0, 0.01)
    [0.8, 1000.0, 12.0, 7.049430103893271e-80], // scipy 1.17.1: special.betainc(1000.0, 12.0, 0.8)
    [0.5, 1000.0, 150.0, 1.7124419234366493e-155], // scipy 1.17.1: special.betainc(1000.0, 150.0, 0.5)
    [0.4, 50.0, 80.0, 0.6450659221505503], // scipy 1.17.1: special.betainc(50.0, 80.0, 0.4)
    [0.2, 1.0, 1.0, 0.2], // scipy 1.17.1: special.betainc(1.0, 1.0, 0.2)
    [0.7, 1.0, 3.0, 0.973], // scipy 1.17.1: special.betainc(1.0, 3.0, 0.7)
    [1e-150, 2.0, 3.0, 6e-300], // scipy 1.17.1: special.betainc(2.0, 3.0, 1e-150)
  ];
  it("matches SciPy to 1e-12 relative, near both edges and for a up to 5e5", () => {
    for (const [x, a, b, v] of lower) expectRel(regularizedIncompleteBeta(x, a, b), v, 1e-12, `I(${x}; ${a}, ${b})`);
  });

  // [x, a, b, 1 − I_x(a, b)]
  const upper: [number, number, number, number][] = [
    [0.3, 2.5, 7.3, 0.3357618007613485], // scipy 1.17.1: special.betaincc(2.5, 7.3, 0.3)
    [0.9999999999, 3.7, 0.5, 2.0985897871228044e-5], // scipy 1.17.1: special.betaincc(3.7, 0.5, 0.9999999999)
    [0.999, 10000.0, 0.5, 0.9999922941884307], // scipy 1.17.1: special.betaincc(10000.0, 0.5, 0.999)
    [1e-6, 0.5, 10000.0, 0.8875384524840904], // scipy 1.17.1: special.betaincc(0.5, 10000.0, 1e-06)
    [0.99, 7.3, 150.0, 4.399089545611481e-290], // scipy 1.17.1: special.betaincc(7.3, 150.0, 0.99)
    [0.999999, 15.0, 12.0, 9.657575196885815e-66], // scipy 1.17.1: special.betaincc(15.0, 12.0, 0.999999)
    [0.2, 1000.0, 10000.0, 1.7777423816136286e-215], // scipy 1.17.1: special.betaincc(1000.0, 10000.0, 0.2)
  ];
  it("gives the complement 1 − I_x(a, b) directly where it is small: 1e-12 relative", () => {
    for (const [x, a, b, v] of upper) expectRel(regularizedIncompleteBetaPair(x, 1 - x, a, b).q, v, 1e-12, `1 − I(${x}; ${a}, ${b})`);
  });

  // [y, a, b, 1 − I_x(a, b) = I_y(b, a)] with x = 1 − y, which rounds to 1 in double precision
  const tinyY: [number, number, number, number][] = [
    [1e-20, 2.5, 3.5, 7.760698177433369e-70], // scipy 1.17.1: special.betainc(3.5, 2.5, 1e-20)
    [1e-15, 0.5, 0.5, 2.013168484179482e-8], // scipy 1.17.1: special.betainc(0.5, 0.5, 1e-15)
    [3e-7, 1000000.0, 0.5, 0.5614219510262886], // scipy 1.17.1: special.betainc(0.5, 1000000.0, 3e-07)
  ];
  it("keeps a small y = 1 − x that the caller passes separately: 1e-12 relative", () => {
    for (const [y, a, b, v] of tinyY) expectRel(regularizedIncompleteBetaPair(1 - y, y, a, b).q, v, 1e-12, `1 − I(1 − ${y}; ${a}, ${b})`);
  });

  it("closed forms: I_x(1, 1) = x, I_x(a, 1) = x^a, I_x(½, ½) = (2/π)·asin(√x) (from B(a, 1) = 1/a and the arcsine law; 1e-14)", () => {
    for (const x of [1e-9, 0.1, 0.37, 0.9, 1 - 1e-9]) {
      expectRel(regularizedIncompleteBeta(x, 1, 1), x, 1e-15, `I(${x}; 1, 1)`);
      expectRel(regularizedIncompleteBeta(x, 3.7, 1), x ** 3.7, 1e-14, `I(${x}; 3.7, 1)`);
      // asin is ill-conditioned next to 1, so the reference uses the complement form there (1 − x is exact).
      const arcsine = x <= 0.5 ? (2 / Math.PI) * Math.asin(Math.sqrt(x)) : 1 - (2 / Math.PI) * Math.asin(Math.sqrt(1 - x));
      expectRel(regularizedIncompleteBeta(x, 0.5, 0.5), arcsine, 1e-14, `I(${x}; ½, ½)`);
    }
  });

  it("edges and invalid input", () => {
    expect(regularizedIncompleteBeta(0, 2, 3)).toBe(0);
    expect(regularizedIncompleteBeta(1, 2, 3)).toBe(1);
    for (const [x, a, b] of [
      [-0.1, 2, 3],
      [1.1, 2, 3],
      [0.5, 0, 3],
      [0.5, 2, -1],
      [NaN, 2, 3],
    ]) {
      expect(regularizedIncompleteBeta(x, a, b)).toBeNaN();
    }
  });
});

describe("regularizedGammaP / regularizedGammaQ", () => {
  // [a, x, P(a, x)]
  const lowerCases: [number, number, number][] = [
    [0.5, 0.3, 0.5614219739190003], // scipy 1.17.1: special.gammainc(0.5, 0.3)
    [2.5, 3.0, 0.6937810815867212], // scipy 1.17.1: special.gammainc(2.5, 3.0)
    [15.0, 1e-8, 7.647163660127302e-133], // scipy 1.17.1: special.gammainc(15.0, 1e-08)
    [7.3, 10.0, 0.8455932794235943], // scipy 1.17.1: special.gammainc(7.3, 10.0)
    [100.0, 80.0, 0.0171083130351331], // scipy 1.17.1: special.gammainc(100.0, 80.0)
    [1000.0, 1000.0, 0.5042052441802155], // scipy 1.17.1: special.gammainc(1000.0, 1000.0)
    [0.1, 1e-5, 0.3323984050405032], // scipy 1.17.1: special.gammainc(0.1, 1e-05)
  ];
  // [a, x, Q(a, x)]
  const upperCases: [number, number, number][] = [
    [0.5, 3.0, 0.014305878435429641], // scipy 1.17.1: special.gammaincc(0.5, 3.0)
    [2.5, 3.0, 0.30621891841327875], // scipy 1.17.1: special.gammaincc(2.5, 3.0)
    [15.0, 200.0, 2.7954938576565057e-66], // scipy 1.17.1: special.gammaincc(15.0, 200.0)
    [100.0, 130.0, 0.002750408367306518], // scipy 1.17.1: special.gammaincc(100.0, 130.0)
    [0.5, 700.0, 2.1010145162644003e-306], // scipy 1.17.1: special.gammaincc(0.5, 700.0)
    [3.0, 0.01, 0.9999998345783472], // scipy 1.17.1: special.gammaincc(3.0, 0.01)
    [1000.0, 1500.0, 2.204698611388996e-43], // mpmath 1.3.0: mp.gammainc(1000, 1500, mp.inf, regularized=True) (scipy 1.17.1's special.gammaincc(1000.0, 1500.0) = 2.204698611389594e-43 is 2.7e-13 off)
  ];
  it("P matches SciPy to 1e-12 relative", () => {
    for (const [a, x, v] of lowerCases) expectRel(regularizedGammaP(a, x), v, 1e-12, `P(${a}, ${x})`);
  });
  it("Q matches SciPy/mpmath to 1e-12 relative", () => {
    for (const [a, x, v] of upperCases) expectRel(regularizedGammaQ(a, x), v, 1e-12, `Q(${a}, ${x})`);
  });
  it("closed form Q(1, x) = e^(−x) (DLMF 8.4.5): 1e-14 relative, 1e-13 at x = 700 (an exponent of 700 carries 700·ε)", () => {
    for (const x of [1e-6, 0.3, 2, 40]) expectRel(regularizedGammaQ(1, x), Math.exp(-x), 1e-14, `Q(1, ${x})`);
    expectRel(regularizedGammaQ(1, 700), Math.exp(-700), 1e-13, "Q(1, 700)");
  });
});

describe("erfc", () => {
  // [x, erfc(x)]
  const cases: [number, number][] = [
    [-1.0, 1.8427007929497148], // scipy 1.17.1: special.erfc(-1.0)
    [0.0, 1.0], // scipy 1.17.1: special.erfc(0.0)
    [1e-10, 0.999999999887162], // scipy 1.17.1: special.erfc(1e-10)
    [0.5, 0.4795001221869535], // scipy 1.17.1: special.erfc(0.5)
    [1.2, 0.08968602177036462], // scipy 1.17.1: special.erfc(1.2)
    [1.25, 0.07709987174354177], // scipy 1.17.1: special.erfc(1.25)
    [2.0, 0.004677734981047266], // scipy 1.17.1: special.erfc(2.0)
    [5.0, 1.5374597944280347e-12], // scipy 1.17.1: special.erfc(5.0)
    [12.0, 1.3562611692059047e-64], // scipy 1.17.1: special.erfc(12.0)
    [26.0, 5.663192408856145e-296], // scipy 1.17.1: special.erfc(26.0)
  ];
  it("matches SciPy to 1e-14 relative, from erfc(−1) down to 6e-296", () => {
    for (const [x, v] of cases) expectRel(erfc(x), v, 1e-14, `erfc(${x})`);
  });
  it("underflows to 0 beyond x ≈ 27 and is NaN for NaN", () => {
    expect(erfc(30)).toBe(0);
    expect(erfc(-30)).toBe(2);
    expect(erfc(NaN)).toBeNaN();
  });
});
