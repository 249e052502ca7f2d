/**
 * Zero-padded FFT periodogram of sampled data, for locating oscillation frequencies without
 * assuming units: frequencies come out in 1/(x unit). Non-uniform x is linearly resampled.
 */
import { interpolate } from "./signal-features";

export interface Periodogram {
  /** Frequency of bin k, in 1/x. */
  frequency: Float64Array;
  power: Float64Array;
  /** Frequency resolution of the padded transform, 1/x. */
  binWidth: number;
}

function nextPowerOfTwo(n: number): number {
  let p = 1;
  while (p < n) p <<= 1;
  return p;
}

/** In-place iterative radix-2 FFT (length must be a power of two). */
function fft(re: Float64Array, im: Float64Array): void {
  const n = re.length;
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      let t = re[i];
      re[i] = re[j];
      re[j] = t;
      t = im[i];
      im[i] = im[j];
      im[j] = t;
    }
  }
  for (let size = 2; size <= n; size <<= 1) {
    const angle = (-2 * Math.PI) / size;
    const wr = Math.cos(angle);
    const wi = Math.sin(angle);
    const half = size >> 1;
    for (let start = 0; start < n; start += size) {
      let cr = 1;
      let ci = 0;
      for (let k = 0; k < half; k++) {
        const a = start + k;
        const b = a + half;
        const tr = re[b] * cr - im[b] * ci;
        const ti = re[b] * ci + im[b] * cr;
        re[b] = re[a] - tr;
        im[b] = im[a] - ti;
        re[a] += tr;
        im[a] += ti;
        const nr = cr * wr - ci * wi;
        ci = cr * wi + ci * wr;
        cr = nr;
      }
    }
  }
}

/** @param x ascending sample positions; y the values with their mean already removed. */
export function periodogram(x: ArrayLike<number>, y: ArrayLike<number>, oversample = 8): Periodogram {
  const m = x.length;
  const samples = nextPowerOfTwo(Math.max(m, 8));
  const span = x[m - 1] - x[0] || 1;
  const dt = span / (samples - 1);
  const n = samples * oversample;
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  for (let i = 0; i < samples; i++) re[i] = interpolate(x, y, x[0] + i * dt);
  fft(re, im);
  const bins = n / 2 + 1;
  const frequency = new Float64Array(bins);
  const power = new Float64Array(bins);
  for (let k = 0; k < bins; k++) {
    frequency[k] = k / (n * dt);
    power[k] = re[k] * re[k] + im[k] * im[k];
  }
  return { frequency, power, binWidth: 1 / (n * dt) };
}

/** Power at frequency f (1/x), linearly interpolated between bins; |f| is used. */
export function powerAt(pg: Periodogram, f: number): number {
  const position = Math.abs(f) / pg.binWidth;
  const k = Math.floor(position);
  if (k >= pg.power.length - 1) return 0;
  return pg.power[k] + (pg.power[k + 1] - pg.power[k]) * (position - k);
}

/**
 * Frequencies (1/x) of the strongest local maxima between minFrequency and maxFrequency, strongest
 * first. The resampled transform reaches past the data's own Nyquist frequency, where linear
 * interpolation leaves images of the lines below it; callers pass that limit as maxFrequency.
 */
export function strongestPeaks(pg: Periodogram, count: number, minFrequency: number, maxFrequency = Infinity): number[] {
  const peaks: Array<{ f: number; p: number }> = [];
  const { power, binWidth } = pg;
  for (let k = 1; k < power.length - 1; k++) {
    if (k * binWidth < minFrequency || k * binWidth > maxFrequency) continue;
    if (power[k] >= power[k - 1] && power[k] > power[k + 1]) {
      // Parabolic interpolation of the peak position between bins.
      const denom = power[k - 1] - 2 * power[k] + power[k + 1];
      const shift = denom !== 0 ? (0.5 * (power[k - 1] - power[k + 1])) / denom : 0;
      peaks.push({ f: (k + shift) * binWidth, p: power[k] });
    }
  }
  peaks.sort((a, b) => b.p - a.p);
  return peaks.slice(0, count).map((peak) => peak.f);
}
