/**
 * Cholesky factorisation of symmetric positive definite matrices and what follows from it:
 * triangular solves, log-determinants, inverses. Matrices are row-major `Float64Array`s of
 * length `d * d`; the work runs on the backend of {@linkcode linalgBackend}.
 *
 * @module
 */
import { activeLinalg, type CholeskyOptions, type TrsmOptions } from "./backend.ts";

export type { CholeskyOptions, TrsmOptions } from "./backend.ts";

/**
 * The lower-triangular `L` with `A = L Lᵀ` (row-major, upper triangle zero). Throws a
 * `singular` SaddleError naming the pivot when `A` is not positive definite (add a ridge,
 * `regularization`, to the diagonal, or drop the collinear column), or naming the entry
 * when one is not finite.
 *
 * @example
 * ```ts
 * import { cholesky } from "./cholesky.ts";
 * import assert from "node:assert/strict";
 * const L = cholesky(new Float64Array([4, 2, 2, 3]), 2);
 * assert.deepEqual(Array.from(L), [2, 0, 1, Math.SQRT2]);
 * ```
 */
export function cholesky(
  a: ArrayLike<number>,
  d: number,
  options: CholeskyOptions = {},
): Float64Array {
  return activeLinalg().cholesky(a, d, options);
}

/**
 * `log det A` from its Cholesky factor: `2 Σ log L_ii`. Stays finite where `det A` would
 * underflow or overflow.
 *
 * @example
 * ```ts
 * import { cholesky, logDetCholesky } from "./cholesky.ts";
 * import assert from "node:assert/strict";
 * const L = cholesky(new Float64Array([4, 2, 2, 3]), 2);
 * assert.ok(Math.abs(logDetCholesky(L, 2) - Math.log(8)) < 1e-15);
 * ```
 */
export function logDetCholesky(L: ArrayLike<number>, d: number): number {
  return activeLinalg().logDetCholesky(L, d);
}

/**
 * Solve `L y = b` for lower-triangular `L` (forward substitution); writes into `out`.
 *
 * @example
 * ```ts
 * import { solveLower } from "./cholesky.ts";
 * import assert from "node:assert/strict";
 * const y = solveLower(new Float64Array([2, 0, 1, 1]), 2, [4, 3]);
 * assert.deepEqual(Array.from(y), [2, 1]);
 * ```
 */
export function solveLower(
  L: ArrayLike<number>,
  d: number,
  b: ArrayLike<number>,
  out: Float64Array = new Float64Array(d),
): Float64Array {
  return activeLinalg().solveLower(L, d, b, out);
}

/**
 * Solve `Lᵀ x = y` for lower-triangular `L` (back substitution); writes into `out`.
 *
 * @example
 * ```ts
 * import { solveLowerTransposed } from "./cholesky.ts";
 * import assert from "node:assert/strict";
 * const x = solveLowerTransposed(new Float64Array([2, 0, 1, 1]), 2, [5, 1]);
 * assert.deepEqual(Array.from(x), [2, 1]);
 * ```
 */
export function solveLowerTransposed(
  L: ArrayLike<number>,
  d: number,
  y: ArrayLike<number>,
  out: Float64Array = new Float64Array(d),
): Float64Array {
  return activeLinalg().solveLowerTransposed(L, d, y, out);
}

/**
 * Solve `A x = b` given the Cholesky factor `L` of `A`.
 *
 * @example
 * ```ts
 * import { cholesky, choleskySolve } from "./cholesky.ts";
 * import assert from "node:assert/strict";
 * const L = cholesky(new Float64Array([4, 2, 2, 3]), 2);
 * const x = choleskySolve(L, 2, [8, 7]); // A [1, 2] = [8, 8]; A [1.25, 1.5] = [8, 7]
 * assert.ok(Math.abs(x[0] - 1.25) < 1e-14 && Math.abs(x[1] - 1.5) < 1e-14);
 * ```
 */
export function choleskySolve(L: ArrayLike<number>, d: number, b: ArrayLike<number>): Float64Array {
  return activeLinalg().choleskySolve(L, d, b);
}

/**
 * `A⁻¹` (row-major, exactly symmetric) from the Cholesky factor of `A`.
 *
 * @example
 * ```ts
 * import { cholesky, choleskyInverse } from "./cholesky.ts";
 * import assert from "node:assert/strict";
 * const inv = choleskyInverse(cholesky(new Float64Array([2, 0, 0, 4]), 2), 2);
 * [0.5, 0, 0, 0.25].forEach((v, i) => assert.ok(Math.abs(inv[i] - v) < 1e-15));
 * ```
 */
export function choleskyInverse(L: ArrayLike<number>, d: number): Float64Array {
  return activeLinalg().choleskyInverse(L, d);
}

/**
 * Triangular solve with a block of right-hand sides (BLAS `trsm`), for lower-triangular `L`
 * (its upper triangle is ignored): `op(L) X = B` with side "left" (`L` is `m x m`, each
 * column of `B` a right-hand side) or `X op(L) = B` with side "right" (`L` is `n x n`),
 * `op(L)` = `Lᵀ` with `transpose`. `B` and `X` are row-major `m x n`; `out` may be `b`
 * itself. With side "right" and `transpose`, row `i` of `X` is `L⁻¹ bᵢ`: every row of an
 * `m x n` data block whitened (or its Mahalanobis terms `|L⁻¹ (xᵢ - μ)|²`) in one call.
 *
 * @example
 * ```ts
 * import { cholesky, trsm } from "./cholesky.ts";
 * import assert from "node:assert/strict";
 * const L = cholesky(new Float64Array([4, 2, 2, 3]), 2); // [[2, 0], [1, √2]]
 * // Two points as rows; each row of z is L⁻¹ x, so |z_i|² = xᵢᵀ A⁻¹ xᵢ.
 * const z = trsm(L, [2, 1, 4, 2], { m: 2, n: 2, side: "right", transpose: true });
 * assert.deepEqual(Array.from(z), [1, 0, 2, 0]);
 * // Left side: L X = B with B 2 x 1 is one forward substitution.
 * assert.deepEqual(Array.from(trsm(L, [4, 2], { m: 2, n: 1 })), [2, 0]);
 * ```
 */
export function trsm(
  L: ArrayLike<number>,
  b: ArrayLike<number>,
  options: TrsmOptions,
): Float64Array {
  return activeLinalg().trsm(L, b, options);
}
