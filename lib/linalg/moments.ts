/**
 * Sample mean and covariance of row-major data.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { syrk } from "./products.ts";

/** Options of {@linkcode covariance}. */
export interface CovarianceOptions {
  /** Per-row weights (non-negative); default equal weights. */
  weights?: ArrayLike<number>;
  /** Divide by n - 1 (default, unbiased) or by n (`ddof: 0`). With weights, the
   * reliability-weights correction `1 - Σw² / (Σw)²` replaces n - 1. */
  ddof?: 0 | 1;
}

/**
 * Column means of an `n x d` row-major buffer (weighted when `weights` is given).
 *
 * @example
 * ```ts
 * import { columnMeans } from "./moments.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual(Array.from(columnMeans(new Float64Array([1, 2, 3, 4]), 2, 2)), [2, 3]);
 * ```
 */
export function columnMeans(
  data: ArrayLike<number>,
  n: number,
  d: number,
  weights?: ArrayLike<number>,
): Float64Array {
  const mean = new Float64Array(d);
  let total = 0;
  for (let i = 0; i < n; i++) {
    const w = weights ? weights[i] : 1;
    total += w;
    for (let j = 0; j < d; j++) mean[j] += w * data[i * d + j];
  }
  if (!(total > 0)) {
    throw new SaddleError("empty", "no rows (or all weights 0): cannot take a mean", {
      parameter: "data",
    });
  }
  for (let j = 0; j < d; j++) mean[j] /= total;
  return mean;
}

/**
 * Sample covariance (`d x d`, row-major) of an `n x d` buffer, two-pass for accuracy: the
 * mean first, then the centred rows in blocks through `syrk` (native BLAS when available).
 *
 * @example
 * ```ts
 * import { covariance } from "./moments.ts";
 * import assert from "node:assert/strict";
 * const c = covariance(new Float64Array([0, 0, 1, 2, 2, 4]), 3, 2);
 * assert.deepEqual(Array.from(c), [1, 2, 2, 4]);
 * ```
 */
export function covariance(
  data: ArrayLike<number>,
  n: number,
  d: number,
  options: CovarianceOptions = {},
): Float64Array {
  const w = options.weights;
  const mean = columnMeans(data, n, d, w);
  const cov = new Float64Array(d * d);
  // Centred (weighted: × √w) rows in blocks, each added as one syrk: cov += Bᵀ B.
  const B = Math.max(1, Math.min(256, n));
  const block = new Float64Array(B * d);
  let sw = 0, sw2 = 0;
  for (let r0 = 0; r0 < n; r0 += B) {
    const m = Math.min(B, n - r0);
    for (let i = 0; i < m; i++) {
      const wi = w ? w[r0 + i] : 1, h = w ? Math.sqrt(wi) : 1;
      sw += wi;
      sw2 += wi * wi;
      const o = (r0 + i) * d, p = i * d;
      for (let j = 0; j < d; j++) block[p + j] = h * (data[o + j] - mean[j]);
    }
    syrk(block.subarray(0, m * d), { n: m, d, beta: 1, c: cov });
  }
  const ddof = options.ddof ?? 1;
  const denom = ddof === 0 ? sw : sw - sw2 / sw;
  if (!(denom > 0)) {
    throw new SaddleError("too-few-samples", `covariance needs at least 2 rows, got ${n}`, {
      parameter: "data",
    });
  }
  for (let a = 0; a < d * d; a++) cov[a] /= denom;
  return cov;
}
