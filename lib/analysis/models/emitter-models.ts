/**
 * Single-emitter models. PL saturation I(P) = I_sat·P/(P + P_sat) + b·P (a two-level emitter's
 * saturation plus a background linear in power, e.g. Kurtsiefer et al., PRL 85, 290 (2000); from
 * memory): P in the x column's unit, I in y's. Antibunching with the three-level model
 * g⁽²⁾(τ) = 1 − β·[(1 + a)·e^(−|τ−τ₀|/τ₁) − a·e^(−|τ−τ₀|/τ₂)] (same source; a > 0 adds the
 * bunching of the metastable level): τ in x units, y the normalised coincidence rate.
 */
import { mean, movingAverage, sortByX, xScale } from "./guess/signal-features";
import type { FitModel } from "./types";

function saturationWithJacobian(p: number, q: ArrayLike<number>, out: Float64Array): number {
  const isat = q[0];
  const psat = q[1];
  const d = p + psat;
  out[0] = p / d;
  out[1] = (-isat * p) / (d * d);
  out[2] = p;
  return (isat * p) / d + q[2] * p;
}

export const plSaturationModel: FitModel = {
  id: "pl_saturation",
  title: "PL saturation",
  formula: "I(P) = I_sat·P/(P + P_sat) + b·P",
  version: "1.0.0",
  kinds: ["other"],
  params: [
    { name: "Isat", unit: "y", description: "saturated count rate I_sat of the emitter (background removed)" },
    { name: "Psat", unit: "x", description: "saturation power P_sat (half of I_sat)" },
    { name: "b", unit: "y/x", description: "linear background b per unit power (fix at 0 for none)" },
  ],
  evaluate(p, q) {
    return (q[0] * p) / (p + q[1]) + q[2] * p;
  },
  jacobian: saturationWithJacobian,
  valueAndJacobian: saturationWithJacobian,
  guess(x, y) {
    const s = sortByX(x, y);
    const m = s.x.length;
    // Background from the slope of the last third, where the emitter is saturated.
    const k = Math.max(2, Math.floor(m / 3));
    const dx = s.x[m - 1] - s.x[m - k] || 1;
    const slope = Math.max(0, (mean(s.y, m - Math.ceil(k / 3)) - mean(s.y, m - k, m - k + Math.ceil(k / 3))) / dx);
    const b = slope / 2;
    const isat = Math.max(...Array.from(s.y, (v, i) => v - b * s.x[i])) || 1;
    const half = Array.from(s.y, (v, i) => v - b * s.x[i]).findIndex((v) => v >= isat / 2);
    return [isat, Math.max(s.x[Math.max(half, 0)], xScale(s.x).step), b];
  },
  bounds(x) {
    const { max } = xScale(x);
    return [
      [0, Infinity],
      [1e-9 * Math.abs(max), 1e3 * Math.abs(max)],
      [-Infinity, Infinity],
    ];
  },
  derived: [
    {
      name: "I_at_Psat",
      unit: "y",
      description: "count rate at P_sat",
      formula: "I(P_sat) = I_sat/2 + b·P_sat",
      value: (q) => q[0] / 2 + q[2] * q[1],
      gradient: (q) => [0.5, q[2], q[1]],
    },
  ],
  amplitudes: [{ amplitude: "Isat", shapes: ["Psat"] }],
};

function g2WithJacobian(t: number, q: ArrayLike<number>, out: Float64Array): number {
  const [beta, a, t0, t1, t2] = [q[0], q[1], q[2], q[3], q[4]];
  const u = Math.abs(t - t0);
  const s = t >= t0 ? 1 : -1;
  const e1 = Math.exp(-u / t1);
  const e2 = Math.exp(-u / t2);
  const dip = (1 + a) * e1 - a * e2;
  out[0] = -dip;
  out[1] = -beta * (e1 - e2);
  out[2] = -beta * s * ((1 + a) * (e1 / t1) - a * (e2 / t2));
  out[3] = (-beta * (1 + a) * e1 * u) / (t1 * t1);
  out[4] = (beta * a * e2 * u) / (t2 * t2);
  return 1 - beta * dip;
}

export const g2AntibunchingModel: FitModel = {
  id: "g2_antibunching",
  title: "g⁽²⁾(τ) antibunching, three-level",
  formula: "g⁽²⁾(τ) = 1 − β·[(1 + a)·e^(−|τ−τ₀|/τ₁) − a·e^(−|τ−τ₀|/τ₂)]",
  version: "1.0.0",
  kinds: ["other"],
  params: [
    { name: "beta", unit: "1", description: "dip depth β; g⁽²⁾(τ₀) = 1 − β" },
    { name: "a", unit: "1", description: "bunching amplitude a (metastable level)" },
    { name: "tau0", unit: "x", description: "delay offset τ₀ of zero time" },
    { name: "tau1", unit: "x", description: "antibunching time τ₁" },
    { name: "tau2", unit: "x", description: "bunching time τ₂" },
  ],
  evaluate(t, q) {
    const u = Math.abs(t - q[2]);
    return 1 - q[0] * ((1 + q[1]) * Math.exp(-u / q[3]) - q[1] * Math.exp(-u / q[4]));
  },
  jacobian: g2WithJacobian,
  valueAndJacobian: g2WithJacobian,
  guess(x, y) {
    const s = sortByX(x, y);
    const smooth = movingAverage(s.y, 1);
    let lowest = 0;
    for (let i = 1; i < smooth.length; i++) if (smooth[i] < smooth[lowest]) lowest = i;
    const t0 = s.x[lowest];
    const beta = Math.min(0.99, Math.max(0.05, 1 - smooth[lowest]));
    // τ₁: where the dip has recovered to 1 − β/e on the longer side.
    const target = 1 - beta / Math.E;
    let t1 = xScale(s.x).span / 20;
    for (let i = lowest; i < smooth.length; i++)
      if (smooth[i] >= target) {
        t1 = Math.max(s.x[i] - t0, xScale(s.x).step);
        break;
      }
    return [beta, 0.3, t0, t1, 10 * t1];
  },
  bounds(x) {
    const { min, max, span, step } = xScale(x);
    return [
      [0, 1.5],
      [0, 50],
      [min, max],
      [step / 100, span],
      [step / 100, 1e3 * span],
    ];
  },
  derived: [
    {
      name: "g2_0",
      unit: "1",
      description: "g⁽²⁾(0), at zero delay",
      formula: "g⁽²⁾(0) = 1 − β",
      value: (q) => 1 - q[0],
      gradient: () => [-1, 0, 0, 0, 0],
    },
  ],
  verdict(derived) {
    const g0 = derived.find((d) => d.name === "g2_0");
    if (!g0 || !Number.isFinite(g0.value)) return [];
    if (!(g0.stderr > 0)) return [`g⁽²⁾(0) = ${g0.value.toPrecision(3)} has no standard error: no single-emitter verdict.`];
    const margin = (0.5 - g0.value) / g0.stderr;
    return margin >= 3
      ? [`Single emitter: g⁽²⁾(0) is ${margin.toFixed(1)} standard errors below 0.5.`]
      : margin > 0
        ? [`Not conclusive: g⁽²⁾(0) is below 0.5 by only ${margin.toFixed(1)} standard errors (3 wanted; common practice).`]
        : [`Not a single emitter: g⁽²⁾(0) is not below 0.5 (${(-margin).toFixed(1)} standard errors above).`];
  },
  amplitudes: [
    { amplitude: "beta", shapes: ["a", "tau0", "tau1", "tau2"] },
    { amplitude: "a", shapes: ["tau2"] },
  ],
};
