import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { fUpperP, normalCdf, normalQuantile, normalTwoSidedP, studentTCdf, studentTQuantile, studentTTwoSidedP } from "@/lib/analysis/stats/distributions";
import { regularizedIncompleteBetaPair } from "@/lib/analysis/stats/special-functions";

const relErr = (actual: number, expected: number) => Math.abs(actual - expected) / Math.abs(expected);
/** log-uniform in [10^lo, 10^hi] */
const logUniform = (lo: number, hi: number) => fc.double({ min: lo, max: hi, noNaN: true }).map((e) => 10 ** e);

describe("distribution functions: invalid and limiting input", () => {
  it("NaN or invalid degrees of freedom give NaN, never a throw", () => {
    for (const df of [0, -1, NaN, Infinity]) {
      expect(studentTTwoSidedP(1, df)).toBeNaN();
      expect(studentTCdf(1, df)).toBeNaN();
      expect(studentTQuantile(0.3, df)).toBeNaN();
    }
    expect(studentTTwoSidedP(NaN, 3)).toBeNaN();
    for (const p of [0, 1, -0.1, 1.1, NaN]) expect(studentTQuantile(p, 3)).toBeNaN();
    expect(fUpperP(NaN, 1, 2)).toBeNaN();
    expect(fUpperP(1, 0, 2)).toBeNaN();
    expect(fUpperP(1, 2, -3)).toBeNaN();
    expect(normalTwoSidedP(NaN)).toBeNaN();
    expect(normalCdf(NaN)).toBeNaN();
    for (const p of [-0.1, 1.1, NaN]) expect(normalQuantile(p)).toBeNaN();
  });

  it("limits", () => {
    expect(studentTCdf(-Infinity, 3)).toBe(0);
    expect(studentTCdf(Infinity, 3)).toBe(1);
    expect(studentTCdf(0, 3)).toBe(0.5);
    expect(studentTQuantile(0.5, 3.7)).toBe(0);
    expect(fUpperP(0, 2, 3)).toBe(1);
    expect(fUpperP(-1, 2, 3)).toBe(1);
    expect(fUpperP(Infinity, 2, 3)).toBe(0);
    expect(normalTwoSidedP(0)).toBe(1);
    expect(normalTwoSidedP(-Infinity)).toBe(0);
    expect(normalCdf(-Infinity)).toBe(0);
    expect(normalCdf(Infinity)).toBe(1);
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
  });

  it("a t quantile beyond the largest double is −Infinity (ν = 0.01, p = 1e-12: |t| ≈ 10^1169)", () => {
    expect(studentTQuantile(1e-12, 0.01)).toBe(-Infinity);
    expect(studentTQuantile(1 - 1e-12, 0.01)).toBe(Infinity);
  });
});

describe("distribution functions: properties", () => {
  it("t quantile inverts the t CDF: |F(t_p) − p| ≤ 1e-12·p for p ∈ [1e-12, ½), df ∈ [0.5, 1e7]", () => {
    fc.assert(
      fc.property(logUniform(-12, Math.log10(0.4999)), logUniform(Math.log10(0.5), 7), (p, df) => {
        const t = studentTQuantile(p, df);
        return t < 0 && relErr(studentTCdf(t, df), p) <= 1e-12;
      }),
    );
  });

  it("t CDF is symmetric: F(t) + F(−t) = 1 to 1e-15, and the two-sided p is 2·F(−|t|) (to 1e-15 above the subnormal range)", () => {
    fc.assert(
      fc.property(fc.double({ min: -1e6, max: 1e6, noNaN: true }), logUniform(-0.3, 8), (t, df) => {
        const lo = studentTCdf(-Math.abs(t), df);
        const two = studentTTwoSidedP(t, df);
        return Math.abs(lo + studentTCdf(Math.abs(t), df) - 1) <= 1e-15 && (lo < 1e-300 || relErr(two, 2 * lo) <= 1e-15);
      }),
    );
  });

  it("two-sided t p-value decreases in |t| and increases toward the normal one as df grows", () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 50, noNaN: true }), fc.double({ min: 0.01, max: 5, noNaN: true }), logUniform(0, 6), (t, dt, df) => {
        return studentTTwoSidedP(t + dt, df) <= studentTTwoSidedP(t, df) && studentTTwoSidedP(t, df) >= studentTTwoSidedP(t, df * 2) * (1 - 1e-14);
      }),
    );
  });

  it("df → ∞: the t tail tends to the normal tail (df = 1e20, where they differ by ~z⁴/(4ν) < 1e-16: 1e-14 relative)", () => {
    for (const z of [0.1, 1, 1.96, 4, 8]) {
      expect(relErr(studentTTwoSidedP(z, 1e20), normalTwoSidedP(z))).toBeLessThanOrEqual(1e-14);
      expect(relErr(studentTQuantile(normalCdf(-z), 1e20), -z)).toBeLessThanOrEqual(1e-14);
    }
  });

  it("normal quantile inverts the normal CDF: |Φ(z_p) − p| ≤ 16ε(1 + z²)·p for p ∈ [1e-300, ½] (Φ's condition number is ~z²)", () => {
    fc.assert(
      fc.property(logUniform(-300, Math.log10(0.5)), (p) => {
        const z = normalQuantile(p);
        return relErr(normalCdf(z), p) <= 16 * Number.EPSILON * (1 + z * z);
      }),
    );
  });

  it("p-values stay in [0, 1]", () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true }), logUniform(-2, 10), logUniform(-2, 10), (x, d1, d2) => {
        return [studentTTwoSidedP(x, d1), fUpperP(x, d1, d2), normalTwoSidedP(x)].every((p) => p >= 0 && p <= 1);
      }),
    );
  });

  it("incomplete beta pair: p + q = 1 and I_x(a, b) = 1 − I_{1−x}(b, a)", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-6, max: 1 - 1e-6, noNaN: true }), logUniform(-1, 5), logUniform(-1, 5), (x, a, b) => {
        const y = 1 - x;
        const r = regularizedIncompleteBetaPair(x, y, a, b);
        const s = regularizedIncompleteBetaPair(y, x, b, a);
        const close = (u: number, v: number) => u === v || Math.abs(u - v) <= 1e-13 * Math.max(Math.abs(u), Math.abs(v));
        return Math.abs(r.p + r.q - 1) <= 1e-15 && close(r.p, s.q) && close(r.q, s.p);
      }),
    );
  });
});
