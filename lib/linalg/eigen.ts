/**
 * Symmetric eigendecomposition and functions of symmetric matrices: the positive
 * semi-definite square root and the trace of the square root of a product (Fréchet
 * distance). Runs on the backend of {@linkcode linalgBackend}: LAPACK's `dsyevd`, or
 * Householder tridiagonalisation + implicit QL in TypeScript.
 *
 * @module
 */
import {
  activeLinalg,
  type SymmetricEigen,
  type SymmetricEigenOptions,
  type SymmetricEigenValues,
  type TraceSqrtProductOptions,
} from "./backend.ts";

export type {
  SymmetricEigen,
  SymmetricEigenOptions,
  SymmetricEigenValues,
  TraceSqrtProductOptions,
} from "./backend.ts";

/**
 * Eigendecomposition of a symmetric `d x d` matrix: values ascending and, unless
 * `vectors: false` (faster), the unit eigenvectors as the columns of a row-major matrix.
 * Only the lower triangle is read (it is mirrored), so rounding asymmetries do not
 * matter. A non-finite entry is a `non-finite` SaddleError.
 *
 * @example
 * ```ts
 * import { symmetricEigen } from "./eigen.ts";
 * import assert from "node:assert/strict";
 * const { values, vectors } = symmetricEigen(new Float64Array([2, 1, 1, 2]), 2);
 * assert.ok(Math.abs(values[0] - 1) < 1e-14 && Math.abs(values[1] - 3) < 1e-14);
 * assert.ok(Math.abs(Math.abs(vectors[0]) - Math.SQRT1_2) < 1e-14);
 * const only = symmetricEigen(new Float64Array([2, 1, 1, 2]), 2, { vectors: false });
 * assert.ok(Math.abs(only.values[1] - 3) < 1e-14);
 * ```
 */
export function symmetricEigen(
  a: ArrayLike<number>,
  d: number,
  options?: { vectors?: true },
): SymmetricEigen;
/** Eigenvalues only (ascending). */
export function symmetricEigen(
  a: ArrayLike<number>,
  d: number,
  options: { vectors: false },
): SymmetricEigenValues;
/** Values, and vectors unless `options.vectors` is false. */
export function symmetricEigen(
  a: ArrayLike<number>,
  d: number,
  options?: SymmetricEigenOptions,
): SymmetricEigen | SymmetricEigenValues;
export function symmetricEigen(
  a: ArrayLike<number>,
  d: number,
  options: SymmetricEigenOptions = {},
): SymmetricEigen | SymmetricEigenValues {
  return activeLinalg().symmetricEigen(a, d, options);
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
  return activeLinalg().sqrtSymmetric(a, d, tolerance);
}

/**
 * `tr((A^½ B A^½)^½)` for symmetric positive semi-definite `A` and `B` (the cross term of
 * the Fréchet distance between Gaussians). Computed from symmetric factorisations only:
 * `A = V Λ Vᵀ`, then the eigenvalues of the symmetric `Λ^½ Vᵀ B V Λ^½`, which are those of
 * `A^½ B A^½`. Singular `A` or `B` is fine (their zero eigenvalues contribute 0).
 * Eigenvalues above `-tolerance · scale` (default tolerance 1e-10; scale `λ_max(A)` for `A`
 * and `λ_max(A) Σ|B_ii|` for the product) are rounding and count as 0; below that the input
 * is not positive semi-definite and a `singular` SaddleError is thrown.
 *
 * References: Dowson & Landau 1982, "The Fréchet distance between multivariate normal
 * distributions".
 *
 * @example
 * ```ts
 * import { traceSqrtProduct } from "./eigen.ts";
 * import assert from "node:assert/strict";
 * // Commuting diagonal matrices: tr((AB)^½) = √(4·1) + √(1·9) = 5.
 * const t = traceSqrtProduct([4, 0, 0, 1], [1, 0, 0, 9], 2);
 * assert.ok(Math.abs(t - 5) < 1e-12);
 * // Orthogonal supports: the product is 0.
 * assert.equal(traceSqrtProduct([1, 0, 0, 0], [0, 0, 0, 1], 2), 0);
 * ```
 */
export function traceSqrtProduct(
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  d: number,
  options: TraceSqrtProductOptions = {},
): number {
  return activeLinalg().traceSqrtProduct(a, b, d, options);
}
