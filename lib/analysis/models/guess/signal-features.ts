/** Small robust summaries of sampled data, used to derive start values. Units follow the data. */

export interface SortedSeries {
  x: Float64Array;
  y: Float64Array;
}

/** Copies the data sorted by ascending x. */
export function sortByX(x: ArrayLike<number>, y: ArrayLike<number>): SortedSeries {
  let sorted = true;
  for (let i = 1; i < x.length && sorted; i++) if (x[i] < x[i - 1]) sorted = false;
  if (sorted) return { x: Float64Array.from(x), y: Float64Array.from(y) };
  const order = Array.from({ length: x.length }, (_, i) => i).sort((a, b) => x[a] - x[b]);
  return { x: Float64Array.from(order, (k) => x[k]), y: Float64Array.from(order, (k) => y[k]) };
}

export function mean(values: ArrayLike<number>, from = 0, to = values.length): number {
  let sum = 0;
  for (let i = from; i < to; i++) sum += values[i];
  return to > from ? sum / (to - from) : Number.NaN;
}

/**
 * Linear-interpolated quantile, q in [0, 1]: the two order statistics it needs are found by
 * selection in linear time, not by sorting (NaN entries fall back to the sort, which puts them last).
 */
export function quantile(values: ArrayLike<number>, q: number): number {
  const work = Float64Array.from(values);
  const n = work.length;
  if (n === 0) return Number.NaN;
  const position = q * (n - 1);
  const lo = Math.floor(position);
  const hi = Math.min(lo + 1, n - 1);
  let finite = true;
  for (let i = 0; i < n && finite; i++) finite = work[i] === work[i];
  if (!finite) {
    work.sort();
    return work[lo] + (work[hi] - work[lo]) * (position - lo);
  }
  const below = selectInPlace(work, lo);
  let above = below;
  if (hi !== lo) {
    above = work[hi];
    for (let i = hi + 1; i < n; i++) if (work[i] < above) above = work[i];
  }
  return below + (above - below) * (position - lo);
}

/**
 * Rearranges `a` so that a[k] is the k-th smallest value, with nothing larger before it and
 * nothing smaller after it (Hoare's selection with a median-of-three pivot); returns a[k].
 */
function selectInPlace(a: Float64Array, k: number): number {
  let left = 0;
  let right = a.length - 1;
  while (right > left) {
    const mid = (left + right) >>> 1;
    if (a[mid] < a[left]) swap(a, mid, left);
    if (a[right] < a[left]) swap(a, right, left);
    if (a[right] < a[mid]) swap(a, right, mid);
    const pivot = a[mid];
    let i = left;
    let j = right;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        swap(a, i, j);
        i++;
        j--;
      }
    }
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else break;
  }
  return a[k];
}

function swap(a: Float64Array, i: number, j: number): void {
  const t = a[i];
  a[i] = a[j];
  a[j] = t;
}

export function median(values: ArrayLike<number>): number {
  return quantile(values, 0.5);
}

/** Centred moving average with the given half-width (shrinking at the ends). */
export function movingAverage(y: ArrayLike<number>, halfWidth: number): Float64Array {
  const n = y.length;
  const out = new Float64Array(n);
  if (halfWidth <= 0) {
    for (let i = 0; i < n; i++) out[i] = y[i];
    return out;
  }
  const prefix = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) prefix[i + 1] = prefix[i] + y[i];
  for (let i = 0; i < n; i++) {
    const lo = Math.max(0, i - halfWidth);
    const hi = Math.min(n, i + halfWidth + 1);
    out[i] = (prefix[hi] - prefix[lo]) / (hi - lo);
  }
  return out;
}

/** Point-to-point noise σ from the median absolute first difference (robust to slow trends). */
export function noiseLevel(y: ArrayLike<number>): number {
  if (y.length < 3) return 0;
  const diffs = new Float64Array(y.length - 1);
  for (let i = 1; i < y.length; i++) diffs[i - 1] = Math.abs(y[i] - y[i - 1]);
  return (1.4826 * median(diffs)) / Math.SQRT2;
}

/** Linear interpolation of the sampled function (x ascending) at position t, clamped. */
export function interpolate(x: ArrayLike<number>, y: ArrayLike<number>, t: number): number {
  const n = x.length;
  if (t <= x[0]) return y[0];
  if (t >= x[n - 1]) return y[n - 1];
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (x[mid] <= t) lo = mid;
    else hi = mid;
  }
  const span = x[hi] - x[lo];
  return span > 0 ? y[lo] + ((y[hi] - y[lo]) * (t - x[lo])) / span : y[lo];
}

/** Span of x and the smallest positive spacing between sorted x values. */
export function xScale(x: ArrayLike<number>): { min: number; max: number; span: number; step: number } {
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < x.length; i++) {
    min = Math.min(min, x[i]);
    max = Math.max(max, x[i]);
  }
  const span = max - min;
  const step = x.length > 1 ? span / (x.length - 1) : 1;
  return { min, max, span: span > 0 ? span : 1, step: step > 0 ? step : 1 };
}

/** Half-width for smoothing: about 1 % of the points on each side. */
export function smoothingHalfWidth(points: number): number {
  return Math.max(1, Math.round(points / 100));
}
