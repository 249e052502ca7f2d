// Distribution functions of lib/analysis/stats/distributions.ts against values computed outside this code:
// SciPy 1.17.1 (e.g. python3 -c "from scipy import stats; print(repr(stats.t.cdf(2.1, 7.3)))"), each literal with
// the expression beside it, all recomputed with mpmath 1.3.0 at 40+ digits (they agree with SciPy to < 2e-13);
// closed forms for ν = 1 and ν = 2, where SciPy 1.17.1 is itself inaccurate next to t = 0 (stats.t.cdf(-1e-8, 1)
// is 3e-9 off, stats.t.ppf(0.4999999, 1) 1.2e-10); and a few entries of common textbook tables.
// Tolerances are relative and stated per test.
import { describe, expect, it } from "vitest";
import { fUpperP, normalCdf, normalQuantile, normalTwoSidedP, studentTCdf, studentTQuantile, studentTTwoSidedP } from "@/lib/analysis/stats/distributions";

function expectRel(actual: number, expected: number, tol: number, label: string) {
  const err = expected === 0 ? Math.abs(actual) : Math.abs(actual - expected) / Math.abs(expected);
  expect(err, `${label}: got ${actual}, expected ${expected}`).toBeLessThanOrEqual(tol);
}

describe("Student t tail probabilities", () => {
  it("two-sided p matches SciPy to 1e-12 relative: p from 0.99 down to 1e-219, df from 1 to 1e12 (Welch-like 3.7, 17.776)", () => {
    // [t, df, P(|T| ≥ t)]
    const cases: [number, number, number][] = [
      [2.1, 7.3, 0.0722467134248534], // scipy 1.17.1: 2 * stats.t.sf(2.1, 7.3)
      [0.5, 3.7, 0.6453356333199318], // scipy 1.17.1: 2 * stats.t.sf(0.5, 3.7)
      [2.1, 3.7, 0.10926470508222474], // scipy 1.17.1: 2 * stats.t.sf(2.1, 3.7)
      [1.0, 1, 0.5000000000000001], // scipy 1.17.1: 2 * stats.t.sf(1.0, 1)
      [40.0, 1, 0.015912179824051624], // scipy 1.17.1: 2 * stats.t.sf(40.0, 1)
      [3.0, 2, 0.09546596626670913], // scipy 1.17.1: 2 * stats.t.sf(3.0, 2)
      [2.228, 10, 0.05001177181711132], // scipy 1.17.1: 2 * stats.t.sf(2.228, 10)
      [1.8608, 17.776, 0.07939657813977986], // scipy 1.17.1: 2 * stats.t.sf(1.8608, 17.776)
      [8.0, 3.7, 0.0018250909626747335], // scipy 1.17.1: 2 * stats.t.sf(8.0, 3.7)
      [30.0, 3.7, 1.485704125235202e-5], // scipy 1.17.1: 2 * stats.t.sf(30.0, 3.7)
      [15000.0, 3.7, 1.5433397482718915e-15], // scipy 1.17.1: 2 * stats.t.sf(15000.0, 3.7)
      [7.5, 30, 2.322924900551044e-8], // scipy 1.17.1: 2 * stats.t.sf(7.5, 30)
      [100000000.0, 30, 2.0729069305123272e-219], // scipy 1.17.1: 2 * stats.t.sf(100000000.0, 30)
      [2.0, 1000.0, 0.04577034649325166], // scipy 1.17.1: 2 * stats.t.sf(2.0, 1000.0)
      [2.0, 1000000.0, 0.04550053385131924], // scipy 1.17.1: 2 * stats.t.sf(2.0, 1000000.0)
      [7.2, 1000000.0, 6.025457410354053e-13], // scipy 1.17.1: 2 * stats.t.sf(7.2, 1000000.0)
      [7.2, 1000000000000.0, 6.021255966434985e-13], // scipy 1.17.1: 2 * stats.t.sf(7.2, 1000000000000.0)
      [0.3, 1000000.0, 0.7641772179789942], // scipy 1.17.1: 2 * stats.t.sf(0.3, 1000000.0)
      [1e-6, 5, 0.9999992407866204], // scipy 1.17.1: 2 * stats.t.sf(1e-06, 5)
      [25.0, 17.5, 3.8662340993733444e-15], // scipy 1.17.1: 2 * stats.t.sf(25.0, 17.5)
    ];
    for (const [t, df, v] of cases) {
      expectRel(studentTTwoSidedP(t, df), v, 1e-12, `p(${t}, ${df})`);
      expectRel(studentTTwoSidedP(-t, df), v, 1e-12, `p(${-t}, ${df})`);
    }
  });

  it("CDF matches SciPy to 1e-12 relative in both tails", () => {
    // [t, df, P(T ≤ t)]
    const cases: [number, number, number][] = [
      [-2.1, 7.3, 0.0361233567124267], // scipy 1.17.1: stats.t.cdf(-2.1, 7.3)
      [-0.7, 3.7, 0.26271302697158805], // scipy 1.17.1: stats.t.cdf(-0.7, 3.7)
      [0.7, 3.7, 0.737286973028412], // scipy 1.17.1: stats.t.cdf(0.7, 3.7)
      [-9.0, 3.7, 0.0006006904265500679], // scipy 1.17.1: stats.t.cdf(-9.0, 3.7)
      [-1000000.0, 1.5, 3.7708524320132166e-10], // scipy 1.17.1: stats.t.cdf(-1000000.0, 1.5)
      [-6.0, 10000.0, 1.0208092364613106e-9], // scipy 1.17.1: stats.t.cdf(-6.0, 10000.0)
      [-1e-9, 2.5, 0.49999999963819125], // scipy 1.17.1: stats.t.cdf(-1e-09, 2.5)
      [3.0, 40, 0.9976849301079219], // scipy 1.17.1: stats.t.cdf(3.0, 40)
    ];
    for (const [t, df, v] of cases) expectRel(studentTCdf(t, df), v, 1e-12, `cdf(${t}, ${df})`);
  });

  it("closed forms for ν = 1 (Cauchy: ½ + atan(t)/π) and ν = 2 (½ + t/(2√(2 + t²))), 1e-14 relative", () => {
    // Standard results (e.g. Johnson, Kotz & Balakrishnan, Continuous Univariate Distributions 2, ch. 28; from memory).
    // Lower tails are written without cancellation: ½ − atan(|t|)/π = atan(1/|t|)/π, and for ν = 2
    // ½ − |t|/(2√(2 + t²)) = 1/(√(2 + t²)·(√(2 + t²) + |t|)).
    for (const t of [1e-8, 0.3, 1, 7.5, 1e4, 1e10]) {
      expectRel(studentTCdf(-t, 1), Math.atan(1 / t) / Math.PI, 1e-14, `cdf(-${t}, 1)`);
      expectRel(studentTCdf(t, 1), 0.5 + Math.atan(t) / Math.PI, 1e-14, `cdf(${t}, 1)`);
      const r = Math.sqrt(2 + t * t);
      expectRel(studentTCdf(-t, 2), 1 / (r * (r + t)), 1e-14, `cdf(-${t}, 2)`);
      expectRel(studentTCdf(t, 2), 0.5 + t / (2 * r), 1e-14, `cdf(${t}, 2)`);
    }
  });

  it("t → ∞ gives p = 0, t = 0 gives p = 1; beyond 1e154 (t² overflows) the ν = 1 tail is still 2/(π·t) (1e-13: exponent −460)", () => {
    expect(studentTTwoSidedP(Infinity, 3.7)).toBe(0);
    expect(studentTTwoSidedP(0, 3.7)).toBe(1);
    expectRel(studentTTwoSidedP(1e200, 1), 2 / (Math.PI * 1e200), 1e-13, "p(1e200, 1)");
  });
});

describe("Student t quantiles", () => {
  it("match SciPy to 1e-12 relative, p from 1e-12 to 1 − 1e-10, df from 0.6 to 1e6", () => {
    // [p, df, t_p]
    const cases: [number, number, number][] = [
      [0.975, 10, 2.228138851986274], // scipy 1.17.1: stats.t.ppf(0.975, 10)
      [0.975, 1, 12.706204736174694], // scipy 1.17.1: stats.t.ppf(0.975, 1)
      [0.975, 3.7, 2.8675207071911895], // scipy 1.17.1: stats.t.ppf(0.975, 3.7)
      [0.975, 17.776, 2.102821310380221], // scipy 1.17.1: stats.t.ppf(0.975, 17.776)
      [0.025, 3.7, -2.8675207071911903], // scipy 1.17.1: stats.t.ppf(0.025, 3.7)
      [1e-12, 3.7, -2162.0035509402815], // scipy 1.17.1: stats.t.ppf(1e-12, 3.7)
      [1e-12, 1, -318309886183.7907], // scipy 1.17.1: stats.t.ppf(1e-12, 1)
      [1e-12, 30, -11.397217523311413], // scipy 1.17.1: stats.t.ppf(1e-12, 30)
      [1e-12, 1000000.0, -7.034572608411255], // scipy 1.17.1: stats.t.ppf(1e-12, 1000000.0)
      [1e-6, 2.5, -220.17342917823686], // scipy 1.17.1: stats.t.ppf(1e-06, 2.5)
      [0.3, 3.7, -0.5724353841388498], // scipy 1.17.1: stats.t.ppf(0.3, 3.7)
      [0.49, 3.7, -0.026802120389584613], // scipy 1.17.1: stats.t.ppf(0.49, 3.7)
      [0.75, 1.2, 0.9335861477221333], // scipy 1.17.1: stats.t.ppf(0.75, 1.2)
      [0.999, 1000.0, 3.0984021639129233], // scipy 1.17.1: stats.t.ppf(0.999, 1000.0)
      [0.9999999999, 5, 156.8255901132807], // scipy 1.17.1: stats.t.ppf(0.9999999999, 5)
      [0.975, 1000000.0, 1.959966356814107], // scipy 1.17.1: stats.t.ppf(0.975, 1000000.0)
      [0.05, 0.6, -21.361863223117446], // scipy 1.17.1: stats.t.ppf(0.05, 0.6)
    ];
    for (const [p, df, v] of cases) expectRel(studentTQuantile(p, df), v, 1e-12, `q(${p}, ${df})`);
  });

  it("closed forms t_p = tan(π(p − ½)) for ν = 1 and (2p − 1)/√(2p(1 − p)) for ν = 2, 1e-13 relative", () => {
    // p − ½ is exact for p ∈ [¼, 1] and 1 − p for p ∈ [½, 1]; tan is ill-conditioned next to ±π/2, so the
    // tails use tan(π(p − ½)) = −1/tan(πp) = 1/tan(π(1 − p)).
    for (const p of [1e-12, 1e-6, 0.01, 0.3, 0.4999999, 0.5000001, 0.9, 0.999999]) {
      const cauchy = p < 0.25 ? -1 / Math.tan(Math.PI * p) : p > 0.75 ? 1 / Math.tan(Math.PI * (1 - p)) : Math.tan(Math.PI * (p - 0.5));
      expectRel(studentTQuantile(p, 1), cauchy, 1e-13, `q(${p}, 1)`);
      const two = p < 0.25 ? (2 * p - 1) / Math.sqrt(2 * p * (1 - p)) : (2 * (p - 0.5)) / Math.sqrt(2 * p * (1 - p));
      expectRel(studentTQuantile(p, 2), two, 1e-13, `q(${p}, 2)`);
    }
  });

  it("reproduce a common textbook t table (3 decimals)", () => {
    // Two-sided 95 %/99 % and one-sided 95 % critical values, e.g. the t table in the appendix of any
    // introductory statistics text: t(0.975; 1) = 12.706, t(0.975; 10) = 2.228, t(0.975; 30) = 2.042,
    // t(0.995; 5) = 4.032, t(0.95; 20) = 1.725.
    expect(studentTQuantile(0.975, 1).toFixed(3)).toBe("12.706");
    expect(studentTQuantile(0.975, 10).toFixed(3)).toBe("2.228");
    expect(studentTQuantile(0.975, 30).toFixed(3)).toBe("2.042");
    expect(studentTQuantile(0.995, 5).toFixed(3)).toBe("4.032");
    expect(studentTQuantile(0.95, 20).toFixed(3)).toBe("1.725");
  });
});

describe("F upper tail", () => {
  it("matches SciPy to 1e-12 relative, including fractional df and df2 up to 1e6", () => {
    // [f, df1, df2, P(F ≥ f)]
    const cases: [number, number, number, number][] = [
      [2.5, 1, 10, 0.14492760540408045], // scipy 1.17.1: stats.f.sf(2.5, 1, 10)
      [3.1, 3, 20, 0.0499245330456787], // scipy 1.17.1: stats.f.sf(3.1, 3, 20)
      [0.4, 3, 20, 0.7544966731043878], // scipy 1.17.1: stats.f.sf(0.4, 3, 20)
      [4.0, 3.5, 17.5, 0.020672026447789062], // scipy 1.17.1: stats.f.sf(4.0, 3.5, 17.5)
      [1000.0, 1, 8, 1.088326688016887e-9], // scipy 1.17.1: stats.f.sf(1000.0, 1, 8)
      [1000000.0, 1, 60, 2.2637234656775577e-128], // scipy 1.17.1: stats.f.sf(1000000.0, 1, 60)
      [60.0, 2, 40, 9.094947017729282e-13], // scipy 1.17.1: stats.f.sf(60.0, 2, 40)
      [2.5, 2, 100000.0, 0.08209012892562371], // scipy 1.17.1: stats.f.sf(2.5, 2, 100000.0)
      [1.2, 10, 1000.0, 0.2866531644709587], // scipy 1.17.1: stats.f.sf(1.2, 10, 1000.0)
      [0.9, 1, 1000000.0, 0.3427819404047527], // scipy 1.17.1: stats.f.sf(0.9, 1, 1000000.0)
      [0.0001, 2, 5, 0.99990000699958], // scipy 1.17.1: stats.f.sf(0.0001, 2, 5)
      [50.0, 4, 4, 0.0011383253801328299], // scipy 1.17.1: stats.f.sf(50.0, 4, 4)
    ];
    for (const [f, d1, d2, v] of cases) expectRel(fUpperP(f, d1, d2), v, 1e-12, `F(${f}; ${d1}, ${d2})`);
  });

  it("F(1, ν) = T²_ν: P(F ≥ t²) equals the two-sided t p-value (1e-13 relative)", () => {
    for (const [t, df] of [
      [2.1, 7.3],
      [0.4, 3.7],
      [9, 40],
      [3, 1e5],
    ]) {
      expectRel(fUpperP(t * t, 1, df), studentTTwoSidedP(t, df), 1e-13, `F(${t * t}; 1, ${df})`);
    }
  });

  it("bracket the 5 % / 1 % points of a common textbook F table (entries rounded to 3 digits)", () => {
    // F(0.95; 1, 10) = 4.96, F(0.95; 3, 20) = 3.10, F(0.99; 2, 12) = 6.93: the exact point lies within half a unit
    // of the last digit, so the upper-tail probability crosses 5 % (1 %) inside that interval.
    for (const [f, d1, d2, alpha] of [
      [4.96, 1, 10, 0.05],
      [3.1, 3, 20, 0.05],
      [6.93, 2, 12, 0.01],
    ]) {
      expect(fUpperP(f - 0.005, d1, d2)).toBeGreaterThan(alpha);
      expect(fUpperP(f + 0.005, d1, d2)).toBeLessThan(alpha);
    }
  });
});

describe("standard normal", () => {
  it("two-sided p matches SciPy to 1e-13 relative down to 1e-197", () => {
    // [z, P(|Z| ≥ |z|)]
    const cases: [number, number][] = [
      [0.0, 1.0], // scipy 1.17.1: 2 * stats.norm.sf(0.0)
      [0.5, 0.6170750774519738], // scipy 1.17.1: 2 * stats.norm.sf(0.5)
      [1.96, 0.04999579029644087], // scipy 1.17.1: 2 * stats.norm.sf(1.96)
      [-2.5, 0.012419330651552265], // scipy 1.17.1: 2 * stats.norm.sf(2.5)
      [5.0, 5.733031437583866e-7], // scipy 1.17.1: 2 * stats.norm.sf(5.0)
      [7.1, 1.2475688926663171e-12], // scipy 1.17.1: 2 * stats.norm.sf(7.1)
      [10.0, 1.523970604832094e-23], // scipy 1.17.1: 2 * stats.norm.sf(10.0)
      [30.0, 9.813427854295816e-198], // scipy 1.17.1: 2 * stats.norm.sf(30.0)
    ];
    for (const [z, v] of cases) expectRel(normalTwoSidedP(z), v, 1e-13, `p(${z})`);
  });

  it("CDF matches SciPy to 1e-13 relative from Φ(−37.5) = 4.6e-308 to Φ(8)", () => {
    // [z, Φ(z)]
    const cases: [number, number][] = [
      [-37.5, 4.605353009581954e-308], // scipy 1.17.1: stats.norm.cdf(-37.5)
      [-20.0, 2.7536241186061556e-89], // scipy 1.17.1: stats.norm.cdf(-20.0)
      [-7.1, 6.237844463331586e-13], // scipy 1.17.1: stats.norm.cdf(-7.1)
      [-1.5, 0.06680720126885807], // scipy 1.17.1: stats.norm.cdf(-1.5)
      [-0.3, 0.3820885778110474], // scipy 1.17.1: stats.norm.cdf(-0.3)
      [0.0, 0.5], // scipy 1.17.1: stats.norm.cdf(0.0)
      [0.3, 0.6179114221889526], // scipy 1.17.1: stats.norm.cdf(0.3)
      [1.2, 0.8849303297782918], // scipy 1.17.1: stats.norm.cdf(1.2)
      [2.0, 0.9772498680518208], // scipy 1.17.1: stats.norm.cdf(2.0)
      [8.0, 0.9999999999999993], // scipy 1.17.1: stats.norm.cdf(8.0)
    ];
    for (const [z, v] of cases) expectRel(normalCdf(z), v, 1e-13, `Φ(${z})`);
  });

  it("quantile matches SciPy to 1e-14 relative, from p = 1e-300 through 1e-10 to 1 − 1e-10; Φ⁻¹(½) = 0 exactly", () => {
    // [p, Φ⁻¹(p)]
    const cases: [number, number][] = [
      [1e-300, -37.0470962993612], // scipy 1.17.1: stats.norm.ppf(1e-300)
      [1e-100, -21.273453560965322], // scipy 1.17.1: stats.norm.ppf(1e-100)
      [1e-10, -6.361340902404056], // scipy 1.17.1: stats.norm.ppf(1e-10)
      [1e-5, -4.264890793922825], // scipy 1.17.1: stats.norm.ppf(1e-05)
      [0.001, -3.090232306167813], // scipy 1.17.1: stats.norm.ppf(0.001)
      [0.02, -2.053748910631823], // scipy 1.17.1: stats.norm.ppf(0.02)
      [0.0243, -1.9720841590292884], // scipy 1.17.1: stats.norm.ppf(0.0243)
      [0.025, -1.9599639845400545], // scipy 1.17.1: stats.norm.ppf(0.025)
      [0.3, -0.5244005127080409], // scipy 1.17.1: stats.norm.ppf(0.3)
      [0.4999, -0.0002506628300880075], // scipy 1.17.1: stats.norm.ppf(0.4999)
      [0.5, 0.0], // scipy 1.17.1: stats.norm.ppf(0.5)
      [0.75, 0.6744897501960817], // scipy 1.17.1: stats.norm.ppf(0.75)
      [0.975, 1.959963984540054], // scipy 1.17.1: stats.norm.ppf(0.975)
      [0.9999999999, 6.361340889697422], // scipy 1.17.1: stats.norm.ppf(0.9999999999)
    ];
    for (const [p, v] of cases) expectRel(normalQuantile(p), v, 1e-14, `Φ⁻¹(${p})`);
    expect(normalQuantile(0.5)).toBe(0);
  });

  it("reproduce a common textbook normal table: Φ(1) = 0.8413, Φ(1.96) = 0.9750, z(0.975) = 1.960, z(0.995) = 2.576", () => {
    expect(normalCdf(1).toFixed(4)).toBe("0.8413");
    expect(normalCdf(1.96).toFixed(4)).toBe("0.9750");
    expect(normalQuantile(0.975).toFixed(3)).toBe("1.960");
    expect(normalQuantile(0.995).toFixed(3)).toBe("2.576");
  });
});
