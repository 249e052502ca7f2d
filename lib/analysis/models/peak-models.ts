/**
 * Single-line shapes on a constant baseline, for PL spectra and generic peaks or dips.
 * Centres and widths are in the x column's unit, heights in y units, the Voigt area in x·y.
 */
import { voigtProfile, voigtProfileWithDerivatives } from "../special/voigt-profile";
import { guessPeak } from "./guess/peak-guess";
import { xScale } from "./guess/signal-features";
import type { FitModel } from "./types";

const FOUR_LN2 = 4 * Math.LN2;
const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);
/** Olivero–Longbothum: a Voigt with equal Gaussian and Lorentzian FWHM F has FWHM ≈ 1.6376·F. */
const VOIGT_FWHM_PER_COMPONENT = 1.6376;
const free: [number, number] = [-Infinity, Infinity];

function peakBounds(x: ArrayLike<number>, widthLower: number): Array<[number, number]> {
  const { min, max, span } = xScale(x);
  return [free, free, [min, max], [widthLower, 10 * span]];
}

const baselineParam = { name: "y0", unit: "y", description: "baseline" } as const;
const centreParam = { name: "x0", unit: "x", description: "line centre" } as const;

function gaussianWithJacobian(x: number, p: ArrayLike<number>, out: Float64Array): number {
  const d = x - p[2];
  const s2 = p[3] * p[3];
  const g = Math.exp(-(d * d) / (2 * s2));
  out[0] = 1;
  out[1] = g;
  out[2] = (p[1] * g * d) / s2;
  out[3] = (p[1] * g * d * d) / (s2 * p[3]);
  return p[0] + p[1] * g;
}

export const gaussianModel: FitModel = {
  id: "gaussian",
  title: "Gaussian",
  formula: "y = y₀ + A·exp(−(x − x₀)²/(2σ²))",
  version: "1.0.0",
  kinds: ["pl_spectrum", "odmr", "other"],
  params: [
    baselineParam,
    { name: "A", unit: "y", description: "height (negative for a dip)" },
    centreParam,
    { name: "sigma", unit: "x", description: "standard deviation σ (FWHM = 2.3548·σ)" },
  ],
  evaluate(x, p) {
    const d = x - p[2];
    return p[0] + p[1] * Math.exp(-(d * d) / (2 * p[3] * p[3]));
  },
  jacobian: gaussianWithJacobian,
  valueAndJacobian: gaussianWithJacobian,
  guess(x, y) {
    const g = guessPeak(x, y);
    return [g.baseline, g.height, g.centre, g.fwhm / FWHM_PER_SIGMA];
  },
  bounds: (x) => peakBounds(x, xScale(x).step / 100),
  amplitudes: [{ amplitude: "A", shapes: ["x0", "sigma"] }],
};

function lorentzianWithJacobian(x: number, p: ArrayLike<number>, out: Float64Array): number {
  const d = x - p[2];
  const g2 = p[3] * p[3];
  const denom = d * d + g2;
  out[0] = 1;
  out[1] = g2 / denom;
  out[2] = (p[1] * 2 * d * g2) / (denom * denom);
  out[3] = (p[1] * 2 * p[3] * d * d) / (denom * denom);
  return p[0] + (p[1] * g2) / denom;
}

export const lorentzianModel: FitModel = {
  id: "lorentzian",
  title: "Lorentzian",
  formula: "y = y₀ + A·γ²/((x − x₀)² + γ²)",
  version: "1.0.0",
  kinds: ["pl_spectrum", "odmr", "nv_nmr", "other"],
  params: [
    baselineParam,
    { name: "A", unit: "y", description: "height (negative for a dip)" },
    centreParam,
    { name: "gamma", unit: "x", description: "half width at half maximum γ" },
  ],
  evaluate(x, p) {
    const d = x - p[2];
    const g2 = p[3] * p[3];
    return p[0] + (p[1] * g2) / (d * d + g2);
  },
  jacobian: lorentzianWithJacobian,
  valueAndJacobian: lorentzianWithJacobian,
  guess(x, y) {
    const g = guessPeak(x, y);
    return [g.baseline, g.height, g.centre, g.fwhm / 2];
  },
  bounds: (x) => peakBounds(x, xScale(x).step / 100),
  amplitudes: [{ amplitude: "A", shapes: ["x0", "gamma"] }],
};

function pseudoVoigtWithJacobian(x: number, p: ArrayLike<number>, out: Float64Array): number {
  const d = x - p[2];
  const width = p[3];
  const eta = p[4];
  const u = d / width;
  const l = 1 / (1 + 4 * u * u);
  const g = Math.exp(-FOUR_LN2 * u * u);
  const dlCentre = (l * l * 8 * u) / width;
  const dgCentre = (g * 2 * FOUR_LN2 * u) / width;
  out[0] = 1;
  out[1] = eta * l + (1 - eta) * g;
  out[2] = p[1] * (eta * dlCentre + (1 - eta) * dgCentre);
  out[3] = p[1] * u * (eta * dlCentre + (1 - eta) * dgCentre);
  out[4] = p[1] * (l - g);
  return p[0] + p[1] * (eta * l + (1 - eta) * g);
}

export const pseudoVoigtModel: FitModel = {
  id: "pseudo_voigt",
  title: "Pseudo-Voigt",
  formula: "y = y₀ + A·[η·L(x) + (1 − η)·G(x)],  L = 1/(1 + 4(x − x₀)²/Γ²),  G = exp(−4 ln2 (x − x₀)²/Γ²)",
  version: "1.0.0",
  kinds: ["pl_spectrum", "other"],
  params: [
    baselineParam,
    { name: "A", unit: "y", description: "height (negative for a dip)" },
    centreParam,
    { name: "fwhm", unit: "x", description: "common full width at half maximum Γ" },
    { name: "eta", unit: "1", description: "Lorentzian fraction η (0 … 1)" },
  ],
  evaluate(x, p) {
    const u = (x - p[2]) / p[3];
    const l = 1 / (1 + 4 * u * u);
    const g = Math.exp(-FOUR_LN2 * u * u);
    return p[0] + p[1] * (p[4] * l + (1 - p[4]) * g);
  },
  jacobian: pseudoVoigtWithJacobian,
  valueAndJacobian: pseudoVoigtWithJacobian,
  guess(x, y) {
    const g = guessPeak(x, y);
    return [g.baseline, g.height, g.centre, g.fwhm, 0.5];
  },
  bounds: (x) => [...peakBounds(x, xScale(x).step / 100), [0, 1]],
  amplitudes: [{ amplitude: "A", shapes: ["x0", "fwhm", "eta"] }],
};

function voigtWithJacobian(x: number, p: ArrayLike<number>, out: Float64Array): number {
  voigtProfileWithDerivatives(x - p[2], p[3], p[4], out);
  const v = out[0];
  const dx = out[1];
  const dSigma = out[2];
  const dGamma = out[3];
  out[0] = 1;
  out[1] = v;
  out[2] = -p[1] * dx;
  out[3] = p[1] * dSigma;
  out[4] = p[1] * dGamma;
  return p[0] + p[1] * v;
}

export const voigtModel: FitModel = {
  id: "voigt",
  title: "Voigt",
  formula: "y = y₀ + S·V(x − x₀; σ, γ),  V = Re w((x + iγ)/(σ√2))/(σ√(2π)) (unit area)",
  version: "1.0.0",
  kinds: ["pl_spectrum", "other"],
  params: [
    baselineParam,
    { name: "area", unit: "x*y", description: "integrated area S of the line (negative for a dip)" },
    centreParam,
    { name: "sigma", unit: "x", description: "Gaussian standard deviation σ" },
    { name: "gamma", unit: "x", description: "Lorentzian half width at half maximum γ" },
  ],
  evaluate(x, p) {
    return p[0] + p[1] * voigtProfile(x - p[2], p[3], p[4]);
  },
  jacobian: voigtWithJacobian,
  valueAndJacobian: voigtWithJacobian,
  guess(x, y) {
    const g = guessPeak(x, y);
    const component = g.fwhm / VOIGT_FWHM_PER_COMPONENT;
    const sigma = component / FWHM_PER_SIGMA;
    const gamma = component / 2;
    return [g.baseline, g.height / voigtProfile(0, sigma, gamma), g.centre, sigma, gamma];
  },
  bounds(x) {
    const { span, step } = xScale(x);
    return [...peakBounds(x, step / 100), [0, 10 * span]];
  },
  amplitudes: [{ amplitude: "area", shapes: ["x0", "sigma", "gamma"] }],
};
