/**
 * The Nyquist limit of sampled oscillations. Samples taken every Δt cannot tell a frequency f from
 * its alias 1/Δt − f (cos(2π f tₖ) = cos(2π (1/Δt − f) tₖ) on the grid tₖ = t₀ + k·Δt), so a
 * frequency is only determined up to 1/(2Δt) (Shannon, Proc. IRE 37, 10 (1949); from memory).
 * Δt is the mean spacing of x; frequencies are in 1/x.
 */
import { xScale } from "./guess/signal-features";

/** Fraction of the Nyquist frequency above which a fitted frequency is reported as close to it. */
const NYQUIST_MARGIN = 0.9;

/** 1/(2Δt) in 1/x, Δt being the mean spacing of the samples. */
export function nyquistFrequency(x: ArrayLike<number>): number {
  return 1 / (2 * xScale(x).step);
}

const show = (v: number): string => String(Number(v.toPrecision(4)));

/**
 * A warning for each fitted frequency (label, value in 1/x) at or above NYQUIST_MARGIN of the
 * Nyquist frequency of x: its alias 1/Δt − f, just past the limit, gives the same samples, so only
 * the bound says which of the two was measured.
 */
export function nyquistWarnings(frequencies: Array<[string, number]>, x: ArrayLike<number>): string[] {
  const limit = nyquistFrequency(x);
  const sampling = 2 * limit;
  const warnings: string[] = [];
  for (const [label, value] of frequencies) {
    const f = Math.abs(value);
    if (!Number.isFinite(f) || f < NYQUIST_MARGIN * limit) continue;
    const term = label.includes(" ") ? `(${label})` : label;
    warnings.push(
      f > limit
        ? `${label} = ${show(f)} is above the Nyquist frequency 1/(2Δt) = ${show(limit)} of these samples, which show it as 1/Δt − ${term} = ${show(Math.abs(sampling - f))}; sample more finely`
        : `${label} = ${show(f)} is within ${Math.round((1 - NYQUIST_MARGIN) * 100)} % of the Nyquist frequency 1/(2Δt) = ${show(limit)} of these samples: a true ${label} of 1/Δt − ${term} = ${show(sampling - f)} would give the very same samples; sample more finely to tell them apart`,
    );
  }
  return warnings;
}
