/**
 * Cholesky factorisation of symmetric positive definite matrices and what follows from it:
 * triangular solves, log-determinants, Mahalanobis norms. Matrices are row-major
 * `Float64Array`s of length `d * d`.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";

/** Options of {@linkcode cholesky}. */
export interface CholeskyOptions {
  /** Name of the matrix in error messages (default "matrix"). */
  name?: string;
}

/**
 * The lower-triangular `L` with `A = L Lᵀ` (row-major, upper triangle zero). Throws a
 * `singular` {@linkcode SaddleError} naming the pivot when `A` is not positive definite:
 * add a ridge (`regularization`) to the diagonal, or drop the collinear column.
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
  if (a.length !== d * d) {
    throw new SaddleError(
      "dimension-mismatch",
      `expected ${d * d} entries for a ${d} x ${d} matrix, got ${a.length}`,
      {
        parameter: options.name ?? "matrix",
      },
    );
  }
  for (let i = 0; i < d * d; i++) {
    if (!Number.isFinite(a[i])) {
      const name = options.name ?? "matrix";
      throw new SaddleError(
        "singular",
        `${name} has a non-finite entry (row ${Math.floor(i / d)}, column ${i % d} is ${a[i]}); ` +
          "check the data or parameters it was computed from",
        { parameter: name },
      );
    }
  }
  const L = new Float64Array(d * d);
  for (let j = 0; j < d; j++) {
    let s = a[j * d + j];
    for (let k = 0; k < j; k++) s -= L[j * d + k] * L[j * d + k];
    if (!(s > 0)) {
      throw new SaddleError(
        "singular",
        `${options.name ?? "matrix"} is not positive definite (pivot ${j} is ${s}); ` +
          "a constant or collinear column makes a covariance singular: add a ridge to its diagonal " +
          "(the `regularization` option) or drop the column",
        { parameter: options.name ?? "matrix" },
      );
    }
    const ljj = Math.sqrt(s);
    L[j * d + j] = ljj;
    for (let i = j + 1; i < d; i++) {
      let t = a[i * d + j];
      for (let k = 0; k < j; k++) t -= L[i * d + k] * L[j * d + k];
      L[i * d + j] = t / ljj;
    }
  }
  return L;
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
  let s = 0;
  for (let i = 0; i < d; i++) s += Math.log(L[i * d + i]);
  return 2 * s;
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
  for (let i = 0; i < d; i++) {
    let s = b[i];
    for (let k = 0; k < i; k++) s -= L[i * d + k] * out[k];
    out[i] = s / L[i * d + i];
  }
  return out;
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
  for (let i = d - 1; i >= 0; i--) {
    let s = y[i];
    for (let k = i + 1; k < d; k++) s -= L[k * d + i] * out[k];
    out[i] = s / L[i * d + i];
  }
  return out;
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
  return solveLowerTransposed(L, d, solveLower(L, d, b));
}

/**
 * `A⁻¹` (row-major) from the Cholesky factor of `A`.
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
  const inv = new Float64Array(d * d);
  const e = new Float64Array(d);
  for (let j = 0; j < d; j++) {
    e.fill(0);
    e[j] = 1;
    const col = choleskySolve(L, d, e);
    for (let i = 0; i < d; i++) inv[i * d + j] = col[i];
  }
  // Symmetrise: the two triangles differ by rounding only.
  for (let i = 0; i < d; i++) {
    for (let j = i + 1; j < d; j++) {
      const m = 0.5 * (inv[i * d + j] + inv[j * d + i]);
      inv[i * d + j] = m;
      inv[j * d + i] = m;
    }
  }
  return inv;
}
