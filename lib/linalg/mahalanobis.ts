/**
 * Squared Mahalanobis terms `|L⁻¹ (xᵢ - μ)|²` of every row of a data block, in blocks of
 * rows: one triangular solve (`trsm`) per block on the backend of {@linkcode linalgBackend}.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { trsm } from "./cholesky.ts";

/** Options of {@linkcode squaredMahalanobis}. */
export interface SquaredMahalanobisOptions {
  /** Rows of `data`. */
  n: number;
  /** Columns of `data` (and the size of `L`). */
  d: number;
  /** Centre `μ` (length d); default the origin. */
  mean?: ArrayLike<number>;
  /** Output of length `n`; default a new array. */
  out?: Float64Array;
}

/** Rows per triangular solve: bounds the scratch memory at `BLOCK x d`. */
const BLOCK = 256;

/**
 * `|L⁻¹ (xᵢ - μ)|²` for every row `xᵢ` of the row-major `n x d` buffer `data`, with `L` the
 * lower Cholesky factor of a covariance `Σ = L Lᵀ` (so the result is `(xᵢ - μ)ᵀ Σ⁻¹ (xᵢ - μ)`).
 * The rows go through {@linkcode trsm} in blocks of 256, so no inverse is formed.
 *
 * @example
 * ```ts
 * import { squaredMahalanobis } from "./mahalanobis.ts";
 * import { cholesky } from "./cholesky.ts";
 * import assert from "node:assert/strict";
 * const L = cholesky(new Float64Array([4, 0, 0, 9]), 2);
 * const q = squaredMahalanobis([3, 3, 1, 4], L, { n: 2, d: 2, mean: [1, 1] });
 * assert.deepEqual(Array.from(q), [2 ** 2 / 4 + 2 ** 2 / 9, 0 + 3 ** 2 / 9]);
 * ```
 */
export function squaredMahalanobis(
  data: ArrayLike<number>,
  L: ArrayLike<number>,
  options: SquaredMahalanobisOptions,
): Float64Array {
  const { n, d, mean } = options;
  if (data.length !== n * d) {
    throw new SaddleError(
      "dimension-mismatch",
      `squaredMahalanobis: data must have ${n * d} entries (${n} x ${d}), got ${data.length}`,
      { parameter: "data" },
    );
  }
  if (mean && mean.length !== d) {
    throw new SaddleError(
      "dimension-mismatch",
      `squaredMahalanobis: mean must have ${d} entries, got ${mean.length}`,
      { parameter: "mean" },
    );
  }
  const out = options.out ?? new Float64Array(n);
  if (out.length < n) {
    throw new SaddleError(
      "dimension-mismatch",
      `squaredMahalanobis: out must have at least ${n} entries, got ${out.length}`,
      { parameter: "out" },
    );
  }
  const z = new Float64Array(Math.min(BLOCK, n) * d);
  for (let r0 = 0; r0 < n; r0 += BLOCK) {
    const m = Math.min(BLOCK, n - r0);
    const block = z.subarray(0, m * d);
    for (let i = 0; i < m; i++) {
      const o = (r0 + i) * d, p = i * d;
      if (mean) { for (let a = 0; a < d; a++) block[p + a] = data[o + a] - mean[a]; }
      else for (let a = 0; a < d; a++) block[p + a] = data[o + a];
    }
    // Row i of the block becomes L⁻¹ (xᵢ - μ): X Lᵀ = B.
    trsm(L, block, { m, n: d, side: "right", transpose: true, out: block });
    for (let i = 0; i < m; i++) {
      let q = 0;
      for (let a = i * d; a < (i + 1) * d; a++) q += block[a] * block[a];
      out[r0 + i] = q;
    }
  }
  return out;
}
