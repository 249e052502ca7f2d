/**
 * Voigt profile V(x; σ, γ) (unit area, σ = Gaussian standard deviation, γ = Lorentzian half-width)
 * against values computed to 30 digits with mpmath 1.3.0 (F. Johansson et al., https://mpmath.org),
 * an arbitrary-precision library independent of this code, from the Faddeeva form
 *   V = Re w(z) / (σ√(2π)),  z = (x + iγ)/(σ√2),  w(z) = exp(−z²) erfc(−iz)
 * (NIST DLMF §7.19 and eq. 7.2.3; equation numbers from memory), required to 1e-10 relative.
 * Two are exact: V(0; 1, 0) = 1/√(2π) (Gaussian peak) and V(0; 0, 1) = 1/π (Lorentzian peak).
 */
import { describe, expect, it } from "vitest";
import { voigtProfile, voigtProfileWithDerivatives } from "@/lib/analysis/special/voigt-profile";

// [x, σ, γ, V(x; σ, γ)], mpmath.mp.dps = 30 (σ = 0: the Lorentzian γ/(π(x² + γ²))), the value kept
// as quoted text (some carry more digits than a double holds).
const MPMATH_VALUES: Array<[number, number, number, string]> = [
  [0, 1, 0, "0.3989422804014327"],
  [0, 0, 1, "0.3183098861837907"],
  [0, 0.5, 0.5, "0.41741856104073538"],
  [1, 0.5, 0.5, "0.18143039885255086"],
  [1, 0.2, 5, "0.061133997199162184"],
  [1, 5, 0.2, "0.075821406745514531"],
];

const relativeError = (value: number, reference: number): number => Math.abs(value - reference) / Math.abs(reference);

describe("Voigt profile (mpmath 30-digit values of Re w(z)/(σ√2π))", () => {
  for (const [x, sigma, gamma, reference] of MPMATH_VALUES) {
    it(`V(${x}; ${sigma}, ${gamma}) = ${reference}`, () => {
      expect(relativeError(voigtProfile(x, sigma, gamma), Number(reference))).toBeLessThan(1e-10);
    });
  }

  it("reaches the Gaussian and Lorentzian limits through the Faddeeva function too", () => {
    const out = new Float64Array(4);
    // σ = 1, γ = 0: z on the real axis, w(0) = 1.
    voigtProfileWithDerivatives(0, 1, 0, out);
    expect(relativeError(out[0], Number(MPMATH_VALUES[0][3]))).toBeLessThan(1e-10);
    // σ → 0 with γ = 1: |z| is huge and the continued fraction takes over.
    voigtProfileWithDerivatives(0, 1e-9, 1, out);
    expect(relativeError(out[0], Number(MPMATH_VALUES[1][3]))).toBeLessThan(1e-10);
  });

  it("agrees with its own analytic derivatives (central differences)", () => {
    const out = new Float64Array(4);
    const h = 1e-6;
    for (const [x, sigma, gamma] of [
      [0.3, 0.7, 0.4],
      [2, 0.5, 1.5],
      [-1, 5, 0.2],
    ]) {
      voigtProfileWithDerivatives(x, sigma, gamma, out);
      const dx = (voigtProfile(x + h, sigma, gamma) - voigtProfile(x - h, sigma, gamma)) / (2 * h);
      const dSigma = (voigtProfile(x, sigma + h, gamma) - voigtProfile(x, sigma - h, gamma)) / (2 * h);
      const dGamma = (voigtProfile(x, sigma, gamma + h) - voigtProfile(x, sigma, gamma - h)) / (2 * h);
      expect(out[1]).toBeCloseTo(dx, 8);
      expect(out[2]).toBeCloseTo(dSigma, 8);
      expect(out[3]).toBeCloseTo(dGamma, 8);
    }
  });

  it("has unit area (trapezoid over ±500, Lorentzian tails beyond added analytically)", () => {
    const sigma = 0.7;
    const gamma = 0.4;
    const limit = 500;
    const step = 0.01;
    let area = 0;
    for (let x = -limit; x < limit; x += step) area += (voigtProfile(x, sigma, gamma) + voigtProfile(x + step, sigma, gamma)) * (step / 2);
    const tails = 1 - (2 / Math.PI) * Math.atan(limit / gamma);
    expect(area + tails).toBeCloseTo(1, 6);
  });
});
