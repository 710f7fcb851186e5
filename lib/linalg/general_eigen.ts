/**
 * Eigenvalues of a general (non-symmetric) real square matrix, as complex pairs.
 *
 * @module
 */
import { EigenvalueDecomposition, Matrix } from "ml-matrix";
import { SaddleError } from "../errors/saddle_error.ts";

/** A complex number `re + i im`. */
export interface Complex {
  /** Real part. */
  readonly re: number;
  /** Imaginary part. */
  readonly im: number;
}

/**
 * The eigenvalues of a real `d x d` matrix (row-major), as `{ re, im }` pairs sorted by
 * real part, then imaginary part (Hessenberg reduction + shifted QR, through ml-matrix).
 * Complex eigenvalues come in conjugate pairs.
 *
 * References: Golub & Van Loan 2013, Matrix Computations, Sec. 7.5 (the Francis QR step).
 *
 * @example A rotation has eigenvalues ±i
 * ```ts
 * import { eigenvalues } from "./general_eigen.ts";
 * import assert from "node:assert/strict";
 * const ev = eigenvalues(new Float64Array([0, 1, -1, 0]), 2);
 * assert.deepEqual(ev.map((e) => [e.re, Math.abs(e.im)]), [[0, 1], [0, 1]]);
 * ```
 */
export function eigenvalues(a: ArrayLike<number>, d: number): Complex[] {
  if (!Number.isInteger(d) || d < 1 || a.length !== d * d) {
    throw new SaddleError(
      "dimension-mismatch",
      `expected a ${d} x ${d} matrix (${d * d} entries), got ${a.length}`,
      { parameter: "matrix" },
    );
  }
  const rows: number[][] = [];
  for (let i = 0; i < d; i++) {
    const r = Array.from({ length: d }, (_, j) => a[i * d + j]);
    if (!r.every(Number.isFinite)) {
      throw new SaddleError("non-finite", `matrix row ${i} has a non-finite entry`, {
        parameter: "matrix",
        row: i,
      });
    }
    rows.push(r);
  }
  const evd = new EigenvalueDecomposition(new Matrix(rows));
  const re = evd.realEigenvalues, im = evd.imaginaryEigenvalues;
  return re.map((r, i) => ({ re: r, im: im[i] }))
    .sort((x, y) => x.re - y.re || x.im - y.im);
}
