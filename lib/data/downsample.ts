/**
 * Display downsampling for large series (never used for source-data exports).
 *
 * Which to use:
 * - `minMaxPerBucket` for dense line plots drawn at a known pixel width (ODMR sweeps, time
 *   traces with 10⁵–10⁷ points): with one bucket per pixel column the drawn envelope is
 *   identical to the full data and every spike or dip survives by construction. Output size
 *   varies (up to 2 points per bucket, in x order).
 * - `lttb` when a fixed, small number of points should look like the curve (scatter plots,
 *   smooth decays, thumbnails, tooltips). It follows the shape well with far fewer points;
 *   here it is also made to keep the global minimum and maximum, so a sharp dip survives.
 *
 * Both expect x sorted ascending; points with a NaN x or y are skipped.
 */

export interface Series {
  x: number[];
  y: number[];
}

function finitePairs(x: ArrayLike<number>, y: ArrayLike<number>): number[] {
  const idx: number[] = [];
  const n = Math.min(x.length, y.length);
  for (let i = 0; i < n; i++) if (!Number.isNaN(x[i]) && !Number.isNaN(y[i])) idx.push(i);
  return idx;
}

/** Min and max of y in each of `buckets` equal-width x intervals, emitted in x order. */
export function minMaxPerBucket(x: ArrayLike<number>, y: ArrayLike<number>, buckets: number): Series {
  const idx = finitePairs(x, y);
  const out: Series = { x: [], y: [] };
  if (idx.length === 0 || buckets < 1) return out;
  const x0 = x[idx[0]];
  const span = x[idx[idx.length - 1]] - x0;
  const nb = Math.max(1, Math.floor(buckets));
  let k = 0;
  for (let b = 0; b < nb && k < idx.length; b++) {
    const hi = b === nb - 1 || span <= 0 ? Infinity : x0 + (span * (b + 1)) / nb;
    let lo = -1;
    let hiI = -1;
    while (k < idx.length && (x[idx[k]] < hi || b === nb - 1)) {
      const i = idx[k];
      if (lo < 0 || y[i] < y[lo]) lo = i;
      if (hiI < 0 || y[i] > y[hiI]) hiI = i;
      k++;
    }
    if (lo < 0) continue;
    const first = Math.min(lo, hiI);
    const second = Math.max(lo, hiI);
    out.x.push(x[first]);
    out.y.push(y[first]);
    if (second !== first) {
      out.x.push(x[second]);
      out.y.push(y[second]);
    }
  }
  return out;
}

/** Largest-Triangle-Three-Buckets (Steinarsson 2013) to `threshold` points, keeping global extremes. */
export function lttb(x: ArrayLike<number>, y: ArrayLike<number>, threshold: number): Series {
  const idx = finitePairs(x, y);
  const n = idx.length;
  const t = Math.floor(threshold);
  if (t >= n || t < 3) {
    const keep = t >= n ? idx : idx.length > 0 ? [idx[0], idx[n - 1]].slice(0, Math.max(0, t)) : [];
    return { x: keep.map((i) => x[i]), y: keep.map((i) => y[i]) };
  }
  const chosen: number[] = [0];
  const every = (n - 2) / (t - 2);
  let a = 0;
  for (let b = 0; b < t - 2; b++) {
    const start = Math.floor(b * every) + 1;
    const end = Math.floor((b + 1) * every) + 1;
    const nextEnd = Math.min(Math.floor((b + 2) * every) + 1, n);
    let avgX = 0;
    let avgY = 0;
    for (let k = end; k < nextEnd; k++) {
      avgX += x[idx[k]];
      avgY += y[idx[k]];
    }
    const cnt = Math.max(1, nextEnd - end);
    avgX /= cnt;
    avgY /= cnt;
    const ax = x[idx[a]];
    const ay = y[idx[a]];
    let best = start;
    let bestArea = -1;
    for (let k = start; k < end; k++) {
      const area = Math.abs((ax - avgX) * (y[idx[k]] - ay) - (ax - x[idx[k]]) * (avgY - ay));
      if (area > bestArea) {
        bestArea = area;
        best = k;
      }
    }
    chosen.push(best);
    a = best;
  }
  chosen.push(n - 1);
  keepExtremes(chosen, idx, y, every);
  return { x: chosen.map((k) => x[idx[k]]), y: chosen.map((k) => y[idx[k]]) };
}

/**
 * Replaces the pick of the bucket holding the global min (and max) with that point. When both
 * extremes share one bucket the second is inserted, so the output can hold threshold + 1 points.
 */
function keepExtremes(chosen: number[], idx: number[], y: ArrayLike<number>, every: number): void {
  let lo = 0;
  let hi = 0;
  for (let k = 1; k < idx.length; k++) {
    if (y[idx[k]] < y[idx[lo]]) lo = k;
    if (y[idx[k]] > y[idx[hi]]) hi = k;
  }
  const buckets = chosen.length - 2;
  const replaced = new Set<number>();
  for (const k of [lo, hi]) {
    if (chosen.includes(k)) continue;
    // Bucket b spans [floor(b·every) + 1, floor((b + 1)·every) + 1).
    let b = Math.min(buckets - 1, Math.max(0, Math.floor((k - 1) / every)));
    while (b + 1 < buckets && Math.floor((b + 1) * every) + 1 <= k) b++;
    while (b > 0 && Math.floor(b * every) + 1 > k) b--;
    const slot = b + 1;
    if (!replaced.has(slot)) {
      chosen[slot] = k;
      replaced.add(slot);
    } else {
      chosen.splice(chosen[slot] < k ? slot + 1 : slot, 0, k);
      return;
    }
  }
}
