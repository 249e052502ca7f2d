/**
 * Decoupling scaling: the coherence time T₂ measured with N refocusing π pulses (CPMG, XY-N) as a
 * power law T₂(N) = T₂(1)·N^s, one point per stored run (its fitted T₂ ± standard error). For an NV
 * centre in a slowly fluctuating spin bath, s = 2/3 (de Lange et al., Science 330, 60 (2010); from
 * memory). T₂ and T₂(1) are in the runs' unit of time (all the same), N and s dimensionless.
 *
 * Weighted least squares with σ = each run's standard error, taken as absolute (scipy's
 * curve_fit(..., sigma=σ, absolute_sigma=True)): the reported errors of T₂(1) and s come from the
 * unscaled covariance (JᵀWJ)⁻¹. The errors scaled by √χ²ᵣ (absolute_sigma=False) are given beside
 * them, for when the runs scatter more than their errors say. Pure.
 */
import { fitModel } from "../fit-model";
import { FitInputError } from "../fit-input-error";
import type { FitModel } from "../models/types";

export interface ScalingPoint {
  /** Number of π pulses, ≥ 1. */
  pulses: number;
  /** Fitted T₂ of the run, in the common time unit. */
  t2: number;
  /** Its standard error, same unit, > 0. */
  stderr: number;
}

export interface ScalingFit {
  /** T₂(1) in the points' unit, its standard error from the unscaled covariance, and scaled by √χ²ᵣ. */
  t2One: { value: number; stderr: number; stderrScaled: number };
  /** The exponent s, its standard error from the unscaled covariance, and scaled by √χ²ᵣ. */
  exponent: { value: number; stderr: number; stderrScaled: number };
  chi2: number;
  chi2red: number;
  dof: number;
  converged: boolean;
  /** Correlation of T₂(1) and s. */
  correlation: number;
  /** Sentences about the fit (χ²ᵣ, the expected 2/3). */
  notes: string[];
}

/** The power law as a curve model, x = N, y = T₂; start values from the straight line in log–log. */
const powerLaw: FitModel = {
  id: "decoupling_power_law",
  title: "Decoupling scaling, T₂(N) = T₂(1)·N^s",
  formula: "T₂(N) = T₂(1)·N^s",
  version: "1.0.0",
  kinds: [],
  params: [
    { name: "T2_1", unit: "y", description: "T₂ with one π pulse (Hahn echo)" },
    { name: "s", unit: "1", description: "scaling exponent" },
  ],
  evaluate: (n, p) => p[0] * n ** p[1],
  jacobian(n, p, out) {
    const power = n ** p[1];
    out[0] = power;
    out[1] = p[0] * power * Math.log(n);
  },
  guess(x, y) {
    // Unweighted line through (ln N, ln T₂): ln T₂ = ln T₂(1) + s·ln N.
    let sx = 0,
      sy = 0,
      sxx = 0,
      sxy = 0;
    const m = x.length;
    for (let i = 0; i < m; i++) {
      const lx = Math.log(x[i]);
      const ly = Math.log(y[i]);
      sx += lx;
      sy += ly;
      sxx += lx * lx;
      sxy += lx * ly;
    }
    const d = m * sxx - sx * sx;
    const s = d > 0 ? (m * sxy - sx * sy) / d : 0;
    return [Math.exp((sy - s * sx) / m), s];
  },
  bounds: () => [
    [0, Infinity],
    [-10, 10],
  ],
};

/** The s expected for a spin bath (de Lange et al. 2010), named in the notes. */
const SPIN_BATH_EXPONENT = 2 / 3;

/**
 * Fits T₂(N) = T₂(1)·N^s to the points. Throws FitInputError naming the point (`points[i]`) when a
 * value is not usable, or `points` when fewer than three points or fewer than two pulse numbers.
 */
export function fitDecouplingScaling(points: readonly ScalingPoint[]): ScalingFit {
  points.forEach((p, i) => {
    if (!Number.isFinite(p.pulses) || p.pulses < 1)
      throw new FitInputError(`point ${i + 1}: the number of π pulses must be 1 or more (got ${p.pulses})`, `points[${i}].pulses`);
    if (!Number.isFinite(p.t2) || p.t2 <= 0) throw new FitInputError(`point ${i + 1}: T₂ must be a positive number (got ${p.t2})`, `points[${i}].t2`);
    if (!Number.isFinite(p.stderr) || p.stderr <= 0)
      throw new FitInputError(`point ${i + 1}: the standard error of T₂ must be a positive number (got ${p.stderr})`, `points[${i}].stderr`);
  });
  if (points.length < 3) throw new FitInputError(`a power law needs at least 3 runs to be judged (got ${points.length})`, "points");
  if (new Set(points.map((p) => p.pulses)).size < 2) throw new FitInputError("the runs need at least two different numbers of π pulses", "points");
  if (new Set(points.map((p) => p.t2)).size < 2)
    throw new FitInputError(`every run has the same T₂ (${points[0].t2}): there is no change with N to fit`, "points");
  const r = fitModel(powerLaw, {
    x: points.map((p) => p.pulses),
    y: points.map((p) => p.t2),
    sigma: points.map((p) => p.stderr),
    solver: { ftol: 1e-14, xtol: 1e-14, gtol: 1e-14 },
  });
  const [t2One, exponent] = r.params;
  const unscaled = (j: number) => r.stderrUnscaled[j];
  const notes: string[] = [];
  if (r.dof > 0 && r.chi2red > 2)
    notes.push(`χ²ᵣ = ${r.chi2red.toPrecision(3)}: the runs scatter more than their errors say; the errors scaled by √χ²ᵣ are the safer ones.`);
  const z = (exponent.value - SPIN_BATH_EXPONENT) / unscaled(1);
  if (Number.isFinite(z))
    notes.push(`s differs from 2/3 (spin-bath-limited decoupling, de Lange et al., Science 330, 60 (2010)) by ${Math.abs(z).toPrecision(2)} standard errors.`);
  return {
    t2One: { value: t2One.value, stderr: unscaled(0), stderrScaled: t2One.stderr },
    exponent: { value: exponent.value, stderr: unscaled(1), stderrScaled: exponent.stderr },
    chi2: r.chi2,
    chi2red: r.chi2red,
    dof: r.dof,
    converged: r.converged,
    correlation: r.correlation[0][1],
    notes,
  };
}

/** T₂(1)·N^s at each N, for drawing the fitted line. */
export function scalingCurve(fit: Pick<ScalingFit, "t2One" | "exponent">, pulses: readonly number[]): number[] {
  return pulses.map((n) => fit.t2One.value * n ** fit.exponent.value);
}
