/**
 * Dense products of row tiles: the Gram block `A Bᵀ` through the linear-algebra interface,
 * and squared row norms. Together they give squared distances `‖a‖² + ‖b‖² − 2 a·b` by
 * tiles, the core of every blocked search and kernel sum.
 *
 * @module
 */
import { gemm } from "../linalg/mod.ts";

/** Rows `start .. start + rows` of a row-major buffer. */
export interface RowBlock {
  /** Row-major values. */
  readonly data: Float64Array;
  /** First row of the block. */
  readonly start: number;
  /** Number of rows. */
  readonly rows: number;
}

/**
 * The Gram block of two row tiles of `d`-dimensional rows: `out[i * b.rows + j]` is the dot
 * product of row `a.start + i` of `a.data` and row `b.start + j` of `b.data` (one gemm on
 * the active linear-algebra backend; `out` needs at least `a.rows * b.rows` entries).
 *
 * @example
 * ```ts
 * import { gramBlock } from "./pairwise.ts";
 * import assert from "node:assert/strict";
 * const x = new Float64Array([1, 0, 0, 1, 1, 1]); // rows (1,0), (0,1), (1,1)
 * const out = new Float64Array(2);
 * gramBlock({ data: x, start: 2, rows: 1 }, { data: x, start: 0, rows: 2 }, 2, out);
 * assert.deepEqual(Array.from(out), [1, 1]);
 * ```
 */
export function gramBlock(a: RowBlock, b: RowBlock, d: number, out: Float64Array): void {
  gemm(
    a.data.subarray(a.start * d, (a.start + a.rows) * d),
    b.data.subarray(b.start * d, (b.start + b.rows) * d),
    { m: a.rows, n: b.rows, k: d, transposeB: true, c: out.subarray(0, a.rows * b.rows) },
  );
}

/**
 * The squared Euclidean norm of each row of a row-major `n x d` buffer.
 *
 * @example
 * ```ts
 * import { rowSquaredNorms } from "./pairwise.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual(Array.from(rowSquaredNorms(new Float64Array([3, 4, 1, 1]), 2, 2)), [25, 2]);
 * ```
 */
export function rowSquaredNorms(a: Float64Array, n: number, d: number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let t = 0; t < d; t++) s += a[i * d + t] * a[i * d + t];
    out[i] = s;
  }
  return out;
}
