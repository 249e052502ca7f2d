/**
 * Ramsey (free-induction decay) models: a Gaussian envelope exp(−(t/T₂*)²) on the fringes, three
 * cosines at δ + m·|A∥| when the ¹⁴N hyperfine lines are resolved (Childress et al., Science 314,
 * 281 (2006); from memory). t is the free-precession time in the
 * x column's unit, so the detuning δ and the hyperfine splitting |A∥| come out in 1/x
 * (MHz when x is in µs; the expected ¹⁴N |A∥| comes from lib/physics/constants). Phases in radians.
 */
import { guessOscillation } from "./guess/oscillation-guess";
import { xScale } from "./guess/signal-features";
import { nyquistFrequency, nyquistWarnings } from "./nyquist";
import { N14_SPLITTING_RANGE } from "./physical-ranges";
import type { FitModel } from "./types";
import { NV_14N_SPLITTING_MHZ } from "@/lib/physics/constants";

const TWO_PI = 2 * Math.PI;
const free: [number, number] = [-Infinity, Infinity];

/** δ is bounded by the Nyquist frequency 1/(2Δt): above it the samples cannot tell δ from 1/Δt − δ. */
function ramseyBounds(x: ArrayLike<number>): Array<[number, number]> {
  const { span } = xScale(x);
  return [free, [0, Infinity], [1e-6 * span, 1e3 * span], [0, nyquistFrequency(x)], [-TWO_PI, TWO_PI]];
}

function ramseyWithJacobian(t: number, p: ArrayLike<number>, out: Float64Array): number {
  const a = p[1];
  const time = p[2];
  const delta = p[3];
  const phi = p[4];
  const e = Math.exp(-((t / time) ** 2));
  const angle = TWO_PI * delta * t + phi;
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  out[0] = 1;
  out[1] = e * c;
  out[2] = (a * e * c * 2 * t * t) / (time * time * time);
  out[3] = -a * e * s * TWO_PI * t;
  out[4] = -a * e * s;
  return p[0] + a * e * c;
}

export const ramseyModel: FitModel = {
  id: "ramsey",
  title: "Ramsey fringes",
  formula: "S(t) = S₀ + A·exp(−(t/T₂*)²)·cos(2πδt + φ)",
  version: "1.0.0",
  kinds: ["ramsey"],
  params: [
    { name: "S0", unit: "y", description: "mean signal" },
    { name: "A", unit: "y", description: "fringe amplitude at t = 0 (≥ 0)" },
    { name: "T2star", unit: "x", description: "inhomogeneous dephasing time T₂*" },
    { name: "delta", unit: "1/x", description: "detuning δ of the drive from the resonance" },
    { name: "phi", unit: "1", description: "fringe phase φ (rad)" },
  ],
  evaluate(t, p) {
    const e = Math.exp(-((t / p[2]) ** 2));
    return p[0] + p[1] * e * Math.cos(TWO_PI * p[3] * t + p[4]);
  },
  jacobian: ramseyWithJacobian,
  valueAndJacobian: ramseyWithJacobian,
  guess(x, y) {
    const g = guessOscillation(x, y, [0]);
    return [g.offset, g.amplitude, g.decayTime, g.frequency, g.phase];
  },
  bounds: ramseyBounds,
  amplitudes: [{ amplitude: "A", shapes: ["T2star", "delta", "phi"] }],
  checkFit: (p, x) => nyquistWarnings([["δ", p[3]]], x),
};

function ramsey14nWithJacobian(t: number, p: ArrayLike<number>, out: Float64Array): number {
  const a = p[1];
  const time = p[2];
  const delta = p[3];
  const split = p[4];
  const phi = p[5];
  const e = Math.exp(-((t / time) ** 2));
  const angle = TWO_PI * delta * t + phi;
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  const psi = TWO_PI * split * t;
  const g = 1 + 2 * Math.cos(psi);
  out[0] = 1;
  out[1] = e * c * g;
  out[2] = (a * e * c * g * 2 * t * t) / (time * time * time);
  out[3] = -a * e * s * g * TWO_PI * t;
  out[4] = -a * e * c * 2 * Math.sin(psi) * TWO_PI * t;
  out[5] = -a * e * s * g;
  return p[0] + a * e * c * g;
}

export const ramsey14nModel: FitModel = {
  id: "ramsey_14n",
  title: "Ramsey fringes, ¹⁴N hyperfine triplet",
  formula: "S(t) = S₀ + A·exp(−(t/T₂*)²)·Σₘ₌₋₁…₁ cos(2π(δ + m·|A∥|)t + φ)",
  version: "1.0.0",
  kinds: ["ramsey"],
  params: [
    { name: "S0", unit: "y", description: "mean signal" },
    { name: "A", unit: "y", description: "amplitude of each of the three lines (≥ 0)" },
    { name: "T2star", unit: "x", description: "inhomogeneous dephasing time T₂*" },
    { name: "delta", unit: "1/x", description: "detuning δ of the drive from the mI = 0 line" },
    { name: "Apar", unit: "1/x", description: `¹⁴N hyperfine splitting |A∥| (${NV_14N_SPLITTING_MHZ} MHz when x is in µs)` },
    { name: "phi", unit: "1", description: "common fringe phase φ (rad)" },
  ],
  evaluate(t, p) {
    const e = Math.exp(-((t / p[2]) ** 2));
    // cos(θ − ψ) + cos θ + cos(θ + ψ) = cos θ·(1 + 2cos ψ)
    return p[0] + p[1] * e * Math.cos(TWO_PI * p[3] * t + p[5]) * (1 + 2 * Math.cos(TWO_PI * p[4] * t));
  },
  jacobian: ramsey14nWithJacobian,
  valueAndJacobian: ramsey14nWithJacobian,
  guess(x, y) {
    const g = guessOscillation(x, y, [-1, 0, 1]);
    return [g.offset, g.amplitude, g.decayTime, g.frequency, g.spacing, g.phase];
  },
  bounds(x) {
    const [s0, a, time, delta, phi] = ramseyBounds(x);
    return [s0, a, time, delta, [0, nyquistFrequency(x)], phi];
  },
  amplitudes: [{ amplitude: "A", shapes: ["T2star", "delta", "Apar", "phi"] }],
  physicalRanges: [N14_SPLITTING_RANGE],
  // The three lines sit at δ − |A∥|, δ and δ + |A∥|; the outer one can pass the limit while δ and |A∥| stay below it.
  checkFit: (p, x) =>
    nyquistWarnings(
      [
        ["δ", p[3]],
        ["δ + |A∥|", p[3] + p[4]],
        ["δ − |A∥|", p[3] - p[4]],
      ],
      x,
    ),
};
