/**
 * Types of the Gaussian KDE: bandwidth rules and values, fit and parallel options, the
 * evaluator names and the fitted density.
 *
 * @module
 */
import type { MatrixInput } from "../linalg/matrix_input.ts";
import type { Samples } from "../samples/types.ts";
import type { Density } from "./types.ts";

/** Which evaluator: sorted array (1-D), k-d tree (low d), blocked brute force (any d). */
export type EvalMethod = "sorted" | "tree" | "blocked" | "fgt";

/** A named bandwidth rule. */
export type BandwidthRule = "scott" | "silverman" | "cv" | "diffusion";

/**
 * A bandwidth: a rule, a factor (number: kernel covariance = data covariance x factor²),
 * the kernel covariance matrix itself (row-major `d * d` values or rows; in 1-D `[h²]`), or
 * for d >= 2 its diagonal (`d` per-axis variances).
 */
export type Bandwidth = BandwidthRule | number | Exclude<MatrixInput, number>;

/** Options of `fitKde`. */
export interface KdeOptions {
  /** Bandwidth rule, factor or matrix (default "scott"). */
  bandwidth?: Bandwidth;
  /** Per-sample weights (non-negative, not all 0); zero-weight points are dropped. */
  weights?: ArrayLike<number>;
  /** Factors tried by `"cv"` (default: 25 log-spaced in [1/8, 2] x Scott, then refined). */
  cvFactors?: ArrayLike<number>;
  /** Held-out points used by `"cv"` (default 1000; evenly spaced rows when n is larger). */
  cvMaxPoints?: number;
  /**
   * Evaluator (default: sorted for 1-D, "fgt" for 2-D, k-d tree for 3-D, blocked for d >= 4).
   * "fgt" (2-D only) runs jobs of at least 5e7 centre-query pairs through the fast Gauss
   * transform, with a guaranteed relative error of at most 1e-10 on the density (queries
   * where the bound is not met go to the exact tree), and smaller jobs through the tree.
   */
  method?: EvalMethod;
  /**
   * Jobs of at least this many kernel terms (fit points x queries) make `logPdf` split the
   * queries across Web Workers and wait for them (default 5e7; Infinity keeps it on this
   * thread). The values are identical either way.
   */
  parallelMinPairs?: number;
}

/** Options of {@linkcode KdeDensity.logPdfParallel}. */
export interface ParallelOptions {
  /** Number of workers (default `navigator.hardwareConcurrency`, at most 8). */
  workers?: number;
  /**
   * Smallest job (fit points x query points) worth workers (default 4e6; the 1-D evaluator
   * counts at most 1000 points a query and needs 100 times more, since it is much faster).
   */
  minPairs?: number;
}

/** A fitted Gaussian KDE. */
export interface KdeDensity extends Density {
  /** Kernel centres (the fitted points with positive weight). */
  readonly points: Samples;
  /** Normalised weights of the centres (sum 1). */
  readonly weights: Float64Array;
  /** Kernel covariance H (row-major d x d); in 1-D `[h²]`. */
  readonly bandwidth: Float64Array;
  /** The factor with H = data covariance x factor², when H was built that way. */
  readonly factor?: number;
  /** How H was chosen: "scott", "silverman", "cv", "diffusion", "factor", "matrix", "diagonal". */
  readonly rule: string;
  /** Effective sample size (Kish) of the weights; n without weights. */
  readonly neff: number;
  /** The exact evaluator in use. */
  readonly method: EvalMethod;
  /** `logPdf` split across Web Workers when the job is large enough (same values). */
  logPdfParallel(x: Samples, options?: ParallelOptions): Promise<Float64Array>;
}
