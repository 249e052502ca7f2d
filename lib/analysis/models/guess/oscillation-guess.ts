/**
 * Start values for Gaussian-damped oscillations S0 + A·exp(−(t/T)²)·Σₘ cos(2π(δ + m·a)t + φ):
 * the periodogram proposes a few (δ, a) hypotheses; for each, a scan over T with S0, A·cos φ
 * and A·sin φ solved linearly (variable projection) gives the least-squares cost, and the
 * cheapest hypothesis wins. t in x units, δ and a in 1/x, φ in radians.
 */
import { periodogram, powerAt, strongestPeaks, type Periodogram } from "./periodogram";
import { rankLinePatterns, type PatternMatch } from "./line-pattern";
import { mean, sortByX } from "./signal-features";
import { nyquistFrequency } from "../nyquist";

export interface OscillationGuess {
  offset: number;
  amplitude: number;
  decayTime: number;
  frequency: number;
  spacing: number;
  phase: number;
}

/** Line offsets in units of the spacing: [0] for one line, [−1, 0, 1] for the ¹⁴N triplet. */
export type LinePattern = readonly number[];

const DECAY_STEPS = 24;
const HYPOTHESES = 6;

export function guessOscillation(x: ArrayLike<number>, y: ArrayLike<number>, pattern: LinePattern): OscillationGuess {
  const s = sortByX(x, y);
  const m = s.x.length;
  const offset = mean(s.y);
  const span = s.x[m - 1] - s.x[0] || 1;
  const pg = periodogram(
    s.x,
    s.y.map((v) => v - offset),
  );
  const minFrequency = 1 / span;
  // Only frequencies the samples can resolve: above 1/(2Δt) the periodogram shows images, and a
  // start there would lead the fit to the alias 1/Δt − f.
  const maxFrequency = nyquistFrequency(s.x);
  const candidates = pattern.length === 1 ? singleLineCandidates(pg, minFrequency, maxFrequency) : patternCandidates(pg, pattern, minFrequency, maxFrequency);

  const decayTimes = Array.from({ length: DECAY_STEPS }, (_, k) => (span / 30) * 300 ** (k / (DECAY_STEPS - 1)));
  const envelopes = decayTimes.map((time) => s.x.map((t) => Math.exp(-((t / time) ** 2))));
  const carrier = new Float64Array(m);
  const quadrature = new Float64Array(m);
  let best = { cost: Infinity, offset, amplitude: 0, phase: 0, decayTime: span / 2, frequency: 2 / span, spacing: 0 };
  for (const { centre, spacing } of candidates) {
    for (let i = 0; i < m; i++) {
      let c = 0;
      let q = 0;
      for (const k of pattern) {
        const angle = 2 * Math.PI * (centre + k * spacing) * s.x[i];
        c += Math.cos(angle);
        q += Math.sin(angle);
      }
      carrier[i] = c;
      quadrature[i] = q;
    }
    envelopes.forEach((envelope, k) => {
      const fit = projectLinear(s.y, envelope, carrier, quadrature);
      if (fit.cost < best.cost) best = { ...fit, decayTime: decayTimes[k], frequency: centre, spacing };
    });
  }
  return {
    offset: best.offset,
    amplitude: best.amplitude,
    decayTime: best.decayTime,
    frequency: best.frequency,
    spacing: best.spacing,
    phase: best.phase,
  };
}

function singleLineCandidates(pg: Periodogram, minFrequency: number, maxFrequency: number): PatternMatch[] {
  const peaks = strongestPeaks(pg, 3, minFrequency, maxFrequency);
  if (peaks.length === 0) return [{ centre: 2 * minFrequency, spacing: 0 }];
  return peaks.map((centre) => ({ centre, spacing: 0 }));
}

/**
 * Hypotheses for equally spaced lines from pairs of periodogram peaks. A line at negative
 * frequency folds onto |f|, so each resolved frequency is scored once; for the symmetric
 * triplet with δ < a, the lines a − δ and δ may merge into one peak near a/2, which adds the
 * hypothesis a = 2·p₁, δ = p₂ − 2·p₁.
 */
function patternCandidates(pg: Periodogram, pattern: LinePattern, minFrequency: number, maxFrequency: number): PatternMatch[] {
  const peaks = strongestPeaks(pg, 6, minFrequency, maxFrequency);
  const score = (centre: number, spacing: number): number => {
    const lines = pattern.map((k) => Math.abs(centre + k * spacing)).sort((a, b) => a - b);
    let sum = 0;
    lines.forEach((f, i) => {
      if (i === 0 || f - lines[i - 1] >= minFrequency) sum += powerAt(pg, f);
    });
    return sum;
  };
  const candidates = rankLinePatterns(peaks, pattern, score, minFrequency, HYPOTHESES);
  const symmetricTriplet = pattern.length === 3 && pattern[0] === -pattern[2] && pattern[1] === 0;
  if (symmetricTriplet) {
    for (const low of peaks) {
      for (const high of peaks) {
        const centre = high - 2 * low;
        if (centre > 0 && 2 * low >= minFrequency) candidates.push({ centre, spacing: 2 * low });
      }
    }
  }
  if (candidates.length === 0) candidates.push({ centre: peaks[0] ?? 2 * minFrequency, spacing: 3 * minFrequency });
  return candidates;
}

/** Least squares of y on [1, e·C, −e·Q]; returns the residual cost and S0, A, φ. */
function projectLinear(
  y: Float64Array,
  envelope: Float64Array,
  carrier: Float64Array,
  quadrature: Float64Array,
): { cost: number; offset: number; amplitude: number; phase: number } {
  const m = y.length;
  let s12 = 0,
    s13 = 0,
    s22 = 0,
    s23 = 0,
    s33 = 0,
    b1 = 0,
    b2 = 0,
    b3 = 0,
    yy = 0;
  for (let i = 0; i < m; i++) {
    const u = envelope[i] * carrier[i];
    const v = -envelope[i] * quadrature[i];
    s12 += u;
    s13 += v;
    s22 += u * u;
    s23 += u * v;
    s33 += v * v;
    b1 += y[i];
    b2 += u * y[i];
    b3 += v * y[i];
    yy += y[i] * y[i];
  }
  const solution = solve3([m, s12, s13, s12, s22, s23, s13, s23, s33], [b1, b2, b3]);
  if (!solution) return { cost: Infinity, offset: 0, amplitude: 0, phase: 0 };
  const [c0, cc, cs] = solution;
  // Residual sum of squares = yᵀy − cᵀb at the least-squares solution.
  const cost = yy - (c0 * b1 + cc * b2 + cs * b3);
  return { cost, offset: c0, amplitude: Math.hypot(cc, cs), phase: Math.atan2(cs, cc) };
}

function solve3(a: number[], b: number[]): [number, number, number] | undefined {
  const det = (q: number[]): number => q[0] * (q[4] * q[8] - q[5] * q[7]) - q[1] * (q[3] * q[8] - q[5] * q[6]) + q[2] * (q[3] * q[7] - q[4] * q[6]);
  const d = det(a);
  if (!Number.isFinite(d) || Math.abs(d) < 1e-300) return undefined;
  const column = (k: number): number[] => a.map((v, idx) => (idx % 3 === k ? b[Math.floor(idx / 3)] : v));
  return [det(column(0)) / d, det(column(1)) / d, det(column(2)) / d];
}
