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
  return normFromSquares(sum, v, offset, length);
}

/**
 * The Euclidean norm of `length` entries of `v` from `offset` given their sum of squares, summed
 * in index order (as euclideanNorm does): the square root when that sum neither under- nor
 * overflowed, else the scaled norm. Lets a caller fold the norm into a pass it makes anyway.
 */
export function normFromSquares(sum: number, v: Float64Array, offset: number, length: number): number {
  if (sum > SMALL_SQUARE && sum < LARGE_SQUARE) return Math.sqrt(sum);
  return scaledNorm(v, offset, offset + length);
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
  /** Diagonal of R (the stored matrix holds the reflectors' leading entries there). */
  rDiagonal: Float64Array;
  /** Euclidean norms of the original columns. */
  columnNorms: Float64Array;
  scratch: Float64Array;
  /** Per column, the sum of squares below the current row, gathered during the previous step. */
  tails: Float64Array;
  /** Where each pivoted column is stored while factorizing (columns are not moved until the end). */
  offsets: Int32Array;
  /** The upper triangle in pivoted order, while it is put in place. */
  top: Float64Array;
}

export function createQrWorkspace(n: number): QrWorkspace {
  return {
    permutation: new Int32Array(n),
    rDiagonal: new Float64Array(n),
    columnNorms: new Float64Array(n),
    scratch: new Float64Array(n),
    tails: new Float64Array(n),
    offsets: new Int32Array(n),
    top: new Float64Array(n * n),
  };
}

/**
 * Factorizes A·P = Q·R in place. On return the strict upper triangle of `a` holds R (without
 * its diagonal, which is in `ws.rDiagonal`) in pivoted column order; the rest of `a` is work space
 * (Q is not kept: pass `rhs` to have Qᵀ applied to a vector). Column pivoting picks the largest remaining column each step, which
 * reveals rank and keeps the small-parameter directions accurate.
 *
 * `norms`, when given, are the Euclidean norms of the n columns as euclideanNorm computes them
 * (a caller that has them saves a pass). `rhs`, when given (length m), is overwritten with Qᵀ·rhs
 * by each reflector as it is formed (the same operations, in the same order, as applying Qᵀ
 * after the factorization).
 *
 * The arithmetic is MINPACK's, operation for operation; only the sweeps are fused: a reflector
 * is scaled while its first dot products are taken, it is applied to two columns per sweep, the
 * sums of squares that the next step's norms need are gathered while a column is updated, and
 * pivoting moves column offsets instead of columns (only the triangle is put in order at the end).
 */
export function qrFactorize(a: Float64Array, m: number, n: number, lda: number, ws: QrWorkspace, norms?: ArrayLike<number>, rhs?: Float64Array): void {
  const { permutation, rDiagonal, columnNorms, scratch, tails, offsets, top } = ws;
  for (let j = 0; j < n; j++) {
    const norm = norms ? norms[j] : euclideanNorm(a, j * lda, m);
    columnNorms[j] = norm;
    rDiagonal[j] = norm;
    scratch[j] = norm;
    permutation[j] = j;
    offsets[j] = j * lda;
  }
  const steps = Math.min(m, n);
  // True when tails[k] holds the sum of squares of column k from row j down (gathered by step j − 1).
  let tailsFresh = false;
  for (let j = 0; j < steps; j++) {
    let kmax = j;
    for (let k = j; k < n; k++) if (rDiagonal[k] > rDiagonal[kmax]) kmax = k;
    if (kmax !== j) {
      const o = offsets[j];
      offsets[j] = offsets[kmax];
      offsets[kmax] = o;
      rDiagonal[kmax] = rDiagonal[j];
      scratch[kmax] = scratch[j];
      const p = permutation[j];
      permutation[j] = permutation[kmax];
      permutation[kmax] = p;
      const t = tails[j];
      tails[j] = tails[kmax];
      tails[kmax] = t;
    }
    const cj = offsets[j];
    let ajnorm: number;
    if (j === 0) ajnorm = columnNorms[permutation[0]];
    else if (tailsFresh) ajnorm = normFromSquares(tails[j], a, cj + j, m - j);
    else ajnorm = euclideanNorm(a, cj + j, m - j);
    tailsFresh = false;
    if (ajnorm !== 0) {
      if (a[cj + j] < 0) ajnorm = -ajnorm;
      a[cj + j] /= ajnorm;
      a[cj + j] += 1;
      const ajj = a[cj + j];
      // The rest of the reflector is divided by ajnorm in the first sweep that reads it.
      let divisor = ajnorm;
      let k = j + 1;
      for (; k + 1 < n; k += 2) {
        reflectPair(a, cj, j, m, ajj, divisor, a, offsets[k], a, offsets[k + 1], tails, k);
        divisor = 0;
        downdateNorm(a, m, offsets[k], j, k, rDiagonal, scratch, tails);
        downdateNorm(a, m, offsets[k + 1], j, k + 1, rDiagonal, scratch, tails);
      }
      if (k < n && rhs) {
        reflectPair(a, cj, j, m, ajj, divisor, a, offsets[k], rhs, 0, tails, k);
        divisor = 0;
        downdateNorm(a, m, offsets[k], j, k, rDiagonal, scratch, tails);
      } else if (k < n) {
        tails[k] = reflectOne(a, cj, j, m, ajj, divisor, a, offsets[k]);
        divisor = 0;
        downdateNorm(a, m, offsets[k], j, k, rDiagonal, scratch, tails);
      } else if (rhs) {
        reflectOne(a, cj, j, m, ajj, divisor, rhs, 0);
        divisor = 0;
      }
      if (divisor !== 0) for (let i = j + 1; i < m; i++) a[cj + i] /= divisor;
      tailsFresh = true;
    }
    rDiagonal[j] = -ajnorm;
  }
  // Rows 0…j of each pivoted column j (R above the diagonal, the reflector's leading entry on it)
  // into column j of a, as if the columns had been swapped as they were chosen.
  for (let j = 0; j < n; j++) {
    const rows = Math.min(j + 1, m);
    for (let i = 0; i < rows; i++) top[j * n + i] = a[offsets[j] + i];
  }
  for (let j = 0; j < n; j++) {
    const rows = Math.min(j + 1, m);
    for (let i = 0; i < rows; i++) a[j * lda + i] = top[j * n + i];
  }
}

/**
 * Applies the reflector of step j (column at cj of `a`, leading entry ajj) to the targets at
 * x[cx…] and y[cy…], rows j…m−1: t = (v·target)/ajj, target −= t·v. With divisor ≠ 0 the
 * reflector's rows below j are first divided by it. Writes the sums of squares of the updated
 * targets below row j into tails[k] and tails[k + 1] (the second only when y is a column of a).
 */
function reflectPair(
  a: Float64Array,
  cj: number,
  j: number,
  m: number,
  ajj: number,
  divisor: number,
  x: Float64Array,
  cx: number,
  y: Float64Array,
  cy: number,
  tails: Float64Array,
  k: number,
): void {
  let sx = ajj * x[cx + j];
  let sy = ajj * y[cy + j];
  if (divisor !== 0) {
    for (let i = j + 1; i < m; i++) {
      const v = a[cj + i] / divisor;
      a[cj + i] = v;
      sx += v * x[cx + i];
      sy += v * y[cy + i];
    }
  } else {
    for (let i = j + 1; i < m; i++) {
      const v = a[cj + i];
      sx += v * x[cx + i];
      sy += v * y[cy + i];
    }
  }
  const tx = sx / ajj;
  const ty = sy / ajj;
  x[cx + j] -= tx * ajj;
  y[cy + j] -= ty * ajj;
  let qx = 0;
  let qy = 0;
  for (let i = j + 1; i < m; i++) {
    const v = a[cj + i];
    const nx = x[cx + i] - tx * v;
    const ny = y[cy + i] - ty * v;
    x[cx + i] = nx;
    y[cy + i] = ny;
    qx += nx * nx;
    qy += ny * ny;
  }
  tails[k] = qx;
  if (y === a) tails[k + 1] = qy;
}

/** reflectPair for one target; returns the sum of squares of the updated target below row j. */
function reflectOne(a: Float64Array, cj: number, j: number, m: number, ajj: number, divisor: number, x: Float64Array, cx: number): number {
  let sx = ajj * x[cx + j];
  if (divisor !== 0) {
    for (let i = j + 1; i < m; i++) {
      const v = a[cj + i] / divisor;
      a[cj + i] = v;
      sx += v * x[cx + i];
    }
  } else {
    for (let i = j + 1; i < m; i++) sx += a[cj + i] * x[cx + i];
  }
  const tx = sx / ajj;
  x[cx + j] -= tx * ajj;
  let qx = 0;
  for (let i = j + 1; i < m; i++) {
    const nx = x[cx + i] - tx * a[cj + i];
    x[cx + i] = nx;
    qx += nx * nx;
  }
  return qx;
}

/**
 * Updates the norm of column k below row j after step j; recomputes it (from the sum of squares
 * gathered in tails[k]) when cancellation has eaten its accuracy.
 */
function downdateNorm(a: Float64Array, m: number, ck: number, j: number, k: number, rDiagonal: Float64Array, scratch: Float64Array, tails: Float64Array): void {
  if (rDiagonal[k] === 0) return;
  const ratio = a[ck + j] / rDiagonal[k];
  rDiagonal[k] *= Math.sqrt(Math.max(0, 1 - ratio * ratio));
  const rel = rDiagonal[k] / scratch[k];
  if (0.05 * rel * rel <= MACHINE_EPSILON) {
    rDiagonal[k] = normFromSquares(tails[k], a, ck + j + 1, m - j - 1);
    scratch[k] = rDiagonal[k];
  }
}
