/**
 * Start values for S(t) = S0 + A·exp(−(t/T)ⁿ) from the data alone: the tail gives S0, the head
 * gives A, and a log-linear regression of ln(−ln u) on ln t, u = (S − S0)/A, gives n and T.
 * t and T are in x units; S0 and A in y units.
 */
import { mean, movingAverage, smoothingHalfWidth, sortByX } from "./signal-features";

export interface DecayGuess {
  offset: number;
  amplitude: number;
  time: number;
  exponent: number;
}

export interface DecayGuessOptions {
  /** Estimate the stretch exponent n (otherwise n = 1). */
  stretched: boolean;
  exponentRange: [number, number];
}

const clamp = (v: number, lo: number, hi: number): number => Math.min(hi, Math.max(lo, v));

export function guessDecay(x: ArrayLike<number>, y: ArrayLike<number>, options: DecayGuessOptions): DecayGuess {
  const s = sortByX(x, y);
  const m = s.x.length;
  const tailCount = Math.max(2, Math.round(0.08 * m));
  const smooth = movingAverage(s.y, smoothingHalfWidth(m));
  const offset = mean(s.y, m - tailCount, m);
  let head = smooth[0] - offset;
  if (head === 0 || !Number.isFinite(head)) head = s.y[0] - offset || 1;
  const span = s.x[m - 1] - Math.min(0, s.x[0]) || 1;
  const [nLo, nHi] = options.exponentRange;

  let amplitude = head;
  let time = span / 3;
  let exponent = options.stretched ? clamp(1, nLo, nHi) : 1;
  const logT: number[] = [];
  const logMinusLogU: number[] = [];
  // Two passes: the second uses the amplitude extrapolated back to t = 0.
  for (let pass = 0; pass < 2; pass++) {
    logT.length = 0;
    logMinusLogU.length = 0;
    for (let i = 0; i < m; i++) {
      const t = s.x[i];
      const u = (smooth[i] - offset) / amplitude;
      if (t > 0 && u > 0.1 && u < 0.9) {
        logT.push(Math.log(t));
        logMinusLogU.push(Math.log(-Math.log(u)));
      }
    }
    if (logT.length >= 2) {
      if (options.stretched) exponent = clamp(regressionSlope(logT, logMinusLogU), nLo, nHi);
      let sum = 0;
      for (let k = 0; k < logT.length; k++) sum += logT[k] - logMinusLogU[k] / exponent;
      time = Math.exp(sum / logT.length);
    } else {
      time = crossingTime(s.x, smooth, offset, amplitude) ?? span / 3;
    }
    const startDecay = s.x[0] > 0 ? (s.x[0] / time) ** exponent : 0;
    if (startDecay < 1e-6 || startDecay > 3 || !Number.isFinite(startDecay)) break;
    amplitude = head / Math.exp(-startDecay);
  }
  if (!(time > 0) || !Number.isFinite(time)) time = span / 3;
  return { offset, amplitude, time, exponent };
}

function regressionSlope(x: number[], y: number[]): number {
  const n = x.length;
  let mx = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    mx += x[i];
    my += y[i];
  }
  mx /= n;
  my /= n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (x[i] - mx) ** 2;
    sxy += (x[i] - mx) * (y[i] - my);
  }
  return sxx > 0 ? sxy / sxx : 1;
}

/** First t where the normalised decay falls below 1/e, linearly interpolated. */
function crossingTime(x: Float64Array, y: Float64Array, offset: number, amplitude: number): number | undefined {
  const level = Math.exp(-1);
  for (let i = 1; i < x.length; i++) {
    const u0 = (y[i - 1] - offset) / amplitude;
    const u1 = (y[i] - offset) / amplitude;
    if (u0 >= level && u1 < level) {
      const t = x[i - 1] + ((u0 - level) / (u0 - u1)) * (x[i] - x[i - 1]);
      return t > 0 ? t : undefined;
    }
  }
  return undefined;
}
