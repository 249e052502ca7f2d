/**
 * The factorization the Levenberg–Marquardt step needs — R with J·P = Q·R and Qᵀf — from the
 * normal equations: the Gram matrix JᵀJ and Jᵀf are dot products over the m residuals, then a
 * pivoted Cholesky factorization JᵀJ = P·RᵀR·Pᵀ of the small n×n matrix and Qᵀf = R⁻ᵀ·Pᵀ·Jᵀf.
 * For m ≫ n this reads the Jacobian in n(n+1)/2 light passes instead of the Householder
 * sweeps that rewrite it, which is most of a fit's time on a long curve.
 *
 * Forming JᵀJ squares the condition number, so it is used only when the factor shows J to be
 * well conditioned (smallest to largest pivot of R above WELL_CONDITIONED, i.e. cond(J) below
 * about 1e5, so cond(JᵀJ) below about 1e10 and the step keeps six or more correct digits);
 * otherwise the caller factorizes J by Householder QR as before. Symmetric pivoting picks the
 * largest remaining diagonal, which is the column QR pivoting would pick (the largest remaining
 * column norm). The step only steers the iteration: where it stops is set by the residuals and
 * the tolerances, not by how the step was solved.
 */
import type { QrWorkspace } from "./qr-factorization";

/** Smallest |R_jj| / largest |R_jj| accepted (common practice for normal equations in double precision). */
const WELL_CONDITIONED = 1e-5;

export interface GramWorkspace {
  /** n×n row-major Gram matrix, overwritten by the factorization. */
  gram: Float64Array;
  jtf: Float64Array;
}

export function createGramWorkspace(n: number): GramWorkspace {
  return { gram: new Float64Array(n * n), jtf: new Float64Array(n) };
}

/**
 * Tries to factorize the m×n column-major matrix `a` (leading dimension m) through its normal
 * equations. `squares[j]` and `dots[j]` must hold ‖a_j‖² and a_jᵀf (the caller has them from its
 * gradient pass). On success writes R's strict upper triangle into a (a[j·m + i], i < j, pivoted
 * column order), its diagonal into ws.rDiagonal, the permutation into ws.permutation and Qᵀf into
 * qtf, and returns true; returns false, leaving `a` untouched, when J is not well conditioned.
 */
export function factorizeByNormalEquations(
  a: Float64Array,
  m: number,
  n: number,
  squares: ArrayLike<number>,
  dots: ArrayLike<number>,
  ws: QrWorkspace,
  gws: GramWorkspace,
  qtf: Float64Array,
): boolean {
  const { gram, jtf } = gws;
  const { permutation, rDiagonal } = ws;
  for (let j = 0; j < n; j++) {
    gram[j * n + j] = squares[j];
    jtf[j] = dots[j];
    permutation[j] = j;
    const cj = j * m;
    for (let k = j + 1; k < n; k++) {
      const ck = k * m;
      let sum = 0;
      for (let i = 0; i < m; i++) sum += a[cj + i] * a[ck + i];
      gram[j * n + k] = sum;
      gram[k * n + j] = sum;
    }
  }
  // Pivoted Cholesky, right-looking, on the symmetric gram (full storage, permuted in place).
  let largest = 0;
  for (let j = 0; j < n; j++) {
    let p = j;
    for (let k = j + 1; k < n; k++) if (gram[k * n + k] > gram[p * n + p]) p = k;
    if (p !== j) {
      for (let i = 0; i < n; i++) swap(gram, i * n + j, i * n + p);
      for (let i = 0; i < n; i++) swap(gram, j * n + i, p * n + i);
      const t = permutation[j];
      permutation[j] = permutation[p];
      permutation[p] = t;
    }
    const pivot = gram[j * n + j];
    if (!(pivot > 0) || !Number.isFinite(pivot)) return false;
    const r = Math.sqrt(pivot);
    if (j === 0) largest = r;
    else if (r < WELL_CONDITIONED * largest) return false;
    rDiagonal[j] = r;
    for (let k = j + 1; k < n; k++) gram[j * n + k] /= r;
    for (let k = j + 1; k < n; k++) {
      const rjk = gram[j * n + k];
      for (let l = k; l < n; l++) gram[k * n + l] -= rjk * gram[j * n + l];
      for (let l = k; l < n; l++) gram[l * n + k] = gram[k * n + l];
    }
  }
  // Qᵀf = R⁻ᵀ·Pᵀ·Jᵀf by forward substitution (R upper: row j of gram holds R_j·, j < k).
  for (let j = 0; j < n; j++) {
    let sum = jtf[permutation[j]];
    for (let i = 0; i < j; i++) sum -= gram[i * n + j] * qtf[i];
    qtf[j] = sum / rDiagonal[j];
  }
  for (let j = 0; j < n; j++) for (let i = 0; i < j; i++) a[j * m + i] = gram[i * n + j];
  return true;
}

function swap(v: Float64Array, i: number, j: number): void {
  const t = v[i];
  v[i] = v[j];
  v[j] = t;
}
