/**
 * The Levenberg–Marquardt step inside a scaled trust region, after MINPACK's lmpar and
 * qrsolv (Moré 1978, "The Levenberg–Marquardt algorithm: implementation and theory").
 *
 * Given the pivoted QR factorization J·P = Q·R, a scaling D and Qᵀf, finds λ ≥ 0 and
 * x solving (JᵀJ + λDᵀD)·x = −Jᵀf (returned with the opposite sign, as in MINPACK) such that
 * ‖D·x‖ ≈ Δ, or the Gauss–Newton step when it already fits in the region.
 */
import { euclideanNorm } from "./qr-factorization";

const DWARF = 2.2250738585072014e-308;

export interface StepWorkspace {
  sdiag: Float64Array;
  wa1: Float64Array;
  wa2: Float64Array;
  wa3: Float64Array;
}

export function createStepWorkspace(n: number): StepWorkspace {
  return {
    sdiag: new Float64Array(n),
    wa1: new Float64Array(n),
    wa2: new Float64Array(n),
    wa3: new Float64Array(n),
  };
}

/**
 * Solves the damped least-squares system for one λ by Givens-eliminating √λ·D against R.
 * `r` (column-major, leading dimension ldr) holds R in its upper triangle; its strict lower
 * triangle is overwritten. Result in x; sdiag gets the diagonal of the combined triangle.
 */
function solveDamped(
  n: number,
  r: Float64Array,
  ldr: number,
  perm: Int32Array,
  diag: Float64Array,
  qtb: Float64Array,
  x: Float64Array,
  sdiag: Float64Array,
  wa: Float64Array,
): void {
  for (let j = 0; j < n; j++) {
    for (let i = j; i < n; i++) r[j * ldr + i] = r[i * ldr + j];
    x[j] = r[j * ldr + j];
    wa[j] = qtb[j];
  }
  for (let j = 0; j < n; j++) {
    const dl = diag[perm[j]];
    if (dl !== 0) {
      for (let k = j; k < n; k++) sdiag[k] = 0;
      sdiag[j] = dl;
      let qtbpj = 0;
      for (let k = j; k < n; k++) {
        if (sdiag[k] === 0) continue;
        const ck = k * ldr;
        const rkk = r[ck + k];
        let sin: number;
        let cos: number;
        if (Math.abs(rkk) < Math.abs(sdiag[k])) {
          const cotan = rkk / sdiag[k];
          sin = 0.5 / Math.sqrt(0.25 + 0.25 * cotan * cotan);
          cos = sin * cotan;
        } else {
          const tan = sdiag[k] / rkk;
          cos = 0.5 / Math.sqrt(0.25 + 0.25 * tan * tan);
          sin = cos * tan;
        }
        r[ck + k] = cos * rkk + sin * sdiag[k];
        const t = cos * wa[k] + sin * qtbpj;
        qtbpj = -sin * wa[k] + cos * qtbpj;
        wa[k] = t;
        for (let i = k + 1; i < n; i++) {
          const ri = r[ck + i];
          r[ck + i] = cos * ri + sin * sdiag[i];
          sdiag[i] = -sin * ri + cos * sdiag[i];
        }
      }
    }
    sdiag[j] = r[j * ldr + j];
    r[j * ldr + j] = x[j];
  }
  let nsing = n;
  for (let j = 0; j < n; j++) {
    if (sdiag[j] === 0 && nsing === n) nsing = j;
    if (nsing < n) wa[j] = 0;
  }
  for (let j = nsing - 1; j >= 0; j--) {
    let sum = 0;
    for (let i = j + 1; i < nsing; i++) sum += r[j * ldr + i] * wa[i];
    wa[j] = (wa[j] - sum) / sdiag[j];
  }
  for (let j = 0; j < n; j++) x[perm[j]] = wa[j];
}

/**
 * Computes the LM parameter λ for trust-region radius `delta` and the step (negated) in x.
 * `r` holds R in its upper triangle with diagonal already restored; `par` is the previous λ.
 * Returns the new λ.
 */
export function computeTrustRegionStep(
  n: number,
  r: Float64Array,
  ldr: number,
  perm: Int32Array,
  diag: Float64Array,
  qtb: Float64Array,
  delta: number,
  parIn: number,
  x: Float64Array,
  ws: StepWorkspace,
): number {
  const { sdiag, wa1, wa2, wa3 } = ws;
  let nsing = n;
  for (let j = 0; j < n; j++) {
    wa1[j] = qtb[j];
    if (r[j * ldr + j] === 0 && nsing === n) nsing = j;
    if (nsing < n) wa1[j] = 0;
  }
  for (let j = nsing - 1; j >= 0; j--) {
    wa1[j] /= r[j * ldr + j];
    const t = wa1[j];
    for (let i = 0; i < j; i++) wa1[i] -= r[j * ldr + i] * t;
  }
  for (let j = 0; j < n; j++) x[perm[j]] = wa1[j];

  for (let j = 0; j < n; j++) wa2[j] = diag[j] * x[j];
  let dxnorm = euclideanNorm(wa2, 0, n);
  let fp = dxnorm - delta;
  if (fp <= 0.1 * delta) return 0;

  let parl = 0;
  if (nsing >= n) {
    for (let j = 0; j < n; j++) {
      const l = perm[j];
      wa1[j] = diag[l] * (wa2[l] / dxnorm);
    }
    for (let j = 0; j < n; j++) {
      let sum = 0;
      for (let i = 0; i < j; i++) sum += r[j * ldr + i] * wa1[i];
      wa1[j] = (wa1[j] - sum) / r[j * ldr + j];
    }
    const t = euclideanNorm(wa1, 0, n);
    parl = fp / delta / t / t;
  }
  for (let j = 0; j < n; j++) {
    let sum = 0;
    for (let i = 0; i <= j; i++) sum += r[j * ldr + i] * qtb[i];
    wa1[j] = sum / diag[perm[j]];
  }
  const gnorm = euclideanNorm(wa1, 0, n);
  let paru = gnorm / delta;
  if (paru === 0) paru = DWARF / Math.min(delta, 0.1);

  let par = Math.min(Math.max(parIn, parl), paru);
  if (par === 0) par = gnorm / dxnorm;

  for (let iter = 1; ; iter++) {
    if (par === 0) par = Math.max(DWARF, 0.001 * paru);
    const sq = Math.sqrt(par);
    for (let j = 0; j < n; j++) wa1[j] = sq * diag[j];
    solveDamped(n, r, ldr, perm, wa1, qtb, x, sdiag, wa3);
    for (let j = 0; j < n; j++) wa2[j] = diag[j] * x[j];
    dxnorm = euclideanNorm(wa2, 0, n);
    const previous = fp;
    fp = dxnorm - delta;
    if (Math.abs(fp) <= 0.1 * delta || (parl === 0 && fp <= previous && previous < 0) || iter === 10) {
      return par;
    }
    for (let j = 0; j < n; j++) {
      const l = perm[j];
      wa1[j] = diag[l] * (wa2[l] / dxnorm);
    }
    for (let j = 0; j < n; j++) {
      wa1[j] /= sdiag[j];
      const t = wa1[j];
      for (let i = j + 1; i < n; i++) wa1[i] -= r[j * ldr + i] * t;
    }
    const t = euclideanNorm(wa1, 0, n);
    const parc = fp / delta / t / t;
    if (fp > 0) parl = Math.max(parl, par);
    if (fp < 0) paru = Math.min(paru, par);
    par = Math.max(parl, par + parc);
  }
}
