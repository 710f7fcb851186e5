/**
 * Symmetric eigendecomposition and functions of symmetric matrices (square root, log-det
 * of semi-definite matrices), over ml-matrix's Householder tridiagonalisation + QL.
 *
 * @module
 */
import { EigenvalueDecomposition, Matrix } from "ml-matrix";
import { SaddleError } from "../errors/saddle_error.ts";

/** Eigenvalues (ascending) and eigenvectors (column `k` of the row-major `vectors`). */
export interface SymmetricEigen {
  /** Eigenvalues in ascending order. */
  readonly values: Float64Array;
  /** Row-major `d x d`; column `k` is the unit eigenvector of `values[k]`. */
  readonly vectors: Float64Array;
}

/**
 * Eigendecomposition of a symmetric `d x d` matrix (the lower triangle is mirrored first,
 * so tiny asymmetries from rounding do not matter).
 *
 * @example
 * ```ts
 * import { symmetricEigen } from "./eigen.ts";
 * import assert from "node:assert/strict";
 * const { values } = symmetricEigen(new Float64Array([2, 1, 1, 2]), 2);
 * assert.ok(Math.abs(values[0] - 1) < 1e-14 && Math.abs(values[1] - 3) < 1e-14);
 * ```
 */
export function symmetricEigen(a: ArrayLike<number>, d: number): SymmetricEigen {
  if (a.length !== d * d) {
    throw new SaddleError("dimension-mismatch", `expected ${d * d} entries, got ${a.length}`, {
      parameter: "matrix",
    });
  }
  const rows: number[][] = [];
  for (let i = 0; i < d; i++) {
    const r = new Array<number>(d);
    for (let j = 0; j < d; j++) r[j] = i >= j ? a[i * d + j] : a[j * d + i];
    rows.push(r);
  }
  for (const r of rows) {
    for (const v of r) {
      if (!Number.isFinite(v)) {
        throw new SaddleError("non-finite", "matrix has a non-finite entry", {
          parameter: "matrix",
        });
      }
    }
  }
  const evd = new EigenvalueDecomposition(new Matrix(rows), { assumeSymmetric: true });
  const raw = evd.realEigenvalues;
  const V = evd.eigenvectorMatrix;
  const order = raw.map((_, i) => i).sort((i, j) => raw[i] - raw[j]);
  const values = new Float64Array(d);
  const vectors = new Float64Array(d * d);
  for (let k = 0; k < d; k++) {
    values[k] = raw[order[k]];
    for (let i = 0; i < d; i++) vectors[i * d + k] = V.get(i, order[k]);
  }
  return { values, vectors };
}

/**
 * The symmetric positive semi-definite square root `S` with `S S = A`. Eigenvalues that are
 * negative by rounding only (above `-tolerance * λ_max`) are set to 0, as are those within
 * rounding of 0 (`|λ| <= 4 d ε λ_max`); clearly negative ones throw, since `A` is then not a
 * covariance.
 *
 * @example
 * ```ts
 * import { sqrtSymmetric } from "./eigen.ts";
 * import assert from "node:assert/strict";
 * const s = sqrtSymmetric(new Float64Array([4, 0, 0, 9]), 2);
 * assert.ok(Math.abs(s[0] - 2) < 1e-14 && Math.abs(s[3] - 3) < 1e-14);
 * ```
 */
export function sqrtSymmetric(a: ArrayLike<number>, d: number, tolerance = 1e-10): Float64Array {
  const { values, vectors } = symmetricEigen(a, d);
  const top = Math.max(Math.abs(values[d - 1]), Math.abs(values[0]));
  const root = new Float64Array(d);
  for (let k = 0; k < d; k++) {
    if (values[k] < -tolerance * top) {
      throw new SaddleError(
        "singular",
        `matrix has eigenvalue ${values[k]} < 0: not positive semi-definite`,
        { parameter: "matrix" },
      );
    }
    // Eigenvalues within rounding of 0 (|λ| <= 4 d ε λ_max) are 0: their square root
    // (~1e-8 λ_max^½) would otherwise be pure rounding noise.
    root[k] = Math.abs(values[k]) <= 4 * d * Number.EPSILON * top
      ? 0
      : Math.sqrt(Math.max(values[k], 0));
  }
  const out = new Float64Array(d * d);
  for (let i = 0; i < d; i++) {
    for (let j = i; j < d; j++) {
      let s = 0;
      for (let k = 0; k < d; k++) s += vectors[i * d + k] * root[k] * vectors[j * d + k];
      out[i * d + j] = s;
      out[j * d + i] = s;
    }
  }
  return out;
}
