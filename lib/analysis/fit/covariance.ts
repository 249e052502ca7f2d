/**
 * Unscaled covariance (JᵀJ)⁻¹ of the free parameters from the weighted Jacobian, computed
 * through a pivoted QR of the column-equilibrated Jacobian rather than by forming JᵀJ, which
 * would square the condition number.
 */
import { createQrWorkspace, qrFactorize } from "./qr-factorization";

/** Columns whose pivot falls below this fraction of the largest are treated as undetermined. */
const RANK_TOLERANCE = 1e-13;

export interface CovarianceResult {
  /** k×k row-major (JᵀJ)⁻¹; NaN rows/columns for parameters the data do not determine. */
  covariance: Float64Array;
  /** True for parameters the Jacobian does not determine (rank deficiency). */
  undetermined: boolean[];
}

/** @param jacobian column-major m×k weighted Jacobian; overwritten by its factorization. */
export function computeCovariance(jacobian: Float64Array, m: number, k: number): CovarianceResult {
  const a = jacobian;
  const scale = new Float64Array(k);
  for (let j = 0; j < k; j++) {
    let sum = 0;
    for (let i = 0; i < m; i++) sum += jacobian[j * m + i] ** 2;
    scale[j] = Math.sqrt(sum);
    const s = scale[j] > 0 && Number.isFinite(scale[j]) ? 1 / scale[j] : 0;
    for (let i = 0; i < m; i++) a[j * m + i] = jacobian[j * m + i] * s;
  }
  const qr = createQrWorkspace(k);
  qrFactorize(a, m, k, m, qr);
  const r = new Float64Array(k * k); // row-major upper triangle of R
  for (let j = 0; j < k; j++) {
    r[j * k + j] = qr.rDiagonal[j];
    for (let i = 0; i < j; i++) r[i * k + j] = a[j * m + i];
  }
  const largest = Math.abs(r[0]);
  let rank = 0;
  while (rank < Math.min(k, m) && Math.abs(r[rank * k + rank]) > RANK_TOLERANCE * largest) rank++;

  // Inverse of the leading rank×rank block of R, then (RᵀR)⁻¹ = R⁻¹R⁻ᵀ.
  const inv = new Float64Array(k * k);
  for (let j = 0; j < rank; j++) {
    inv[j * k + j] = 1 / r[j * k + j];
    for (let i = j - 1; i >= 0; i--) {
      let sum = 0;
      for (let l = i + 1; l <= j; l++) sum += r[i * k + l] * inv[l * k + j];
      inv[i * k + j] = -sum / r[i * k + i];
    }
  }
  const covariance = new Float64Array(k * k).fill(Number.NaN);
  const undetermined = new Array<boolean>(k).fill(true);
  for (let a1 = 0; a1 < rank; a1++) undetermined[qr.permutation[a1]] = !(scale[qr.permutation[a1]] > 0);
  for (let p = 0; p < rank; p++) {
    for (let q = p; q < rank; q++) {
      let sum = 0;
      for (let l = q; l < rank; l++) sum += inv[p * k + l] * inv[q * k + l];
      const i = qr.permutation[p];
      const j = qr.permutation[q];
      const value = sum / (scale[i] * scale[j]);
      covariance[i * k + j] = value;
      covariance[j * k + i] = value;
    }
  }
  for (let j = 0; j < k; j++) {
    if (!undetermined[j]) continue;
    for (let i = 0; i < k; i++) {
      covariance[i * k + j] = Number.NaN;
      covariance[j * k + i] = Number.NaN;
    }
  }
  return { covariance, undetermined };
}
