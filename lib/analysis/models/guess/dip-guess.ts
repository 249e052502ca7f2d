/**
 * Finds resonance dips in ODMR-like spectra y = B·(1 − Σ cₖ·Lₖ(f)): a baseline from the upper
 * quantile of the smoothed data, then neighbourhood maxima of the smoothed contrast
 * 1 − y/B above the noise, each with a half-depth width. Positions and widths in x units,
 * depths as fractional contrast.
 */
import { interpolate, movingAverage, noiseLevel, quantile, smoothingHalfWidth, sortByX } from "./signal-features";

export interface DipProfile {
  x: Float64Array;
  /** Smoothed contrast 1 − y/B. */
  contrast: Float64Array;
  baseline: number;
  /** Noise of the smoothed contrast. */
  noise: number;
  step: number;
}

export interface Dip {
  position: number;
  depth: number;
  /** Full width at half depth; NaN when neither side reached half depth. */
  width: number;
}

export function dipProfile(x: ArrayLike<number>, y: ArrayLike<number>): DipProfile {
  const s = sortByX(x, y);
  const m = s.x.length;
  const halfWidth = smoothingHalfWidth(m);
  const smooth = movingAverage(s.y, halfWidth);
  const baseline = quantile(smooth, 0.85) || 1;
  const contrast = smooth.map((v) => 1 - v / baseline);
  const noise = noiseLevel(s.y) / Math.abs(baseline) / Math.sqrt(2 * halfWidth + 1);
  const step = m > 1 ? (s.x[m - 1] - s.x[0]) / (m - 1) : 1;
  return { x: s.x, contrast, baseline, noise, step: step > 0 ? step : 1 };
}

export function contrastAt(profile: DipProfile, f: number): number {
  return interpolate(profile.x, profile.contrast, f);
}

/** Up to maxCount dips, deepest first. */
export function findDips(profile: DipProfile, maxCount: number): Dip[] {
  const { x, contrast, noise } = profile;
  const m = x.length;
  const reach = smoothingHalfWidth(m);
  const candidates: number[] = [];
  for (let i = 0; i < m; i++) {
    // Most points lose to a next neighbour already; only the rest need the whole neighbourhood.
    if (reach > 0 && ((i > 0 && contrast[i - 1] >= contrast[i]) || (i + 1 < m && contrast[i + 1] > contrast[i]))) continue;
    let isMax = true;
    for (let k = Math.max(0, i - reach); k <= Math.min(m - 1, i + reach) && isMax; k++) {
      if (contrast[k] > contrast[i] || (contrast[k] === contrast[i] && k < i)) isMax = false;
    }
    if (isMax) candidates.push(i);
  }
  candidates.sort((a, b) => contrast[b] - contrast[a]);
  if (candidates.length === 0) return [];
  const deepest = contrast[candidates[0]];
  const threshold = Math.max(5 * noise, 0.15 * deepest);
  return candidates
    .filter((i) => contrast[i] >= threshold)
    .slice(0, maxCount)
    .map((i) => ({ position: x[i], depth: contrast[i], width: halfDepthWidth(profile, i) }));
}

/** Walks out to half depth on each side, stopping at the valley towards a neighbouring dip. */
function halfDepthWidth(profile: DipProfile, index: number): number {
  const { x, contrast, noise } = profile;
  const half = contrast[index] / 2;
  const side = (direction: 1 | -1): number => {
    let lowest = contrast[index];
    for (let i = index + direction; i >= 0 && i < x.length; i += direction) {
      const v = contrast[i];
      if (v <= half) {
        const prev = contrast[i - direction];
        const t = prev !== v ? (prev - half) / (prev - v) : 0;
        return Math.abs(x[i - direction] + t * (x[i] - x[i - direction]) - x[index]);
      }
      lowest = Math.min(lowest, v);
      if (v > lowest + 3 * noise + 0.1 * half) return Number.NaN;
    }
    return Number.NaN;
  };
  const left = side(-1);
  const right = side(1);
  if (Number.isFinite(left) && Number.isFinite(right)) return left + right;
  if (Number.isFinite(left)) return 2 * left;
  if (Number.isFinite(right)) return 2 * right;
  return Number.NaN;
}
