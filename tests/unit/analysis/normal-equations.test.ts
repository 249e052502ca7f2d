// The normal-equations factorization must give the step the same R and Qᵀf as Householder QR
// (up to the signs of R's rows), and must refuse a Jacobian too ill-conditioned for JᵀJ.
import { describe, expect, it } from "vitest";
import { createGramWorkspace, factorizeByNormalEquations } from "@/lib/analysis/fit/normal-equations";
import { createQrWorkspace, qrFactorize } from "@/lib/analysis/fit/qr-factorization";

/** Column-major m×n from rows written by hand. */
function columnMajor(rows: number[][]): Float64Array {
  const m = rows.length;
  const n = rows[0].length;
  const a = new Float64Array(m * n);
  for (let i = 0; i < m; i++) for (let j = 0; j < n; j++) a[j * m + i] = rows[i][j];
  return a;
}

function squaresAndDots(a: Float64Array, m: number, n: number, f: number[]) {
  const squares = new Float64Array(n);
  const dots = new Float64Array(n);
  for (let j = 0; j < n; j++)
    for (let i = 0; i < m; i++) {
      squares[j] += a[j * m + i] ** 2;
      dots[j] += a[j * m + i] * f[i];
    }
  return { squares, dots };
}

const ROWS = [
  [1, 0.5, 3],
  [1, 0.25, -1],
  [1, 0.125, 2],
  [1, 2, 0.5],
  [1, -1, 1.5],
  [1, 0.75, -2],
  [1, 1.5, 0.25],
  [1, -0.5, 1],
];
const F = [0.3, -0.2, 0.1, 0.4, -0.5, 0.05, 0.2, -0.1];

describe("factorizing the Jacobian through its normal equations", () => {
  it("gives Householder QR's pivots, |R| and |Qᵀf| on a well-conditioned Jacobian", () => {
    const m = ROWS.length;
    const n = 3;
    const viaGram = columnMajor(ROWS);
    const { squares, dots } = squaresAndDots(viaGram, m, n, F);
    const gramQr = createQrWorkspace(n);
    const qtfGram = new Float64Array(n);
    expect(factorizeByNormalEquations(viaGram, m, n, squares, dots, gramQr, createGramWorkspace(n), qtfGram)).toBe(true);

    const viaQr = columnMajor(ROWS);
    const householder = createQrWorkspace(n);
    const rhs = Float64Array.from(F);
    qrFactorize(viaQr, m, n, m, householder, undefined, rhs);

    expect(Array.from(gramQr.permutation)).toEqual(Array.from(householder.permutation));
    for (let j = 0; j < n; j++) {
      expect(Math.abs(gramQr.rDiagonal[j])).toBeCloseTo(Math.abs(householder.rDiagonal[j]), 12);
      // Row j of R and Qᵀf flip sign together between the two factorizations.
      const sign = Math.sign(gramQr.rDiagonal[j]) * Math.sign(householder.rDiagonal[j]);
      expect(qtfGram[j]).toBeCloseTo(sign * rhs[j], 12);
      for (let k = j + 1; k < n; k++) expect(viaGram[k * m + j]).toBeCloseTo(sign * viaQr[k * m + j], 12);
    }
  });

  it("refuses two nearly parallel columns (cond(J) ≈ 1e7) and leaves the Jacobian as it was", () => {
    const rows = ROWS.map(([a, b]) => [a, b, b + 1e-7 * a]);
    const m = rows.length;
    const a = columnMajor(rows);
    const before = Float64Array.from(a);
    const { squares, dots } = squaresAndDots(a, m, 3, F);
    expect(factorizeByNormalEquations(a, m, 3, squares, dots, createQrWorkspace(3), createGramWorkspace(3), new Float64Array(3))).toBe(false);
    expect(Array.from(a)).toEqual(Array.from(before));
  });
});
