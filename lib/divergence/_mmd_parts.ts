/**
 * Pieces shared by the MMD, the energy distance and the MMD permutation null: the kernel
 * of a call, MMD² from kernel row sums and its first-order standard error.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import type { RandomSource } from "../random/mod.ts";
import type { Samples } from "../samples/mod.ts";
import type { KernelSpec, KernelSums } from "./_kernel_sums.ts";
import { medianBandwidth } from "./median_bandwidth.ts";

/** The kernel spec of an MMD call: Gaussian σ given or by the median heuristic. */
export function kernelSpec(
  x: Samples,
  y: Samples,
  kind: "gaussian" | "cubic",
  options: { bandwidth?: number; seed?: RandomSource },
): KernelSpec {
  if (kind === "cubic") return { kind };
  const bandwidth = options.bandwidth ?? medianBandwidth(x, y, { seed: options.seed });
  if (!(bandwidth > 0) || !Number.isFinite(bandwidth)) {
    throw new SaddleError(
      "invalid-argument",
      `bandwidth must be a positive finite number, got ${bandwidth}` +
        (options.bandwidth === undefined
          ? " (the median heuristic gave it: the pooled points are mostly equal; pass a bandwidth)"
          : ""),
      { parameter: "bandwidth" },
    );
  }
  return { kind, bandwidth };
}

/** MMD² from kernel row sums. */
export function mmdFromSums(
  s: KernelSums,
  n: number,
  m: number,
  estimator: "unbiased" | "biased",
): number {
  const sxx = sum(s.xx), syy = sum(s.yy), sxy = sum(s.xy);
  if (estimator === "biased") {
    return (sxx + s.diagX) / (n * n) + (syy + s.diagY) / (m * m) - 2 * sxy / (n * m);
  }
  return sxx / (n * (n - 1)) + syy / (m * (m - 1)) - 2 * sxy / (n * m);
}

/** First-order (Hoeffding projection) standard error of the two-sample U-statistic. */
export function firstOrderSe(s: KernelSums, n: number, m: number): number {
  const va = projectionVariance(s.xx, s.xy, n - 1, m);
  const vb = projectionVariance(s.yy, s.yx, m - 1, n);
  return Math.sqrt(4 * va / n + 4 * vb / m);
}

function projectionVariance(
  within: Float64Array,
  cross: Float64Array,
  nw: number,
  nc: number,
): number {
  const n = within.length;
  let mean = 0, m2 = 0;
  for (let i = 0; i < n; i++) {
    const h = within[i] / nw - cross[i] / nc;
    const delta = h - mean;
    mean += delta / (i + 1);
    m2 += delta * (h - mean);
  }
  return n > 1 ? m2 / (n - 1) : 0;
}

function sum(a: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i];
  return s;
}
