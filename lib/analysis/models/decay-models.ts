/**
 * Decay models for spin-echo and relaxation data — the stretched-exponential echo decay and the
 * exponential T1 decay as fitted in NV work, e.g. de Lange et al., Science 330, 60 (2010) and
 * Jarmola et al., PRL 108, 197601 (2012) (both from memory). x is the free-evolution
 * or wait time in the x column's unit, y the signal in the y column's unit.
 */
import { tableExp } from "../special/table-exp";
import { guessDecay } from "./guess/decay-guess";
import { sortByX, xScale } from "./guess/signal-features";
import type { CurveSweep } from "../fit/curve-problem";
import type { FitModel } from "./types";

/** Time constants are kept positive and below a thousand times the measured span. */
function timeBounds(x: ArrayLike<number>): [number, number] {
  const { span, max } = xScale(x);
  const reach = Math.max(span, Math.abs(max));
  return [1e-6 * reach, 1e3 * reach];
}

const free: [number, number] = [-Infinity, Infinity];

/** (t/T)ⁿ for t > 0, else 0; the models are defined for t ≥ 0. */
function stretchedArgument(t: number, time: number, n: number): number {
  return t > 0 ? Math.exp(n * Math.log(t / time)) : 0;
}

function stretchedDecayWithJacobian(t: number, p: ArrayLike<number>, out: Float64Array): number {
  const a = p[1];
  const time = p[2];
  const n = p[3];
  out[0] = 1;
  if (t > 0) {
    const logU = Math.log(t / time);
    const un = Math.exp(n * logU);
    const e = Math.exp(-un);
    out[1] = e;
    out[2] = (a * e * un * n) / time;
    out[3] = -a * e * un * logU;
    return p[0] + a * e;
  }
  out[1] = 1;
  out[2] = 0;
  out[3] = 0;
  return p[0] + a;
}

/** stretchedDecayWithJacobian over a whole dataset, weighted, with ln t taken once per dataset rather than per step. */
function stretchedDecaySweep(t: Float64Array, y: Float64Array, weight: Float64Array): CurveSweep {
  const m = t.length;
  const logT = new Float64Array(m);
  for (let i = 0; i < m; i++) logT[i] = t[i] > 0 ? Math.log(t[i]) : 0;
  return (p, residuals, jac) => {
    const s0 = p[0];
    const a = p[1];
    const time = p[2];
    const n = p[3];
    const logTime = Math.log(time);
    const dTime = (a * n) / time;
    // The four Jacobian columns as views: one store each per point, no index arithmetic.
    const jS0 = jac.subarray(0, m);
    const jA = jac.subarray(m, 2 * m);
    const jTime = jac.subarray(2 * m, 3 * m);
    const jN = jac.subarray(3 * m, 4 * m);
    for (let i = 0; i < m; i++) {
      const w = weight[i];
      jS0[i] = w;
      if (t[i] > 0) {
        const logU = logT[i] - logTime;
        const un = tableExp(n * logU);
        const we = w * tableExp(-un);
        residuals[i] = (s0 - y[i]) * w + a * we;
        jA[i] = we;
        jTime[i] = dTime * we * un;
        jN[i] = -a * we * un * logU;
      } else {
        residuals[i] = (s0 + a - y[i]) * w;
        jA[i] = w;
        jTime[i] = 0;
        jN[i] = 0;
      }
    }
  };
}

function decayWithJacobian(t: number, p: ArrayLike<number>, out: Float64Array): number {
  const e = Math.exp(-t / p[2]);
  out[0] = 1;
  out[1] = e;
  out[2] = (p[1] * e * t) / (p[2] * p[2]);
  return p[0] + p[1] * e;
}

export const hahnEchoModel: FitModel = {
  id: "hahn_echo",
  title: "Hahn echo decay",
  formula: "S(t) = S₀ + A·exp(−(t/T₂)ⁿ)",
  version: "1.0.0",
  kinds: ["hahn_echo", "decoupling"],
  params: [
    { name: "S0", unit: "y", description: "signal after full decay" },
    { name: "A", unit: "y", description: "echo amplitude at t = 0" },
    { name: "T2", unit: "x", description: "coherence time T₂" },
    { name: "n", unit: "1", description: "stretch exponent (1 = exponential, 2–3 = spectral diffusion), bounded 0.5–4" },
  ],
  evaluate(t, p) {
    return p[0] + p[1] * Math.exp(-stretchedArgument(t, p[2], p[3]));
  },
  jacobian: stretchedDecayWithJacobian,
  valueAndJacobian: stretchedDecayWithJacobian,
  prepareSweep: stretchedDecaySweep,
  guess(x, y) {
    const g = guessDecay(x, y, { stretched: true, exponentRange: [0.5, 4] });
    return [g.offset, g.amplitude, g.time, g.exponent];
  },
  bounds(x) {
    return [free, free, timeBounds(x), [0.5, 4]];
  },
  amplitudes: [{ amplitude: "A", shapes: ["T2", "n"] }],
};

export const relaxationModel: FitModel = {
  id: "relaxation",
  title: "Spin relaxation (T₁)",
  formula: "S(t) = S₀ + A·exp(−t/T₁)",
  version: "1.0.0",
  kinds: ["relaxation"],
  params: [
    { name: "S0", unit: "y", description: "signal at thermal equilibrium" },
    { name: "A", unit: "y", description: "initial polarisation contrast" },
    { name: "T1", unit: "x", description: "longitudinal relaxation time T₁" },
  ],
  evaluate(t, p) {
    return p[0] + p[1] * Math.exp(-t / p[2]);
  },
  jacobian: decayWithJacobian,
  valueAndJacobian: decayWithJacobian,
  guess(x, y) {
    const g = guessDecay(x, y, { stretched: false, exponentRange: [1, 1] });
    return [g.offset, g.amplitude, g.time];
  },
  bounds(x) {
    return [free, free, timeBounds(x)];
  },
  amplitudes: [{ amplitude: "A", shapes: ["T1"] }],
};

export const relaxationStretchedModel: FitModel = {
  id: "relaxation_stretched",
  title: "Spin relaxation, stretched",
  formula: "S(t) = S₀ + A·exp(−(t/T₁)ⁿ)",
  version: "1.0.0",
  kinds: ["relaxation"],
  params: [
    { name: "S0", unit: "y", description: "signal at thermal equilibrium" },
    { name: "A", unit: "y", description: "initial polarisation contrast" },
    { name: "T1", unit: "x", description: "characteristic relaxation time T₁" },
    { name: "n", unit: "1", description: "stretch exponent (0.5 for an ensemble of dipolar-coupled spins), bounded 0.2–3" },
  ],
  evaluate: hahnEchoModel.evaluate,
  jacobian: stretchedDecayWithJacobian,
  valueAndJacobian: stretchedDecayWithJacobian,
  guess(x, y) {
    const g = guessDecay(x, y, { stretched: true, exponentRange: [0.2, 3] });
    return [g.offset, g.amplitude, g.time, g.exponent];
  },
  bounds(x) {
    return [free, free, timeBounds(x), [0.2, 3]];
  },
  amplitudes: [{ amplitude: "A", shapes: ["T1", "n"] }],
};

function exponential(x: number, p: ArrayLike<number>): number {
  return p[0] + p[1] * Math.exp(-p[2] * x);
}

function exponentialWithJacobian(x: number, p: ArrayLike<number>, out: Float64Array): number {
  const e = Math.exp(-p[2] * x);
  out[0] = 1;
  out[1] = e;
  out[2] = -p[1] * x * e;
  return p[0] + p[1] * e;
}

export const exponentialModel: FitModel = {
  id: "exponential",
  title: "Exponential",
  formula: "y = y₀ + A·exp(−k·x)",
  version: "1.0.0",
  kinds: ["other", "relaxation"],
  params: [
    { name: "y0", unit: "y", description: "asymptote (for k > 0)" },
    { name: "A", unit: "y", description: "amplitude at x = 0" },
    { name: "k", unit: "1/x", description: "rate; negative for growth" },
  ],
  evaluate: exponential,
  jacobian: exponentialWithJacobian,
  valueAndJacobian: exponentialWithJacobian,
  guess(x, y) {
    const s = sortByX(x, y);
    const m = s.x.length;
    const lo = s.x[0];
    const hi = s.x[m - 1];
    const shifted = s.x.map((v) => v - lo);
    const mirrored = s.x.map((v) => hi - v).reverse();
    const decay = guessDecay(shifted, s.y, { stretched: false, exponentRange: [1, 1] });
    const growth = guessDecay(mirrored, s.y.slice().reverse(), { stretched: false, exponentRange: [1, 1] });
    const limit = (v: number): number => Math.max(-700, Math.min(700, v));
    const candidates = [
      [decay.offset, decay.amplitude * Math.exp(limit(lo / decay.time)), 1 / decay.time],
      [growth.offset, growth.amplitude * Math.exp(limit(-hi / growth.time)), -1 / growth.time],
    ];
    const cost = (p: number[]): number => {
      let sum = 0;
      for (let i = 0; i < m; i++) sum += (exponential(s.x[i], p) - s.y[i]) ** 2;
      return Number.isFinite(sum) ? sum : Infinity;
    };
    return cost(candidates[0]) <= cost(candidates[1]) ? candidates[0] : candidates[1];
  },
  amplitudes: [{ amplitude: "A", shapes: ["k"] }],
};
