/**
 * Rabi oscillation under a resonant drive: S(t) = S₀ + A·exp(−t/τ)·cos(2πf·t + φ) (exponential
 * damping) or with exp(−(t/τ)²) (Gaussian damping, an inhomogeneous drive field), the forms of
 * e.g. Jelezko et al., PRL 92, 076401 (2004) (from memory). t is the pulse length in the x
 * column's unit, f the Rabi frequency in 1/x. Derived: the π- and π/2-pulse lengths 1/(2f), 1/(4f).
 */
import { guessOscillation } from "./guess/oscillation-guess";
import { xScale } from "./guess/signal-features";
import { nyquistFrequency, nyquistWarnings } from "./nyquist";
import type { DerivedQuantity, FitModel } from "./types";

const TWO_PI = 2 * Math.PI;
const free: [number, number] = [-Infinity, Infinity];

/** f is bounded by the Nyquist frequency 1/(2Δt): above it the samples cannot tell f from 1/Δt − f. */
function rabiBounds(x: ArrayLike<number>): Array<[number, number]> {
  const { span } = xScale(x);
  return [free, [0, Infinity], [1e-6 * span, 1e3 * span], [0, nyquistFrequency(x)], [-TWO_PI, TWO_PI]];
}

const RABI_AMPLITUDES: FitModel["amplitudes"] = [{ amplitude: "A", shapes: ["tau", "f", "phi"] }];
const rabiCheck: FitModel["checkFit"] = (p, x) => nyquistWarnings([["f", p[3]]], x);

/** t_π = 1/(2f) and t_π/2 = 1/(4f), f being parameter 3; their errors follow from f's. */
const PULSE_LENGTHS: DerivedQuantity[] = [
  {
    name: "t_pi",
    unit: "x",
    description: "π-pulse length",
    formula: "t_π = 1/(2f)",
    value: (p) => 1 / (2 * p[3]),
    gradient: (p) => [0, 0, 0, -1 / (2 * p[3] * p[3]), 0],
  },
  {
    name: "t_pi_half",
    unit: "x",
    description: "π/2-pulse length",
    formula: "t_π/2 = 1/(4f)",
    value: (p) => 1 / (4 * p[3]),
    gradient: (p) => [0, 0, 0, -1 / (4 * p[3] * p[3]), 0],
  },
];

const PARAMS: FitModel["params"] = [
  { name: "S0", unit: "y", description: "mean signal" },
  { name: "A", unit: "y", description: "oscillation amplitude at t = 0 (≥ 0; the phase carries the sign)" },
  { name: "tau", unit: "x", description: "damping time τ of the oscillation" },
  { name: "f", unit: "1/x", description: "Rabi frequency f" },
  { name: "phi", unit: "1", description: "phase φ (rad)" },
];

function exponentialWithJacobian(t: number, p: ArrayLike<number>, out: Float64Array): number {
  const a = p[1];
  const tau = p[2];
  const e = Math.exp(-t / tau);
  const angle = TWO_PI * p[3] * t + p[4];
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  out[0] = 1;
  out[1] = e * c;
  out[2] = (a * e * c * t) / (tau * tau);
  out[3] = -a * e * s * TWO_PI * t;
  out[4] = -a * e * s;
  return p[0] + a * e * c;
}

function gaussianWithJacobian(t: number, p: ArrayLike<number>, out: Float64Array): number {
  const a = p[1];
  const tau = p[2];
  const e = Math.exp(-((t / tau) ** 2));
  const angle = TWO_PI * p[3] * t + p[4];
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  out[0] = 1;
  out[1] = e * c;
  out[2] = (a * e * c * 2 * t * t) / (tau * tau * tau);
  out[3] = -a * e * s * TWO_PI * t;
  out[4] = -a * e * s;
  return p[0] + a * e * c;
}

function guess(x: ArrayLike<number>, y: ArrayLike<number>): number[] {
  const g = guessOscillation(x, y, [0]);
  return [g.offset, g.amplitude, g.decayTime, g.frequency, g.phase];
}

export const rabiModel: FitModel = {
  id: "rabi",
  title: "Rabi oscillation",
  formula: "S(t) = S₀ + A·exp(−t/τ)·cos(2πf·t + φ)",
  version: "1.0.0",
  kinds: ["other"],
  params: PARAMS,
  evaluate(t, p) {
    return p[0] + p[1] * Math.exp(-t / p[2]) * Math.cos(TWO_PI * p[3] * t + p[4]);
  },
  jacobian: exponentialWithJacobian,
  valueAndJacobian: exponentialWithJacobian,
  guess,
  bounds: rabiBounds,
  derived: PULSE_LENGTHS,
  amplitudes: RABI_AMPLITUDES,
  checkFit: rabiCheck,
};

export const rabiGaussianModel: FitModel = {
  id: "rabi_gaussian",
  title: "Rabi oscillation, Gaussian damping",
  formula: "S(t) = S₀ + A·exp(−(t/τ)²)·cos(2πf·t + φ)",
  version: "1.0.0",
  kinds: ["other"],
  params: PARAMS,
  evaluate(t, p) {
    return p[0] + p[1] * Math.exp(-((t / p[2]) ** 2)) * Math.cos(TWO_PI * p[3] * t + p[4]);
  },
  jacobian: gaussianWithJacobian,
  valueAndJacobian: gaussianWithJacobian,
  guess,
  bounds: rabiBounds,
  derived: PULSE_LENGTHS,
  amplitudes: RABI_AMPLITUDES,
  checkFit: rabiCheck,
};
