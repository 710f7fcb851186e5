/**
 * The median heuristic for the bandwidth of a Gaussian kernel.
 *
 * @module
 */
import { type RandomSource, toRng } from "../random/mod.ts";
import type { Samples } from "../samples/mod.ts";

/** Options of {@linkcode medianBandwidth}. */
export interface MedianBandwidthOptions {
  /** Pooled points used at most (default 1000, drawn without replacement). */
  maxPoints?: number;
  /** Seed of that subsample (default 0). */
  seed?: RandomSource;
}

/**
 * The median heuristic for the Gaussian kernel's σ: the median Euclidean distance between
 * distinct points of the pooled sample (on a seeded subsample of at most 1000 points).
 *
 * References: Gretton et al. 2012, A Kernel Two-Sample Test (JMLR), Sec. 8.
 *
 * @example
 * ```ts
 * import { medianBandwidth } from "./median_bandwidth.ts";
 * import { samples } from "../samples/mod.ts";
 * import assert from "node:assert/strict";
 * assert.equal(medianBandwidth(samples([0, 1]), samples([3])), 2); // distances 1, 2, 3
 * ```
 */
export function medianBandwidth(
  x: Samples,
  y: Samples,
  options: MedianBandwidthOptions = {},
): number {
  const total = x.n + y.n, max = options.maxPoints ?? 1000, d = x.d;
  let rows: ArrayLike<number>;
  if (total <= max) rows = Uint32Array.from({ length: total }, (_, i) => i);
  else rows = toRng(options.seed ?? 0).fork("median-bandwidth").permutation(total).subarray(0, max);
  const at = (i: number): [Float64Array, number] =>
    i < x.n ? [x.data, i * d] : [y.data, (i - x.n) * d];
  const dist = new Float64Array((rows.length * (rows.length - 1)) / 2);
  let c = 0;
  for (let p = 0; p < rows.length; p++) {
    const [da, oa] = at(rows[p]);
    for (let q = p + 1; q < rows.length; q++) {
      const [db, ob] = at(rows[q]);
      let s = 0;
      for (let t = 0; t < d; t++) s += (da[oa + t] - db[ob + t]) ** 2;
      dist[c++] = Math.sqrt(s);
    }
  }
  dist.sort();
  const h = (dist.length - 1) / 2;
  return (dist[Math.floor(h)] + dist[Math.ceil(h)]) / 2;
}
