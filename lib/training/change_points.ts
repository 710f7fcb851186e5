/**
 * Change points in the mean of a series: PELT (exact, with pruning) and plain optimal
 * partitioning by dynamic programming (exact, quadratic) for checking it.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";

/** Options of {@linkcode changePoints}. */
export interface ChangePointOptions {
  /**
   * Penalty per segment, in units of the noise variance (default `2 ln n`, Schwarz's
   * criterion for one mean and one location per change).
   */
  penalty?: number;
  /** Shortest segment, in records (default 5). */
  minSegment?: number;
  /** Noise variance (default: robust, from the median absolute first difference). */
  variance?: number;
  /** "pelt" (default) or "exact" (optimal partitioning, O(n^2); for checks and short series). */
  method?: "pelt" | "exact";
}

/** The optimal segmentation of a series into pieces of constant mean. */
export interface ChangePoints {
  /** Indices where a new segment starts (the first record after each change), increasing. */
  readonly changePoints: readonly number[];
  /** Mean of each segment. */
  readonly means: readonly number[];
  /** Sum of the segments' squared errors over the variance, plus the penalty per segment. */
  readonly cost: number;
  /** Penalty per segment used. */
  readonly penalty: number;
  /** Noise variance used. */
  readonly variance: number;
  /** Method used. */
  readonly method: "pelt" | "exact";
}

/**
 * Robust noise standard deviation of a series with shifts and trends: 1.4826 times the
 * median absolute first difference, over sqrt 2 (the MAD of the differences, which a few
 * level shifts do not move).
 *
 * @example
 * ```ts
 * import { differenceSigma } from "./change_points.ts";
 * import assert from "node:assert/strict";
 * assert.equal(differenceSigma([0, 0, 0, 5, 5, 5]), 0);
 * ```
 */
export function differenceSigma(x: ArrayLike<number>): number {
  const d: number[] = [];
  for (let i = 1; i < x.length; i++) {
    const v = Math.abs(x[i] - x[i - 1]);
    if (Number.isFinite(v)) d.push(v);
  }
  if (d.length === 0) return NaN;
  d.sort((a, b) => a - b);
  const h = d.length >> 1;
  const med = d.length % 2 ? d[h] : (d[h - 1] + d[h]) / 2;
  return (1.4826 * med) / Math.SQRT2;
}

/**
 * Change points in the mean of `x` (finite values), minimising the Gaussian cost
 * `sum over segments of sum (x - segment mean)^2 / variance + penalty x segments` with
 * every segment at least `minSegment` long. "pelt" finds the same optimum as "exact"
 * (optimal partitioning) while pruning candidates that can never be optimal again, which
 * makes it close to linear when changes are frequent. Deterministic: no seed is needed.
 *
 * References: Jackson et al. 2005, An algorithm for optimal partitioning of data on an
 * interval (IEEE Signal Proc. Letters), the exact dynamic program; Killick, Fearnhead &
 * Eckley 2012, Optimal detection of changepoints with a linear computational cost (JASA),
 * PELT; Schwarz 1978 for the default penalty.
 *
 * @example One shift of the mean at record 50
 * ```ts
 * import { changePoints } from "./change_points.ts";
 * import assert from "node:assert/strict";
 * const x = Array.from({ length: 100 }, (_, i) =>
 *   (i < 50 ? 0 : 3) + 0.5 * ((Math.sin(i * 78.233) * 43758.5453) % 1));
 * assert.deepEqual(changePoints(x).changePoints, [50]);
 * ```
 */
export function changePoints(x: ArrayLike<number>, options: ChangePointOptions = {}): ChangePoints {
  const n = x.length;
  const method = options.method ?? "pelt";
  const m = options.minSegment ?? 5;
  if (!Number.isInteger(m) || m < 1) {
    throw new SaddleError("invalid-argument", `minSegment must be a positive integer, got ${m}`, {
      parameter: "minSegment",
    });
  }
  if (n < 1) throw new SaddleError("empty", "no values", { parameter: "x" });
  const s1 = new Float64Array(n + 1), s2 = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(x[i])) {
      throw new SaddleError("non-finite", `value ${i} is ${x[i]}; fill or drop it first`, {
        parameter: "x",
        row: i,
      });
    }
    s1[i + 1] = s1[i] + x[i];
    s2[i + 1] = s2[i] + x[i] * x[i];
  }
  let variance = options.variance ?? differenceSigma(x) ** 2;
  if (!(variance > 0)) {
    variance = Math.max(1e-12, (s2[n] - (s1[n] * s1[n]) / n) / Math.max(1, n - 1)) || 1e-12;
  }
  const beta = options.penalty ?? 2 * Math.log(Math.max(n, 2));
  if (!(beta >= 0)) {
    throw new SaddleError("invalid-argument", `penalty must be >= 0, got ${beta}`, {
      parameter: "penalty",
    });
  }
  // Cost of x[a..b): squared error about its mean, over the variance.
  const cost = (a: number, b: number) => {
    const l = b - a, s = s1[b] - s1[a];
    return Math.max(0, s2[b] - s2[a] - (s * s) / l) / variance;
  };
  const f = new Float64Array(n + 1).fill(Infinity);
  const last = new Int32Array(n + 1).fill(-1);
  f[0] = -beta;
  if (method === "exact") {
    for (let t = m; t <= n; t++) {
      for (let tau = 0; tau <= t - m; tau++) {
        if (f[tau] === Infinity) continue;
        const v = f[tau] + cost(tau, t) + beta;
        if (v < f[t]) {
          f[t] = v;
          last[t] = tau;
        }
      }
    }
  } else {
    // Candidates of the last change, with the end at which each was found dominated
    // (-1: not yet). A candidate worse than f(t) at end t stays worse for every end
    // T >= t + minSegment (Killick et al. 2012, Thm. 3.1, with K = 0 for this cost), so it
    // is dropped then; before that, T - t < minSegment forbids t as the last change.
    let cand = new Int32Array(n + 1), dead = new Int32Array(n + 1);
    let next = new Int32Array(n + 1), nextDead = new Int32Array(n + 1);
    let size = 1;
    cand[0] = 0;
    dead[0] = -1;
    for (let t = m; t <= n; t++) {
      let best = Infinity, arg = -1;
      for (let j = 0; j < size; j++) {
        const tau = cand[j];
        if (t - tau < m) continue;
        const v = f[tau] + cost(tau, t) + beta;
        if (v < best) {
          best = v;
          arg = tau;
        }
      }
      f[t] = best;
      last[t] = arg;
      let kept = 0;
      for (let j = 0; j < size; j++) {
        const tau = cand[j];
        let d = dead[j];
        if (d < 0 && t - tau >= m && f[tau] + cost(tau, t) > best) d = t;
        if (d >= 0 && t + 1 >= d + m) continue;
        next[kept] = tau;
        nextDead[kept++] = d;
      }
      if (best < Infinity) {
        next[kept] = t;
        nextDead[kept++] = -1;
      }
      [cand, next] = [next, cand];
      [dead, nextDead] = [nextDead, dead];
      size = kept;
    }
  }
  if (f[n] === Infinity) {
    return Object.freeze({
      changePoints: [],
      means: [s1[n] / n],
      cost: cost(0, n),
      penalty: beta,
      variance,
      method,
    });
  }
  const cps: number[] = [];
  for (let t = last[n]; t > 0; t = last[t]) cps.unshift(t);
  const bounds = [0, ...cps, n];
  const means = bounds.slice(1).map((b, i) => (s1[b] - s1[bounds[i]]) / (b - bounds[i]));
  return Object.freeze({ changePoints: cps, means, cost: f[n], penalty: beta, variance, method });
}
