/**
 * Polynomials y = Σ cₖ·xᵏ in the data's own units (cₖ in y/xᵏ). Their start values are the
 * exact linear least-squares solution, computed on centred and scaled x for conditioning.
 */
import { mean, xScale } from "./guess/signal-features";
import type { FitModel, UnitRole } from "./types";

const UNITS: UnitRole[] = ["y", "y/x", "y/x^2", "y/x^3"];
const NAMES = ["c0", "c1", "c2", "c3"];
const POWERS = ["", "·x", "·x²", "·x³"];

/** Solves the small dense system a·s = b (row-major) by elimination with partial pivoting. */
function solveSmall(a: number[][], b: number[]): number[] | undefined {
  const n = b.length;
  const m = a.map((row, i) => [...row, b[i]]);
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(m[r][col]) > Math.abs(m[pivot][col])) pivot = r;
    if (m[pivot][col] === 0) return undefined;
    [m[col], m[pivot]] = [m[pivot], m[col]];
    for (let r = col + 1; r < n; r++) {
      const factor = m[r][col] / m[col][col];
      for (let c = col; c <= n; c++) m[r][c] -= factor * m[col][c];
    }
  }
  const s = new Array<number>(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let sum = m[r][n];
    for (let c = r + 1; c < n; c++) sum -= m[r][c] * s[c];
    s[r] = sum / m[r][r];
  }
  return s;
}

function binomial(n: number, k: number): number {
  let value = 1;
  for (let i = 1; i <= k; i++) value = (value * (n - k + i)) / i;
  return value;
}

/** Least-squares coefficients of x⁰ … x^degree. */
function polynomialLeastSquares(x: ArrayLike<number>, y: ArrayLike<number>, degree: number): number[] {
  const { min, max } = xScale(x);
  const centre = (min + max) / 2;
  const half = (max - min) / 2 || 1;
  const size = degree + 1;
  const normal = Array.from({ length: size }, () => new Array<number>(size).fill(0));
  const rhs = new Array<number>(size).fill(0);
  const powers = new Array<number>(2 * size).fill(0);
  for (let i = 0; i < x.length; i++) {
    const u = (x[i] - centre) / half;
    let p = 1;
    for (let k = 0; k < 2 * size - 1; k++) {
      powers[k] += p;
      if (k < size) rhs[k] += p * y[i];
      p *= u;
    }
  }
  for (let r = 0; r < size; r++) for (let c = 0; c < size; c++) normal[r][c] = powers[r + c];
  const a = solveSmall(normal, rhs) ?? [mean(y), ...new Array<number>(degree).fill(0)];
  const coefficients = new Array<number>(size).fill(0);
  for (let k = 0; k < size; k++) {
    for (let j = 0; j <= k; j++) {
      coefficients[j] += a[k] * binomial(k, j) * half ** -j * (-centre / half) ** (k - j);
    }
  }
  return coefficients;
}

function polynomialModel(id: string, title: string, degree: number): FitModel {
  const size = degree + 1;
  const valueAndJacobian = (x: number, p: ArrayLike<number>, out: Float64Array): number => {
    let power = 1;
    let value = 0;
    for (let k = 0; k < size; k++) {
      out[k] = power;
      value += p[k] * power;
      power *= x;
    }
    return value;
  };
  return {
    id,
    title,
    formula: `y = ${NAMES.slice(0, size)
      .map((name, k) => name + POWERS[k])
      .join(" + ")}`,
    version: "1.0.0",
    kinds: ["other", "pl_spectrum"],
    params: NAMES.slice(0, size).map((name, k) => ({
      name,
      unit: UNITS[k],
      description: k === 0 ? "value at x = 0" : `coefficient of x${k === 1 ? "" : k === 2 ? "²" : "³"}`,
    })),
    evaluate(x, p) {
      let value = p[degree];
      for (let k = degree - 1; k >= 0; k--) value = value * x + p[k];
      return value;
    },
    jacobian: valueAndJacobian,
    valueAndJacobian,
    guess: (x, y) => polynomialLeastSquares(x, y, degree),
  };
}

export const lineModel = polynomialModel("line", "Straight line", 1);
export const polynomial2Model = polynomialModel("polynomial_2", "Quadratic polynomial", 2);
export const polynomial3Model = polynomialModel("polynomial_3", "Cubic polynomial", 3);
