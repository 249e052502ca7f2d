/**
 * Householder QR with column pivoting on a column-major m×n matrix, after MINPACK's qrfac
 * (Moré, Garbow, Hillstrom 1980). Matrices are stored column-major: a[j*lda + i] is row i of
 * column j.
 */

const MACHINE_EPSILON = 2.220446049250313e-16;
const SMALL_SQUARE = 1e-150;
const LARGE_SQUARE = 1e150;

/** Euclidean norm of `length` entries of `v` starting at `offset`, safe against overflow. */
export function euclideanNorm(v: Float64Array, offset: number, length: number): number {
  let sum = 0;
  const end = offset + length;
  for (let i = offset; i < end; i++) sum += v[i] * v[i];
  if (sum > SMALL_SQUARE && sum < LARGE_SQUARE) return Math.sqrt(sum);
  return scaledNorm(v, offset, end);
}

function scaledNorm(v: Float64Array, start: number, end: number): number {
  let scale = 0;
  for (let i = start; i < end; i++) scale = Math.max(scale, Math.abs(v[i]));
  if (scale === 0 || !Number.isFinite(scale)) return scale;
  let sum = 0;
  for (let i = start; i < end; i++) {
    const t = v[i] / scale;
    sum += t * t;
  }
  return scale * Math.sqrt(sum);
}

/** Workspace of a QR factorization; allocate once per fit and reuse. */
export interface QrWorkspace {
  /** Column permutation: column j of R corresponds to original column permutation[j]. */
  permutation: Int32Array;
  /** Diagonal of R (the stored matrix holds the Householder vectors there). */
  rDiagonal: Float64Array;
  /** Euclidean norms of the original columns. */
  columnNorms: Float64Array;
  scratch: Float64Array;
}

export function createQrWorkspace(n: number): QrWorkspace {
  return {
    permutation: new Int32Array(n),
    rDiagonal: new Float64Array(n),
    columnNorms: new Float64Array(n),
    scratch: new Float64Array(n),
  };
}

/**
 * Factorizes A·P = Q·R in place. On return the strict upper triangle of `a` holds R (without
 * its diagonal, which is in `ws.rDiagonal`), and the lower trapezoid holds the Householder
 * vectors defining Q. Column pivoting picks the largest remaining column each step, which
 * reveals rank and keeps the small-parameter directions accurate.
 */
export function qrFactorize(a: Float64Array, m: number, n: number, lda: number, ws: QrWorkspace): void {
  const { permutation, rDiagonal, columnNorms, scratch } = ws;
  for (let j = 0; j < n; j++) {
    const norm = euclideanNorm(a, j * lda, m);
    columnNorms[j] = norm;
    rDiagonal[j] = norm;
    scratch[j] = norm;
    permutation[j] = j;
  }
  const steps = Math.min(m, n);
  for (let j = 0; j < steps; j++) {
    let kmax = j;
    for (let k = j; k < n; k++) if (rDiagonal[k] > rDiagonal[kmax]) kmax = k;
    if (kmax !== j) {
      swapColumns(a, m, lda, j, kmax);
      rDiagonal[kmax] = rDiagonal[j];
      scratch[kmax] = scratch[j];
      const p = permutation[j];
      permutation[j] = permutation[kmax];
      permutation[kmax] = p;
    }
    const cj = j * lda;
    let ajnorm = euclideanNorm(a, cj + j, m - j);
    if (ajnorm !== 0) {
      if (a[cj + j] < 0) ajnorm = -ajnorm;
      for (let i = j; i < m; i++) a[cj + i] /= ajnorm;
      a[cj + j] += 1;
      for (let k = j + 1; k < n; k++) {
        const ck = k * lda;
        let sum = 0;
        for (let i = j; i < m; i++) sum += a[cj + i] * a[ck + i];
        const t = sum / a[cj + j];
        for (let i = j; i < m; i++) a[ck + i] -= t * a[cj + i];
        if (rDiagonal[k] !== 0) {
          const ratio = a[ck + j] / rDiagonal[k];
          rDiagonal[k] *= Math.sqrt(Math.max(0, 1 - ratio * ratio));
          const rel = rDiagonal[k] / scratch[k];
          // Downdated norms lose accuracy through cancellation; recompute when that happens.
          if (0.05 * rel * rel <= MACHINE_EPSILON) {
            rDiagonal[k] = euclideanNorm(a, ck + j + 1, m - j - 1);
            scratch[k] = rDiagonal[k];
          }
        }
      }
    }
    rDiagonal[j] = -ajnorm;
  }
}

function swapColumns(a: Float64Array, m: number, lda: number, j: number, k: number): void {
  const cj = j * lda;
  const ck = k * lda;
  for (let i = 0; i < m; i++) {
    const t = a[cj + i];
    a[cj + i] = a[ck + i];
    a[ck + i] = t;
  }
}

/**
 * Overwrites `v` (length m) with Qᵀ·v using the Householder vectors left in `a` by
 * qrFactorize. The Householder vector of step j is stored with a[j,j] as its leading entry.
 */
export function applyQTranspose(a: Float64Array, m: number, n: number, lda: number, v: Float64Array): void {
  const steps = Math.min(m, n);
  for (let j = 0; j < steps; j++) {
    const cj = j * lda;
    const ajj = a[cj + j];
    if (ajj === 0) continue;
    let sum = 0;
    for (let i = j; i < m; i++) sum += a[cj + i] * v[i];
    const t = -sum / ajj;
    for (let i = j; i < m; i++) v[i] += t * a[cj + i];
  }
}
