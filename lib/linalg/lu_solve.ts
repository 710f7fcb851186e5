/**
 * Small dense linear systems.
 *
 * @module
 */

/**
 * Solve the square system A x = b (row-major n x n) by Gaussian elimination with partial
 * pivoting; undefined when a pivot falls below 1e-14 (singular to working precision).
 *
 * References: Golub & Van Loan 2013, Matrix Computations, Sec. 3.4.
 *
 * @example
 * ```ts
 * import { luSolve } from "./lu_solve.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual([...luSolve(new Float64Array([0, 2, 1, 0]), [4, 3], 2)!], [3, 2]);
 * assert.equal(luSolve(new Float64Array([1, 1, 1, 1]), [1, 2], 2), undefined);
 * ```
 */
export function luSolve(
  A: Float64Array,
  b: ArrayLike<number>,
  n: number,
): Float64Array | undefined {
  const a = Float64Array.from(A), x = Float64Array.from(b);
  for (let c = 0; c < n; c++) {
    let piv = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(a[r * n + c]) > Math.abs(a[piv * n + c])) piv = r;
    if (!(Math.abs(a[piv * n + c]) > 1e-14)) return undefined;
    if (piv !== c) {
      for (let k = 0; k < n; k++) [a[c * n + k], a[piv * n + k]] = [a[piv * n + k], a[c * n + k]];
      [x[c], x[piv]] = [x[piv], x[c]];
    }
    for (let r = c + 1; r < n; r++) {
      const f = a[r * n + c] / a[c * n + c];
      for (let k = c; k < n; k++) a[r * n + k] -= f * a[c * n + k];
      x[r] -= f * x[c];
    }
  }
  for (let c = n - 1; c >= 0; c--) {
    let s = x[c];
    for (let k = c + 1; k < n; k++) s -= a[c * n + k] * x[k];
    x[c] = s / a[c * n + c];
  }
  return x;
}
