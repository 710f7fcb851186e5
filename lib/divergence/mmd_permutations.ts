/**
 * The MMD² of two sets and its values under random relabellings of the pooled points (the
 * permutation null of the kernel two-sample test), by tiles of the pooled kernel matrix.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { gemm } from "../linalg/mod.ts";
import { type RandomSource, toRng } from "../random/mod.ts";
import { concatSamples, type SamplesInput } from "../samples/mod.ts";
import { samplePair } from "./_inputs.ts";
import { kernelTile } from "./_kernel_sums.ts";
import { firstOrderSe, kernelSpec } from "./_mmd_parts.ts";
import { rowSquaredNorms } from "../neighbors/mod.ts";
import type { MmdKernel } from "./mmd.ts";

/** Options of {@linkcode mmdPermutations}. */
export interface MmdPermutationOptions {
  /** "gaussian" (default) or "cubic", as in `mmd`. */
  kernel?: MmdKernel;
  /** σ of the Gaussian kernel (default: the median heuristic on the pooled points). */
  bandwidth?: number;
  /** "unbiased" (default) or "biased". */
  estimator?: "unbiased" | "biased";
  /** Number of random relabellings (default 200). */
  permutations?: number;
  /** Seed of the relabellings and of the bandwidth subsample (default 0). */
  seed?: RandomSource;
}

/** The observed MMD² and its permutation null. */
export interface MmdPermutations {
  /** MMD² of the given split. */
  readonly observed: number;
  /** First-order standard error of the observed MMD² (as in `mmd`). */
  readonly se: number;
  /** MMD² under each random relabelling, in draw order. */
  readonly null: Float64Array;
  /** The kernel's bandwidth (Gaussian) or NaN (cubic). */
  readonly bandwidth: number;
}

/**
 * MMD² of `a` versus `b` and under `permutations` seeded random splits of the pooled points
 * into sets of the same sizes. Each split's MMD² is a quadratic form `sᵀKs` of the pooled
 * kernel matrix K with the split's indicator s, so the work is one pass over K by tiles
 * (O(N² (d + P)) for N pooled points and P permutations) and memory O(N P), never N².
 *
 * References: Gretton et al. 2012, A Kernel Two-Sample Test (JMLR), Sec. 5 (the
 * permutation / bootstrap null).
 *
 * @example
 * ```ts
 * import { mmdPermutations } from "./mmd_permutations.ts";
 * import assert from "node:assert/strict";
 * const r = mmdPermutations([[0], [0.1], [0.2]], [[5], [5.1], [5.3]], { bandwidth: 1, permutations: 50 });
 * assert.ok(r.null.every((v) => v < r.observed + 1e-12));
 * ```
 */
export function mmdPermutations(
  a: SamplesInput,
  b: SamplesInput,
  options: MmdPermutationOptions = {},
): MmdPermutations {
  const [x, y] = samplePair(a, b, 2);
  const P = options.permutations ?? 200;
  if (!Number.isInteger(P) || P < 1) {
    throw new SaddleError("invalid-argument", `permutations must be an integer >= 1, got ${P}`, {
      parameter: "permutations",
    });
  }
  const estimator = options.estimator ?? "unbiased";
  const spec = kernelSpec(x, y, options.kernel ?? "gaussian", options);
  const z = concatSamples(x, y);
  const N = z.n, n = x.n, m = y.n, cols = P + 1;
  // Column 0 is the given split; columns 1..P random ones. L[i * cols + p] = 1 when pooled
  // point i is on the first side of split p.
  const L = new Float64Array(N * cols);
  for (let i = 0; i < n; i++) L[i * cols] = 1;
  const r = toRng(options.seed ?? 0).fork("mmd-permutations");
  for (let p = 1; p <= P; p++) {
    const perm = r.permutation(N);
    for (let t = 0; t < n; t++) L[perm[t] * cols + p] = 1;
  }
  const norms = rowSquaredNorms(z.data, N, z.d);
  const rowSum = new Float64Array(N), diag = new Float64Array(N);
  const quad = new Float64Array(cols), firstSide = new Float64Array(N);
  const TILE = 256;
  const tile = new Float64Array(TILE * N), kl = new Float64Array(TILE * cols);
  for (let i0 = 0; i0 < N; i0 += TILE) {
    const ni = Math.min(TILE, N - i0);
    kernelTile(
      { s: z, norms, start: i0, rows: ni },
      { s: z, norms, start: 0, rows: N },
      spec,
      tile,
    );
    // (K L) for the tile's rows: every split's within-first-side sums at once.
    gemm(tile.subarray(0, ni * N), L, { m: ni, n: cols, k: N, c: kl.subarray(0, ni * cols) });
    for (let a0 = 0; a0 < ni; a0++) {
      const i = i0 + a0, row = a0 * N, kr = a0 * cols, li = i * cols;
      let s = 0;
      for (let j = 0; j < N; j++) s += tile[row + j];
      rowSum[i] = s;
      diag[i] = tile[row + i];
      firstSide[i] = kl[kr];
      for (let p = 0; p < cols; p++) quad[p] += L[li + p] * kl[kr + p];
    }
  }
  let total = 0, diagTotal = 0;
  for (let i = 0; i < N; i++) {
    total += rowSum[i];
    diagTotal += diag[i];
  }
  const values = new Float64Array(cols);
  for (let p = 0; p < cols; p++) {
    let aR = 0, dA = 0;
    for (let i = 0; i < N; i++) {
      if (L[i * cols + p] === 1) {
        aR += rowSum[i];
        dA += diag[i];
      }
    }
    const saa = quad[p], sab = aR - saa, sbb = total - 2 * aR + saa, dB = diagTotal - dA;
    values[p] = estimator === "biased"
      ? saa / (n * n) + sbb / (m * m) - 2 * sab / (n * m)
      : (saa - dA) / (n * (n - 1)) + (sbb - dB) / (m * (m - 1)) - 2 * sab / (n * m);
  }
  // Row sums of the given split for the first-order standard error.
  const sums = {
    xx: new Float64Array(n),
    xy: new Float64Array(n),
    yy: new Float64Array(m),
    yx: new Float64Array(m),
    diagX: 0,
    diagY: 0,
  };
  for (let i = 0; i < N; i++) {
    const own = i < n ? firstSide[i] : rowSum[i] - firstSide[i];
    const other = rowSum[i] - own;
    if (i < n) {
      sums.xx[i] = own - diag[i];
      sums.xy[i] = other;
    } else {
      sums.yy[i - n] = own - diag[i];
      sums.yx[i - n] = other;
    }
  }
  return Object.freeze({
    observed: values[0],
    se: firstOrderSe(sums, n, m),
    null: values.slice(1),
    bandwidth: spec.kind === "gaussian" ? spec.bandwidth : NaN,
  });
}
