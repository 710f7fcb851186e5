/**
 * Matrix products on row-major `Float64Array`s: the general product (gemm) and the
 * symmetric rank-k product (syrk), on the backend of {@linkcode linalgBackend}.
 *
 * @module
 */
import { activeLinalg, type GemmOptions, type SyrkOptions } from "./backend.ts";

export type { GemmOptions, SyrkOptions } from "./backend.ts";

/**
 * `C = alpha · op(A) · op(B) + beta · C` on row-major matrices, with `op(X)` = `X` or `Xᵀ`.
 * `op(A)` is `m x k`, `op(B)` is `k x n`, `C` is `m x n`: without `transposeA` the buffer
 * `a` holds `A` as `m x k`, with it `a` holds `A` as `k x m` (and likewise `b`). Returns
 * `options.c` updated in place, or a new matrix.
 *
 * @example
 * ```ts
 * import { gemm } from "./products.ts";
 * import assert from "node:assert/strict";
 * const a = new Float64Array([1, 2, 3, 4, 5, 6]); // 2 x 3
 * const b = new Float64Array([1, 0, 0, 1, 1, 1]); // 3 x 2
 * assert.deepEqual(Array.from(gemm(a, b, { m: 2, n: 2, k: 3 })), [4, 5, 10, 11]);
 * // Aᵀ A (3 x 3) from the same buffer: a holds A (2 x 3) = op(A)ᵀ with op(A) 3 x 2.
 * const ata = gemm(a, a, { m: 3, n: 3, k: 2, transposeA: true });
 * assert.deepEqual(Array.from(ata.slice(0, 3)), [17, 22, 27]);
 * // Accumulate: C = 2 A B + 1 C.
 * const c = new Float64Array([1, 1, 1, 1]);
 * gemm(a, b, { m: 2, n: 2, k: 3, alpha: 2, beta: 1, c });
 * assert.deepEqual(Array.from(c), [9, 11, 21, 23]);
 * ```
 */
export function gemm(
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  options: GemmOptions,
): Float64Array {
  return activeLinalg().gemm(a, b, options);
}

/**
 * The symmetric product `alpha · AᵀA` (`d x d`) of a row-major `n x d` matrix, or
 * `alpha · AAᵀ` (`n x n`) with `outer: true`; both triangles are filled. With `c`, the
 * product is accumulated into it: `c = alpha · AᵀA + beta · c` (only the lower triangle of
 * the incoming `c` is read), e.g. a scatter matrix summed block by block.
 *
 * @example
 * ```ts
 * import { syrk } from "./products.ts";
 * import assert from "node:assert/strict";
 * const x = new Float64Array([1, 2, 3, 4, 5, 6]); // 3 x 2
 * assert.deepEqual(Array.from(syrk(x, { n: 3, d: 2 })), [35, 44, 44, 56]);
 * assert.equal(syrk(x, { n: 3, d: 2, outer: true }).length, 9);
 * // Accumulate a second block: c = 1 · (rows 3..)ᵀ(rows 3..) + 1 · c.
 * const c = syrk(x, { n: 3, d: 2 });
 * syrk(new Float64Array([1, 1]), { n: 1, d: 2, beta: 1, c });
 * assert.deepEqual(Array.from(c), [36, 45, 45, 57]);
 * ```
 */
export function syrk(a: ArrayLike<number>, options: SyrkOptions): Float64Array {
  return activeLinalg().syrk(a, options);
}
