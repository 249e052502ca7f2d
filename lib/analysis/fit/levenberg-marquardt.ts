/**
 * Bound-constrained Levenberg–Marquardt minimizer of ½‖f(p)‖², a port of MINPACK's lmder
 * (Moré's scaled trust-region variant) with a projected active set for box bounds: a parameter
 * sitting on a bound whose gradient pushes it outward is held for that iteration, and trial
 * points are projected back into the box. Deterministic; all work arrays are allocated once.
 */
import { createQrWorkspace, euclideanNorm, normFromSquares, qrFactorize, type QrWorkspace } from "./qr-factorization";
import { createGramWorkspace, factorizeByNormalEquations, type GramWorkspace } from "./normal-equations";
import { computeTrustRegionStep, createStepWorkspace, type StepWorkspace } from "./trust-region-step";

const MACHINE_EPSILON = 2.220446049250313e-16;
/** The normal equations pay off once the residuals outnumber the parameters this many times. */
const NORMAL_EQUATIONS_ROWS_PER_PARAMETER = 4;

export interface LeastSquaresProblem {
  /** Number of residuals. */
  m: number;
  /** Number of parameters. */
  n: number;
  /** Writes the m residuals at p into out. */
  residuals(p: Float64Array, out: Float64Array): void;
  /** Writes the Jacobian ∂fᵢ/∂pⱼ at p into out, column-major (out[j*m + i]). */
  jacobian(p: Float64Array, out: Float64Array): void;
  /**
   * Optional: residuals and Jacobian in one pass. When present, every trial point gets its
   * Jacobian at once, so an accepted step needs no second model sweep.
   */
  residualsAndJacobian?(p: Float64Array, f: Float64Array, jacobian: Float64Array): void;
  /** Lower and upper bounds per parameter (±Infinity when unbounded). */
  lower: Float64Array;
  upper: Float64Array;
}

export interface SolverOptions {
  /** Maximum number of Jacobian evaluations (outer iterations). */
  maxIterations: number;
  /** Stop when both actual and predicted relative reductions of ‖f‖² are below this. */
  ftol: number;
  /** Stop when the trust region, relative to ‖D·p‖, is below this. */
  xtol: number;
  /** Stop when the cosine between f and every Jacobian column is below this. */
  gtol: number;
  /** Initial trust-region radius as a multiple of ‖D·p₀‖. */
  stepFactor: number;
}

export const DEFAULT_SOLVER_OPTIONS: SolverOptions = {
  maxIterations: 200,
  ftol: 1e-12,
  xtol: 1e-12,
  gtol: 1e-14,
  stepFactor: 1,
};

export interface SolverOutcome {
  params: Float64Array;
  /** Residuals f at params. */
  residuals: Float64Array;
  /** Jacobian at params when the solver still holds it intact, else undefined. */
  jacobian: Float64Array | undefined;
  /** Sum of squared residuals. */
  sumOfSquares: number;
  iterations: number;
  evaluations: number;
  converged: boolean;
  reason: string;
}

const REASONS: Record<number, string> = {
  0: "zero residuals",
  1: "relative reduction below tolerance",
  2: "step below tolerance",
  3: "relative reduction and step below tolerance",
  4: "gradient below tolerance",
  5: "max iterations",
  6: "relative reduction below machine precision",
  7: "step below machine precision",
  8: "gradient below machine precision",
  9: "model not finite at the start values",
};

/**
 * Spare m×n and m-length work arrays kept between fits of the same size, so a run of fits does
 * not allocate (and the collector does not sweep) a Jacobian per fit. Bounded in count and size.
 */
const spares: Float64Array[] = [];
const MAX_SPARES = 4;
const MAX_SPARE_LENGTH = 1 << 22;

/** A zeroed work array of this length, from the spares when one fits. */
function takeScratch(length: number): Float64Array {
  for (let i = spares.length - 1; i >= 0; i--) {
    if (spares[i].length === length) {
      const found = spares[i];
      spares.splice(i, 1);
      return found.fill(0);
    }
  }
  return new Float64Array(length);
}

/**
 * Hands a work array back once nothing reads it any more (the caller of minimizeLeastSquares may
 * do so with the outcome's Jacobian when it is done with it).
 */
export function releaseScratch(array: Float64Array | undefined): void {
  if (!array || array.length > MAX_SPARE_LENGTH || spares.includes(array)) return;
  if (spares.length >= MAX_SPARES) spares.shift();
  spares.push(array);
}

/** The solver's small per-parameter arrays, kept between fits with the same number of parameters. */
interface SolverWorkspace {
  n: number;
  qtf: Float64Array;
  diag: Float64Array;
  colNorm: Float64Array;
  colSquares: Float64Array;
  activeNorm: Float64Array;
  activeSquares: Float64Array;
  activeGradient: Float64Array;
  gradient: Float64Array;
  active: Int32Array;
  diagActive: Float64Array;
  stepActive: Float64Array;
  trial: Float64Array;
  work: Float64Array;
  qr: QrWorkspace;
  step: StepWorkspace;
  gram: GramWorkspace;
}

const spareWorkspaces = new Map<number, SolverWorkspace>();

/** A zeroed workspace for n parameters; taken out of the spares while in use, so a nested fit gets its own. */
function takeWorkspace(n: number): SolverWorkspace {
  const spare = spareWorkspaces.get(n);
  if (!spare) {
    const f = () => new Float64Array(n);
    return {
      n,
      qtf: f(),
      diag: f(),
      colNorm: f(),
      colSquares: f(),
      activeNorm: f(),
      activeSquares: f(),
      activeGradient: f(),
      gradient: f(),
      active: new Int32Array(n),
      diagActive: f(),
      stepActive: f(),
      trial: f(),
      work: f(),
      qr: createQrWorkspace(n),
      step: createStepWorkspace(n),
      gram: createGramWorkspace(n),
    };
  }
  spareWorkspaces.delete(n);
  const { n: _, ...arrays } = spare;
  for (const value of Object.values(arrays)) zeroAll(value);
  return spare;
}

function zeroAll(value: Float64Array | Int32Array | QrWorkspace | StepWorkspace | GramWorkspace): void {
  if (value instanceof Float64Array || value instanceof Int32Array) value.fill(0);
  else for (const array of Object.values(value) as Array<Float64Array | Int32Array>) array.fill(0);
}

function releaseWorkspace(ws: SolverWorkspace): void {
  if (spareWorkspaces.size >= 16) spareWorkspaces.clear();
  spareWorkspaces.set(ws.n, ws);
}

function project(v: number, lo: number, hi: number): number {
  return v < lo ? lo : v > hi ? hi : v;
}

export function minimizeLeastSquares(problem: LeastSquaresProblem, start: ArrayLike<number>, options: SolverOptions = DEFAULT_SOLVER_OPTIONS): SolverOutcome {
  const { m, n, lower, upper } = problem;
  const { ftol, xtol, gtol, maxIterations, stepFactor } = options;
  const maxEvaluations = 20 * maxIterations + 100;

  const x = new Float64Array(n);
  for (let j = 0; j < n; j++) x[j] = project(start[j], lower[j], upper[j]);
  const fvec = takeScratch(m);
  const trialF = takeScratch(m);
  let fjac = takeScratch(m * n);
  const combined = problem.residualsAndJacobian?.bind(problem);
  let trialJac = combined ? takeScratch(m * n) : fjac;
  // True while fjac holds the untouched Jacobian at x.
  let jacobianFresh = false;
  const ws = takeWorkspace(n);
  const {
    qtf,
    diag,
    colNorm,
    colSquares,
    activeNorm,
    activeSquares,
    activeGradient,
    gradient,
    active,
    diagActive,
    stepActive,
    trial,
    work,
    qr,
    step: stepWs,
    gram: gramWs,
  } = ws;

  if (combined) combined(x, fvec, fjac);
  else problem.residuals(x, fvec);
  jacobianFresh = Boolean(combined);
  let evaluations = 1;
  let fnorm = euclideanNorm(fvec, 0, m);
  const finish = (code: number, iterations: number): SolverOutcome => {
    releaseWorkspace(ws);
    releaseScratch(trialF);
    if (trialJac !== fjac) releaseScratch(trialJac);
    if (!jacobianFresh) releaseScratch(fjac);
    return {
      params: x,
      residuals: fvec,
      jacobian: jacobianFresh ? fjac : undefined,
      sumOfSquares: fnorm * fnorm,
      iterations,
      evaluations,
      converged: code !== 5 && code !== 9,
      reason: REASONS[code],
    };
  };
  if (!Number.isFinite(fnorm)) return finish(9, 0);

  let par = 0;
  let delta = 0;
  let xnorm = 0;
  let iterations = 0;
  let firstIteration = true;

  for (;;) {
    if (fnorm === 0) return finish(0, iterations);
    if (iterations >= maxIterations) return finish(5, iterations);
    if (!jacobianFresh) problem.jacobian(x, fjac);
    jacobianFresh = false;
    iterations++;

    let nAct = 0;
    for (let j = 0; j < n; j++) {
      const cj = j * m;
      // Jᵀf and the column norm in one sweep of the column.
      let g = 0;
      let squares = 0;
      for (let i = 0; i < m; i++) {
        const v = fjac[cj + i];
        g += v * fvec[i];
        squares += v * v;
      }
      gradient[j] = g;
      colSquares[j] = squares;
      colNorm[j] = normFromSquares(squares, fjac, cj, m);
      const blocked = (x[j] <= lower[j] && g > 0) || (x[j] >= upper[j] && g < 0);
      if (!blocked) active[nAct++] = j;
    }
    if (firstIteration) {
      for (let j = 0; j < n; j++) diag[j] = colNorm[j] === 0 ? 1 : colNorm[j];
      for (let j = 0; j < n; j++) work[j] = diag[j] * x[j];
      xnorm = euclideanNorm(work, 0, n);
      delta = stepFactor * xnorm;
      if (delta === 0) delta = stepFactor;
    }
    if (nAct === 0) return finish(8, iterations);
    if (nAct < n) {
      for (let k = 0; k < nAct; k++) {
        const src = active[k] * m;
        if (src !== k * m) fjac.copyWithin(k * m, src, src + m);
      }
    }
    for (let k = 0; k < nAct; k++) {
      activeNorm[k] = colNorm[active[k]];
      activeSquares[k] = colSquares[active[k]];
      activeGradient[k] = gradient[active[k]];
    }
    // A long, well-conditioned Jacobian is factorized through its normal equations (a few dot
    // products); otherwise by Householder QR, with Qᵀf formed in trialF during the factorization.
    if (m >= NORMAL_EQUATIONS_ROWS_PER_PARAMETER * nAct && factorizeByNormalEquations(fjac, m, nAct, activeSquares, activeGradient, qr, gramWs, qtf)) {
      for (let j = 0; j < nAct; j++) fjac[j * m + j] = qr.rDiagonal[j];
    } else {
      trialF.set(fvec);
      qrFactorize(fjac, m, nAct, m, qr, activeNorm, trialF);
      for (let j = 0; j < nAct; j++) {
        fjac[j * m + j] = qr.rDiagonal[j];
        qtf[j] = trialF[j];
      }
    }

    let gnorm = 0;
    for (let j = 0; j < nAct; j++) {
      const norm = colNorm[active[qr.permutation[j]]];
      if (norm === 0) continue;
      let sum = 0;
      for (let i = 0; i <= j; i++) sum += fjac[j * m + i] * (qtf[i] / fnorm);
      gnorm = Math.max(gnorm, Math.abs(sum / norm));
    }
    if (gnorm <= gtol) return finish(4, iterations);

    for (let j = 0; j < n; j++) diag[j] = Math.max(diag[j], colNorm[j]);
    for (let k = 0; k < nAct; k++) diagActive[k] = diag[active[k]];

    for (;;) {
      par = computeTrustRegionStep(nAct, fjac, m, qr.permutation, diagActive, qtf, delta, par, stepActive, stepWs);
      trial.set(x);
      let clamped = false;
      for (let k = 0; k < nAct; k++) {
        const j = active[k];
        const wanted = x[j] - stepActive[k];
        const v = project(wanted, lower[j], upper[j]);
        if (v !== wanted) clamped = true;
        trial[j] = v;
        stepActive[k] = v - x[j];
      }
      for (let j = 0; j < n; j++) work[j] = diag[j] * (trial[j] - x[j]);
      const pnorm = euclideanNorm(work, 0, n);
      if (firstIteration) delta = Math.min(delta, pnorm);

      if (combined) combined(trial, trialF, trialJac);
      else problem.residuals(trial, trialF);
      evaluations++;
      const fnorm1 = euclideanNorm(trialF, 0, m);
      const finite = Number.isFinite(fnorm1);
      const actred = finite && 0.1 * fnorm1 < fnorm ? 1 - (fnorm1 / fnorm) ** 2 : -1;

      // ‖J·s‖ from the triangular factor: J·s = Q·R·Pᵀ·s.
      for (let j = 0; j < nAct; j++) {
        work[j] = 0;
        const t = stepActive[qr.permutation[j]];
        for (let i = 0; i <= j; i++) work[i] += fjac[j * m + i] * t;
      }
      const temp1 = euclideanNorm(work, 0, nAct) / fnorm;
      let prered: number;
      let dirder: number;
      if (!clamped) {
        const temp2 = (Math.sqrt(par) * pnorm) / fnorm;
        prered = temp1 * temp1 + 2 * temp2 * temp2;
        dirder = -(temp1 * temp1 + temp2 * temp2);
      } else {
        let gs = 0;
        for (let k = 0; k < nAct; k++) gs += gradient[active[k]] * stepActive[k];
        gs /= fnorm * fnorm;
        prered = -(2 * gs + temp1 * temp1);
        dirder = gs;
      }
      const ratio = prered > 0 && finite ? actred / prered : 0;

      if (ratio <= 0.25) {
        let temp = actred >= 0 ? 0.5 : (0.5 * dirder) / (dirder + 0.5 * actred);
        if (!finite || 0.1 * fnorm1 >= fnorm || temp < 0.1 || !Number.isFinite(temp)) temp = 0.1;
        delta = temp * Math.min(delta, pnorm / 0.1);
        par /= temp;
      } else if (par === 0 || ratio >= 0.75) {
        delta = pnorm / 0.5;
        par *= 0.5;
      }

      if (ratio >= 1e-4) {
        x.set(trial);
        fvec.set(trialF);
        if (combined) {
          const previous = fjac;
          fjac = trialJac;
          trialJac = previous;
          jacobianFresh = true;
        }
        for (let j = 0; j < n; j++) work[j] = diag[j] * x[j];
        xnorm = euclideanNorm(work, 0, n);
        fnorm = fnorm1;
        firstIteration = false;
      }

      const smallReduction = Math.abs(actred) <= ftol && prered <= ftol && 0.5 * ratio <= 1;
      const smallStep = delta <= xtol * xnorm;
      if (smallReduction && smallStep) return finish(3, iterations);
      if (smallReduction) return finish(1, iterations);
      if (smallStep) return finish(2, iterations);
      if (evaluations >= maxEvaluations) return finish(5, iterations);
      if (Math.abs(actred) <= MACHINE_EPSILON && prered <= MACHINE_EPSILON && 0.5 * ratio <= 1) {
        return finish(6, iterations);
      }
      if (delta <= MACHINE_EPSILON * xnorm) return finish(7, iterations);
      if (gnorm <= MACHINE_EPSILON) return finish(8, iterations);
      if (ratio >= 1e-4) break;
    }
  }
}
