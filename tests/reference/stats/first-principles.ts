/**
 * Independent, slow, first-principles reference computations for the statistics tests.
 * Nothing here uses jstat or the code under test.
 */

/** Composite Simpson's rule on [a, b] with an even number of intervals. */
export function simpson(f: (x: number) => number, a: number, b: number, intervals = 20_000): number {
  const h = (b - a) / intervals;
  let s = f(a) + f(b);
  for (let i = 1; i < intervals; i++) s += (i % 2 ? 4 : 2) * f(a + i * h);
  return (s * h) / 3;
}

/**
 * Two-sided Student-t tail P(|T_ν| ≥ |t|). With x = √ν tan θ the t density ∝ (1 + x²/ν)^(−(ν+1)/2)
 * becomes ∝ cos^(ν−1) θ on [0, π/2], so no Gamma functions are needed.
 */
export function tTwoSidedByIntegration(t: number, nu: number): number {
  const f = (th: number) => Math.cos(th) ** (nu - 1);
  const thetaT = Math.atan(Math.abs(t) / Math.sqrt(nu));
  return simpson(f, thetaT, Math.PI / 2) / simpson(f, 0, Math.PI / 2);
}

/** Two-sided standard-normal tail P(|Z| ≥ |z|) = 1 − 2∫₀^|z| φ. */
export function normalTwoSidedByIntegration(z: number): number {
  return 1 - 2 * simpson((x) => Math.exp(-(x * x) / 2) / Math.sqrt(2 * Math.PI), 0, Math.abs(z));
}

export const sum = (xs: readonly number[]) => xs.reduce((s, v) => s + v, 0);
export const avg = (xs: readonly number[]) => sum(xs) / xs.length;
export const variance = (xs: readonly number[]) => sum(xs.map((v) => (v - avg(xs)) ** 2)) / (xs.length - 1);

export function median(xs: readonly number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const n = s.length;
  return n % 2 ? s[(n - 1) / 2] : (s[n / 2 - 1] + s[n / 2]) / 2;
}

/** U of a by counting pairs: 1 for x > y, ½ for a tie. */
export function uByPairs(a: readonly number[], b: readonly number[]): number {
  let u = 0;
  for (const x of a) for (const y of b) u += x > y ? 1 : x === y ? 0.5 : 0;
  return u;
}

/** All k-subsets of {0 … n−1}. */
export function* subsets(n: number, k: number, start = 0, acc: number[] = []): Generator<number[]> {
  if (acc.length === k) {
    yield acc;
    return;
  }
  for (let i = start; i <= n - (k - acc.length); i++) yield* subsets(n, k, i + 1, [...acc, i]);
}
