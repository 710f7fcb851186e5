/**
 * Sample mean and covariance of row-major data.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";

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
 * Sample covariance (`d x d`, row-major) of an `n x d` buffer, two-pass for accuracy.
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
  const dev = new Float64Array(d);
  let sw = 0, sw2 = 0;
  for (let i = 0; i < n; i++) {
    const wi = w ? w[i] : 1;
    sw += wi;
    sw2 += wi * wi;
    for (let j = 0; j < d; j++) dev[j] = data[i * d + j] - mean[j];
    for (let a = 0; a < d; a++) {
      const wa = wi * dev[a];
      for (let b = a; b < d; b++) cov[a * d + b] += wa * dev[b];
    }
  }
  const ddof = options.ddof ?? 1;
  const denom = ddof === 0 ? sw : sw - sw2 / sw;
  if (!(denom > 0)) {
    throw new SaddleError("too-few-samples", `covariance needs at least 2 rows, got ${n}`, {
      parameter: "data",
    });
  }
  for (let a = 0; a < d; a++) {
    for (let b = a; b < d; b++) {
      const v = cov[a * d + b] / denom;
      cov[a * d + b] = v;
      cov[b * d + a] = v;
    }
  }
  return cov;
}
