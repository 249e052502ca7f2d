/**
 * Unit-area Voigt profile V(x; σ, γ): the convolution of a Gaussian of standard deviation σ
 * with a Lorentzian of half-width γ, V = Re w(z)/(σ√(2π)), z = (x + iγ)/(σ√2). x, σ and γ
 * share one unit; V is in 1/that unit. σ and γ are taken by magnitude.
 */
import { faddeeva, type Complex } from "./faddeeva";

const SQRT2 = Math.SQRT2;
const SQRT_2PI = Math.sqrt(2 * Math.PI);
const INV_SQRT_PI = 0.5641895835477563;
const scratch: Complex = [0, 0];

export function voigtProfile(x: number, sigmaIn: number, gammaIn: number): number {
  const sigma = Math.abs(sigmaIn);
  const gamma = Math.abs(gammaIn);
  if (sigma === 0) return gamma / (Math.PI * (x * x + gamma * gamma));
  if (gamma === 0) return Math.exp(-(x * x) / (2 * sigma * sigma)) / (sigma * SQRT_2PI);
  const scale = 1 / (sigma * SQRT2);
  faddeeva(x * scale, gamma * scale, scratch);
  return scratch[0] / (sigma * SQRT_2PI);
}

/**
 * Writes [V, ∂V/∂x, ∂V/∂σ, ∂V/∂γ] into out, using w′(z) = −2z·w(z) + 2i/√π.
 * Requires σ > 0 (the Lorentzian limit has no σ-derivative in this form).
 */
export function voigtProfileWithDerivatives(x: number, sigmaIn: number, gammaIn: number, out: Float64Array): void {
  const sigma = Math.max(Math.abs(sigmaIn), Number.MIN_VALUE);
  const gamma = Math.abs(gammaIn);
  const scale = 1 / (sigma * SQRT2);
  const zr = x * scale;
  const zi = gamma * scale;
  faddeeva(zr, zi, scratch);
  const wr = scratch[0];
  const wi = scratch[1];
  const dwr = -2 * (zr * wr - zi * wi);
  const dwi = -2 * (zr * wi + zi * wr) + 2 * INV_SQRT_PI;
  const norm = 1 / (sigma * SQRT_2PI);
  const value = wr * norm;
  out[0] = value;
  out[1] = dwr * scale * norm;
  // ∂z/∂σ = −z/σ
  out[2] = (-(dwr * zr - dwi * zi) / sigma) * norm - value / sigma;
  // ∂z/∂γ = i/(σ√2), and ∂γ/∂γIn carries the sign of γIn
  out[3] = -dwi * scale * norm * (gammaIn < 0 ? -1 : 1);
}
