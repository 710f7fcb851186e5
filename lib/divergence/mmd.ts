/**
 * Maximum mean discrepancy between two sample sets, with a Gaussian or a cubic polynomial
 * kernel, computed by tiles (no `n x n` kernel matrix is held).
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { type Estimate, makeEstimate, normalCritical } from "../estimate/mod.ts";
import { type RandomSource, toRng } from "../random/mod.ts";
import type { Samples, SamplesInput } from "../samples/mod.ts";
import { takeRows } from "../samples/mod.ts";
import { samplePair } from "./_inputs.ts";
import { type KernelSpec, kernelSums } from "./_kernel_sums.ts";
import { firstOrderSe, kernelSpec, mmdFromSums } from "./_mmd_parts.ts";

/** Kernels of {@linkcode mmd}. */
export type MmdKernel = "gaussian" | "cubic";

/** Options of {@linkcode mmd}. */
export interface MmdOptions {
  /**
   * "gaussian" (default): `exp(−‖x−y‖²/(2σ²))`; "cubic": `(x·y/d + 1)³`, the polynomial
   * kernel of Bińkowski et al. 2018 for feature embeddings.
   */
  kernel?: MmdKernel;
  /** σ of the Gaussian kernel (default: the median heuristic, see `medianBandwidth`). */
  bandwidth?: number;
  /** "unbiased" (default, the U-statistic MMD²_u) or "biased" (the V-statistic MMD²_b). */
  estimator?: "unbiased" | "biased";
  /** Confidence level of the interval (default 0.95). */
  level?: number;
  /** Seed of the median-heuristic subsample and of the cubic kernel's subsets (default 0). */
  seed?: RandomSource;
  /**
   * Cubic kernel: number of random subsets averaged (default 100), as Bińkowski et al. 2018
   * do; ignored when both sets have at most `subsetSize` rows (then one estimate on all).
   */
  subsets?: number;
  /** Cubic kernel: rows drawn from each set per subset (default 1000). */
  subsetSize?: number;
}

/**
 * The squared maximum mean discrepancy MMD² between the distributions of `a` and `b`.
 *
 * The unbiased estimator averages `k(x, x')` over distinct pairs within each set and
 * `k(x, y)` across them (Gretton et al. 2012, Lemma 6); the biased one includes the
 * diagonal (their Eq. 5) and is ≥ 0. With the Gaussian kernel on all rows, the interval is
 * normal with the first-order U-statistic standard error `4 Var(h₁(x))/n + 4 Var(h₁(y))/m`
 * from the kernel row sums (method "u-statistic"); when the distributions are equal this
 * first-order term vanishes and the interval is too narrow: test equality with `mmdTest`.
 * With the cubic kernel on sets larger than `subsetSize`, the value is the mean over random
 * subsets and the interval is normal with the standard error of that mean (method
 * "subset-mean"); the subsets overlap, so it is a lower bound on the sampling error.
 * The work is O((n + m)² d) in tiles of 512 rows.
 *
 * References: Gretton et al. 2012, A Kernel Two-Sample Test (JMLR); Bińkowski et al. 2018,
 * Demystifying MMD GANs (ICLR).
 *
 * @example
 * ```ts
 * import { mmd } from "./mmd.ts";
 * import assert from "node:assert/strict";
 * const a = [[0], [0.1], [0.2], [0.3]], b = [[3], [3.1], [3.2], [3.3]];
 * const e = mmd(a, b, { bandwidth: 1 });
 * assert.ok(e.value > 0);
 * assert.ok(mmd(a, b, { bandwidth: 1, estimator: "biased" }).value >= 0);
 * ```
 */
export function mmd(a: SamplesInput, b: SamplesInput, options: MmdOptions = {}): Estimate {
  const [x, y] = samplePair(a, b, 2);
  const kind = options.kernel ?? "gaussian";
  const estimator = options.estimator ?? "unbiased";
  const level = options.level ?? 0.95;
  if (kind !== "gaussian" && kind !== "cubic") {
    throw new SaddleError(
      "invalid-argument",
      `unknown kernel "${kind}"; use "gaussian" or "cubic"`,
      {
        parameter: "kernel",
      },
    );
  }
  if (estimator !== "unbiased" && estimator !== "biased") {
    throw new SaddleError(
      "invalid-argument",
      `unknown estimator "${estimator}"; use "unbiased" or "biased"`,
      { parameter: "estimator" },
    );
  }
  const spec = kernelSpec(x, y, kind, options);
  const size = options.subsetSize ?? 1000;
  if (kind === "cubic" && (x.n > size || y.n > size)) {
    return subsetMmd(x, y, spec, { estimator, level, size, options });
  }
  const sums = kernelSums(x, y, spec);
  const value = mmdFromSums(sums, x.n, y.n, estimator);
  const se = firstOrderSe(sums, x.n, y.n);
  const z = normalCritical(level);
  return makeEstimate({
    value,
    se,
    ci: [value - z * se, value + z * se],
    level,
    method: "u-statistic",
    n: x.n + y.n,
    notes: [`${estimator} MMD², ${kernelNote(spec)}`],
  });
}

function kernelNote(spec: KernelSpec): string {
  return spec.kind === "gaussian"
    ? `Gaussian kernel σ = ${+spec.bandwidth.toPrecision(6)}`
    : "cubic kernel (x·y/d + 1)³";
}

function subsetMmd(
  x: Samples,
  y: Samples,
  spec: KernelSpec,
  settings: { estimator: "unbiased" | "biased"; level: number; size: number; options: MmdOptions },
): Estimate {
  const { estimator, level, size, options } = settings;
  const count = options.subsets ?? 100;
  if (!Number.isInteger(count) || count < 2) {
    throw new SaddleError("invalid-argument", `subsets must be an integer >= 2, got ${count}`, {
      parameter: "subsets",
    });
  }
  const r = toRng(options.seed ?? 0).fork("mmd-subsets");
  const sx = Math.min(size, x.n), sy = Math.min(size, y.n);
  const values = new Float64Array(count);
  for (let t = 0; t < count; t++) {
    const xs = takeRows(x, r.permutation(x.n).subarray(0, sx));
    const ys = takeRows(y, r.permutation(y.n).subarray(0, sy));
    values[t] = mmdFromSums(kernelSums(xs, ys, spec), sx, sy, estimator);
  }
  let mean = 0;
  for (const v of values) mean += v / count;
  let v2 = 0;
  for (const v of values) v2 += (v - mean) ** 2 / (count - 1);
  const se = Math.sqrt(v2 / count), z = normalCritical(level);
  return makeEstimate({
    value: mean,
    se,
    ci: [mean - z * se, mean + z * se],
    level,
    method: "subset-mean",
    n: x.n + y.n,
    notes: [
      `${estimator} MMD², ${kernelNote(spec)}`,
      `mean of ${count} subsets of ${sx} + ${sy} rows (Bińkowski et al. 2018); ` +
      `subset sd ${+Math.sqrt(v2).toPrecision(4)}`,
    ],
  });
}
