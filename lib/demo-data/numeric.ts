/** Grids and number formatting shared by the demo generators (deterministic text output). */

/** n points from a to b inclusive, evenly spaced. */
export function linSpace(a: number, b: number, n: number): number[] {
  return Array.from({ length: n }, (_, i) => (n === 1 ? a : a + ((b - a) * i) / (n - 1)));
}

/** n points from a to b inclusive, evenly spaced on a log scale (a, b > 0). */
export function logSpace(a: number, b: number, n: number): number[] {
  const la = Math.log10(a);
  const lb = Math.log10(b);
  return linSpace(la, lb, n).map((v) => 10 ** v);
}

/** Fixed decimals, without "-0". */
export function fixed(x: number, digits: number): string {
  const s = x.toFixed(digits);
  return /^-0\.?0*$/.test(s) ? s.slice(1) : s;
}

/** Peak-normalised Lorentzian, 1 at the centre, ½ at ±FWHM/2. */
export function lorentz(x: number, centre: number, fwhm: number): number {
  const q = (2 * (x - centre)) / fwhm;
  return 1 / (1 + q * q);
}

/** Peak-normalised Gaussian with the given FWHM. */
export function gauss(x: number, centre: number, fwhm: number): number {
  const sigma = fwhm / (2 * Math.sqrt(2 * Math.LN2));
  const d = (x - centre) / sigma;
  return Math.exp(-0.5 * d * d);
}
