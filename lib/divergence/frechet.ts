/**
 * The Fréchet distance between Gaussian fits of two feature sets, and its extrapolation to
 * infinite sample size.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { bootstrap, type Estimate, makeEstimate, normalCritical } from "../estimate/mod.ts";
import { htmlTable, textTable, withDisplay } from "../display/mod.ts";
import { type RandomSource, toRng } from "../random/mod.ts";
import { type SamplesInput, takeRows } from "../samples/mod.ts";
import { samplePair } from "./_inputs.ts";
import { traceSqrtTerm } from "./_trace_sqrt.ts";
import {
  type FeatureStatistics,
  featureStatistics,
  isFeatureStatistics,
} from "./feature_statistics.ts";

/** Options of {@linkcode frechetDistance}. */
export interface FrechetOptions {
  /**
   * Bootstrap replicates for an interval (default 0: none, the value alone). Needs
   * samples, not statistics; each replicate costs a covariance and an eigendecomposition.
   */
  replicates?: number;
  /** Confidence level (default 0.95). */
  level?: number;
  /** Seed of the bootstrap (default 0). */
  seed?: RandomSource;
}

/**
 * The Fréchet distance between the Gaussian fits N(μ_a, Σ_a) and N(μ_b, Σ_b) of two
 * feature sets: `‖μ_a − μ_b‖² + tr Σ_a + tr Σ_b − 2 tr((Σ_a^½ Σ_b Σ_a^½)^½)`, the squared
 * Wasserstein-2 distance between the two Gaussians. Inputs are samples or
 * {@linkcode FeatureStatistics} (from arrays, `.npy` files, merges or precomputed pairs).
 * Means and covariances come in one stable pass by blocks; the trace term comes from a
 * Cholesky factor `Σ_a = L Lᵀ` and the eigenvalues of `Lᵀ Σ_b L` (an eigendecomposition
 * replaces Cholesky when `Σ_a` is singular, as with constant features), not a general sqrtm.
 *
 * Bias: the plug-in value is biased upward by roughly c/n; compare sets of equal size, or
 * use {@linkcode frechetExtrapolated} for the value at infinite n with an interval. Without
 * `replicates` the estimate has no interval (method "plug-in").
 *
 * References: Heusel et al. 2017, GANs trained by a two time-scale update rule converge to
 * a local Nash equilibrium (NeurIPS); Dowson & Landau 1982, The Fréchet distance between
 * multivariate normal distributions (J. Multivar. Anal.).
 *
 * @example
 * ```ts
 * import { frechetDistance } from "./frechet.ts";
 * import assert from "node:assert/strict";
 * const a = { mean: [0, 0], covariance: [[1, 0], [0, 1]] };
 * const b = { mean: [3, 4], covariance: [[4, 0], [0, 4]] };
 * // 25 + 2 + 8 − 2·(2 + 2) = 27
 * assert.ok(Math.abs(frechetDistance(a, b).value - 27) < 1e-12);
 * ```
 */
export function frechetDistance(
  a: SamplesInput | FeatureStatistics | StatisticsLike,
  b: SamplesInput | FeatureStatistics | StatisticsLike,
  options: FrechetOptions = {},
): Estimate {
  const sa = toStatistics(a, "a"), sb = toStatistics(b, "b");
  if (sa.d !== sb.d) {
    throw new SaddleError(
      "dimension-mismatch",
      `a has d = ${sa.d} but b has d = ${sb.d}; both must be features of the same space`,
      { parameter: "b" },
    );
  }
  const value = frechetOfStatistics(sa, sb);
  const n = sa.n + sb.n;
  const replicates = options.replicates ?? 0;
  if (replicates === 0) {
    return makeEstimate({
      value,
      method: "plug-in",
      n,
      unit: "distance",
      notes: ["biased upward by about c/n: use frechetExtrapolated for n → ∞ and an interval"],
    });
  }
  if (!isRawSamples(a) || !isRawSamples(b)) {
    throw new SaddleError(
      "invalid-argument",
      "an interval by the bootstrap needs the samples themselves, not their statistics; " +
        "pass the feature arrays or drop replicates",
      { parameter: "replicates" },
    );
  }
  const [x, y] = samplePair(a as SamplesInput, b as SamplesInput, 2);
  return bootstrap(
    [x.n, y.n],
    (ix, iy) =>
      frechetOfStatistics(featureStatistics(takeRows(x, ix)), featureStatistics(takeRows(y, iy))),
    { replicates, level: options.level ?? 0.95, seed: options.seed ?? 0, unit: "distance" },
  );
}

/** Statistics-like input: a precomputed mean and covariance (and optional n). */
export interface StatisticsLike {
  /** Column means. */
  readonly mean: ArrayLike<number>;
  /** Covariance, flat row-major or as rows. */
  readonly covariance: ArrayLike<number> | readonly ArrayLike<number>[];
  /** Rows behind them, when known. */
  readonly n?: number;
}

function isRawSamples(x: unknown): boolean {
  return !(typeof x === "object" && x !== null && !Array.isArray(x) && !ArrayBuffer.isView(x) &&
    "mean" in x);
}

function toStatistics(
  x: SamplesInput | FeatureStatistics | StatisticsLike,
  name: string,
): FeatureStatistics {
  if (isFeatureStatistics(x)) return x;
  if (!isRawSamples(x)) return featureStatistics(x as StatisticsLike);
  const s = samplePair(x as SamplesInput, x as SamplesInput, 2, [name, name])[0];
  return featureStatistics(s);
}

/** The Fréchet distance between two Gaussian fits given by their statistics. */
export function frechetOfStatistics(a: FeatureStatistics, b: FeatureStatistics): number {
  const d = a.d;
  let mean = 0, tr = 0;
  for (let i = 0; i < d; i++) {
    mean += (a.mean[i] - b.mean[i]) ** 2;
    tr += a.covariance[i * d + i] + b.covariance[i * d + i];
  }
  const cross = traceSqrtTerm(a.covariance, b.covariance, d);
  return Math.max(0, mean + tr - 2 * cross);
}

/** Options of {@linkcode frechetExtrapolated}. */
export interface FrechetExtrapolationOptions {
  /** Subsample sizes (per side) to fit over (default: `points` sizes from n/5 to n). */
  sizes?: readonly number[];
  /** Number of sizes when `sizes` is not given (default 8). */
  points?: number;
  /** Seed of the subsamples (default 0). */
  seed?: RandomSource;
  /** Confidence level of the interval (default 0.95). */
  level?: number;
  /** Called after each size with the number done and the total. */
  onProgress?: (done: number, total: number) => void;
}

/** The fit of the Fréchet distance against 1/n and its value at infinite n. */
export interface FrechetExtrapolation {
  /** FD at 1/n = 0, with the regression interval (method "extrapolation-1/n"). */
  readonly infinite: Estimate;
  /** Slope of FD against 1/n. */
  readonly slope: number;
  /** The subsample sizes and the distance at each. */
  readonly points: readonly { readonly n: number; readonly fd: number }[];
}

/**
 * The Fréchet distance extrapolated to infinite sample size: FD on random subsamples of
 * several sizes n (without replacement, the same n from each side), a least-squares line of
 * FD against 1/n, and its intercept with the t interval of the regression.
 *
 * References: Chong & Forsyth 2020, Effectively unbiased FID and Inception Score and where
 * to find them (CVPR); the t quantile by the expansion of Abramowitz & Stegun 26.7.5.
 *
 * @example
 * ```ts
 * import { frechetExtrapolated } from "./frechet.ts";
 * import { rng } from "../random/mod.ts";
 * import assert from "node:assert/strict";
 * const r = rng(3);
 * const a = Array.from({ length: 600 }, () => [r.normal(), r.normal()]);
 * const b = Array.from({ length: 600 }, () => [r.normal(1, 1), r.normal()]);
 * const fit = frechetExtrapolated(a, b, { seed: 1 });
 * assert.ok(Math.abs(fit.infinite.value - 1) < 0.3); // FD of N(0, I) and N((1, 0), I) is 1
 * ```
 */
export function frechetExtrapolated(
  a: SamplesInput,
  b: SamplesInput,
  options: FrechetExtrapolationOptions = {},
): FrechetExtrapolation {
  const [x, y] = samplePair(a, b, 2);
  const nMax = Math.min(x.n, y.n);
  const pts = options.points ?? 8;
  const sizes = options.sizes ?? Array.from(
    { length: pts },
    (_, i) => Math.round(nMax / 5 + (i * (nMax - nMax / 5)) / Math.max(1, pts - 1)),
  );
  if (sizes.length < 3) {
    throw new SaddleError("invalid-argument", "the fit needs at least 3 subsample sizes", {
      parameter: "sizes",
    });
  }
  for (const s of sizes) {
    if (!Number.isInteger(s) || s < Math.max(2, x.d + 1) || s > nMax) {
      throw new SaddleError(
        "invalid-argument",
        `subsample size ${s} must be an integer in [${x.d + 1}, ${nMax}] ` +
          "(above d for a covariance of full rank, at most the smaller set)",
        { parameter: "sizes" },
      );
    }
  }
  const r = toRng(options.seed ?? 0);
  const points = sizes.map((s, i) => {
    const fd = frechetOfStatistics(
      featureStatistics(takeRows(x, r.permutation(x.n).subarray(0, s))),
      featureStatistics(takeRows(y, r.permutation(y.n).subarray(0, s))),
    );
    options.onProgress?.(i + 1, sizes.length);
    return { n: s, fd };
  });
  const fit = lineFit(points.map((p) => 1 / p.n), points.map((p) => p.fd));
  const level = options.level ?? 0.95;
  const t = studentQuantile(level, points.length - 2);
  const infinite = makeEstimate({
    value: fit.intercept,
    se: fit.se,
    ci: [fit.intercept - t * fit.se, fit.intercept + t * fit.se],
    level,
    method: "extrapolation-1/n",
    n: x.n + y.n,
    unit: "distance",
    notes: [`least-squares line of FD against 1/n over ${points.length} subsample sizes`],
  });
  return Object.freeze(withDisplay({ infinite, slope: fit.slope, points }, (e) => {
    const rows = e.points.map((p) => [String(p.n), p.fd]);
    const caption = `Fréchet distance at n → ∞: ${e.infinite.value.toPrecision(5)} ` +
      `[${e.infinite.ci![0].toPrecision(5)}, ${e.infinite.ci![1].toPrecision(5)}], slope ${
        e.slope.toPrecision(4)
      }`;
    return {
      "text/plain": `${caption}\n${textTable(["n", "FD"], rows)}`,
      "text/html": htmlTable(["n", "FD"], rows, caption),
    };
  }));
}

function lineFit(xs: number[], ys: number[]): { intercept: number; slope: number; se: number } {
  const n = xs.length;
  const mx = xs.reduce((s, v) => s + v, 0) / n, my = ys.reduce((s, v) => s + v, 0) / n;
  let sxx = 0, sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (xs[i] - mx) ** 2;
    sxy += (xs[i] - mx) * (ys[i] - my);
  }
  const slope = sxy / sxx, intercept = my - slope * mx;
  let rss = 0;
  for (let i = 0; i < n; i++) rss += (ys[i] - intercept - slope * xs[i]) ** 2;
  const s2 = rss / (n - 2);
  return { intercept, slope, se: Math.sqrt(s2 * (1 / n + (mx * mx) / sxx)) };
}

/** Two-sided Student t critical value (Abramowitz & Stegun 26.7.5 expansion, ν ≥ 1). */
export function studentQuantile(level: number, nu: number): number {
  const z = normalCritical(level);
  const z3 = z ** 3, z5 = z ** 5, z7 = z ** 7;
  return z + (z3 + z) / (4 * nu) + (5 * z5 + 16 * z3 + 3 * z) / (96 * nu * nu) +
    (3 * z7 + 19 * z5 + 17 * z3 - 15 * z) / (384 * nu ** 3);
}
