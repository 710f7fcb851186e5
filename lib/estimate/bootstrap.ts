/**
 * Seeded nonparametric bootstrap with percentile intervals (Efron 1979).
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { withHidden } from "./hidden.ts";
import { type RandomSource, toRng } from "../random/rng.ts";
import { type Estimate, type EstimateUnit, makeEstimate, meanVariance } from "./estimate.ts";

/** Options of {@linkcode bootstrap}. */
export interface BootstrapOptions {
  /** Number of bootstrap replicates (default 1000). */
  replicates?: number;
  /** Confidence level of the percentile interval (default 0.95). */
  level?: number;
  /** Seed or Rng for the resampling (default 0). */
  seed?: RandomSource;
  /** Unit of the statistic. */
  unit?: EstimateUnit;
}

/**
 * The replicate values a bootstrap estimate carries beside its JSON fields (non-enumerable).
 * Declared as an accessor so that a spread copy, which loses them, loses them in its type
 * too: `const c: BootstrapEstimate = { ...e }` does not compile.
 */
declare class BootstrapReplicates {
  /** The statistic on each bootstrap resample, in draw order (hidden: not in JSON). */
  get replicates(): Float64Array;
}
// Type-only: the class exists for the types alone (no runtime value to import).
export type { BootstrapReplicates };

/**
 * An {@linkcode Estimate} from the bootstrap, with the replicate values (non-enumerable:
 * read them from the estimate itself, not from a spread or JSON copy).
 */
export interface BootstrapEstimate extends Estimate, BootstrapReplicates {}

/**
 * Bootstrap a statistic of one or more independent samples.
 *
 * `sizes` gives the size of each sample; `statistic` receives one index array per sample
 * (into that sample) and returns a number. The point estimate is the statistic on the
 * original samples (identity indices), `se` is the standard deviation of the replicates and
 * `ci` the percentile interval (Efron & Tibshirani 1993, ch. 13). Each sample is resampled
 * independently with replacement. Replicates where the statistic is not finite are dropped
 * and counted in `notes`.
 *
 * References: Efron 1979, Bootstrap methods: another look at the jackknife (Ann. Stat.).
 *
 * @example Standard error of a mean
 * ```ts
 * import { bootstrap } from "./bootstrap.ts";
 * import assert from "node:assert/strict";
 * const x = Float64Array.from({ length: 200 }, (_, i) => i % 10);
 * const mean = (idx: Uint32Array) => { let s = 0; for (const i of idx) s += x[i]; return s / idx.length; };
 * const e = bootstrap(x.length, (idx) => mean(idx), { seed: 1, replicates: 500 });
 * assert.equal(e.value, 4.5);
 * assert.ok(e.se! > 0.15 && e.se! < 0.26); // sd 2.87 / sqrt(200) = 0.203
 * assert.ok(e.ci![0] < 4.5 && 4.5 < e.ci![1]);
 * ```
 */
export function bootstrap(
  sizes: number | readonly number[],
  statistic: (...indices: Uint32Array[]) => number,
  options: BootstrapOptions = {},
): BootstrapEstimate {
  const ns = typeof sizes === "number" ? [sizes] : [...sizes];
  const B = options.replicates ?? 1000;
  const level = options.level ?? 0.95;
  if (!Number.isInteger(B) || B < 2) {
    throw new SaddleError("invalid-argument", `replicates must be an integer >= 2, got ${B}`, {
      parameter: "replicates",
    });
  }
  for (const n of ns) {
    if (!Number.isInteger(n) || n < 1) {
      throw new SaddleError("too-few-samples", `cannot bootstrap a sample of size ${n}`, {
        parameter: "sizes",
      });
    }
  }
  const r = toRng(options.seed ?? 0);
  const identity = ns.map((n) => {
    const a = new Uint32Array(n);
    for (let i = 0; i < n; i++) a[i] = i;
    return a;
  });
  const value = statistic(...identity);
  const buffers = ns.map((n) => new Uint32Array(n));
  const reps = new Float64Array(B);
  let kept = 0;
  for (let b = 0; b < B; b++) {
    for (let s = 0; s < ns.length; s++) r.bootstrapIndices(ns[s], ns[s], buffers[s]);
    const v = statistic(...buffers);
    if (Number.isFinite(v)) reps[kept++] = v;
  }
  const replicates = reps.slice(0, kept);
  const notes: string[] = [`${B} bootstrap replicates, seed ${r.seed}`];
  if (kept < B) notes.push(`${B - kept} replicates gave a non-finite statistic and were dropped`);
  const ci: [number, number] = kept > 1 ? percentileInterval(replicates, level) : [NaN, NaN];
  const est = makeEstimate({
    value,
    se: kept > 1 ? Math.sqrt(meanVariance(replicates).variance) : NaN,
    ci,
    level,
    method: "bootstrap-percentile",
    n: ns.reduce((a, b) => a + b, 0),
    notes,
    ...(options.unit ? { unit: options.unit } : {}),
  });
  return withHidden(est, { replicates }) as BootstrapEstimate;
}

/**
 * Quantile of sorted values by linear interpolation (numpy's default, "type 7").
 *
 * @example
 * ```ts
 * import { quantileSorted } from "./bootstrap.ts";
 * import assert from "node:assert/strict";
 * assert.equal(quantileSorted([1, 2, 3, 4], 0.5), 2.5);
 * ```
 */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, n - 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/**
 * The percentile interval `[q_(1-level)/2, q_(1+level)/2]` of bootstrap replicates, with
 * {@linkcode quantileSorted}'s interpolation (the input is not modified).
 *
 * References: Efron & Tibshirani 1993, An Introduction to the Bootstrap, ch. 13.
 *
 * @example
 * ```ts
 * import { percentileInterval } from "./bootstrap.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual(percentileInterval([4, 0, 3, 1, 2], 0.5), [1, 3]);
 * ```
 */
export function percentileInterval(replicates: ArrayLike<number>, level: number): [number, number] {
  const sorted = Float64Array.from(replicates).sort();
  const alpha = (1 - level) / 2;
  return [quantileSorted(sorted, alpha), quantileSorted(sorted, 1 - alpha)];
}
