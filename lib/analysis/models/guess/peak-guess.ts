/**
 * Start values for a single peak (or dip) on a flat baseline: the baseline from the outer
 * tenths of the data, the extremum of the smoothed data, and its full width at half height.
 * Positions and widths in x units, heights in y units.
 */
import { median, movingAverage, smoothingHalfWidth, sortByX } from "./signal-features";

export interface PeakGuess {
  baseline: number;
  /** Signed height above the baseline (negative for a dip). */
  height: number;
  centre: number;
  /** Full width at half height. */
  fwhm: number;
}

export function guessPeak(x: ArrayLike<number>, y: ArrayLike<number>): PeakGuess {
  const s = sortByX(x, y);
  const m = s.x.length;
  const smooth = movingAverage(s.y, smoothingHalfWidth(m));
  const edge = Math.max(2, Math.round(0.1 * m));
  const outer = [...s.y.subarray(0, edge), ...s.y.subarray(Math.max(edge, m - edge))];
  const baseline = median(outer);
  let index = 0;
  for (let i = 1; i < m; i++) {
    if (Math.abs(smooth[i] - baseline) > Math.abs(smooth[index] - baseline)) index = i;
  }
  const height = smooth[index] - baseline;
  const half = Math.abs(height) / 2;
  const side = (direction: 1 | -1): number => {
    for (let i = index + direction; i >= 0 && i < m; i += direction) {
      const v = Math.abs(smooth[i] - baseline);
      if (v <= half) {
        const prev = Math.abs(smooth[i - direction] - baseline);
        const t = prev !== v ? (prev - half) / (prev - v) : 0;
        return Math.abs(s.x[i - direction] + t * (s.x[i] - s.x[i - direction]) - s.x[index]);
      }
    }
    return Number.NaN;
  };
  const left = side(-1);
  const right = side(1);
  const span = s.x[m - 1] - s.x[0] || 1;
  let fwhm = Number.isFinite(left) && Number.isFinite(right) ? left + right : 2 * (Number.isFinite(left) ? left : right);
  if (!(fwhm > 0)) fwhm = span / 10;
  return { baseline, height: height || 1, centre: s.x[index], fwhm };
}
