/**
 * A weighted sum of two independent sample means with its standard error and a seeded
 * two-sample bootstrap interval: the estimate behind V(D, G), its gap and the log-loss.
 *
 * @module
 */
import { withHidden } from "./hidden.ts";
import { bootstrap } from "./bootstrap.ts";
import { type Estimate, type EstimateUnit, makeEstimate, meanVariance } from "./estimate.ts";
import type { RandomSource } from "../random/rng.ts";

/** Options of {@linkcode twoSampleSum}. */
export interface TwoSampleSumOptions {
  /** Weights of the two means (default [1, 1]). */
  weights?: readonly [number, number];
  /** Confidence level (default 0.95). */
  level?: number;
  /** Seed of the bootstrap (default 0). */
  seed?: RandomSource;
  /** Bootstrap replicates (default 1000). */
  replicates?: number;
  /** Unit of the result. */
  unit?: EstimateUnit;
  /** Notes to attach. */
  notes?: readonly string[];
}

/**
 * `w_a mean(a) + w_b mean(b)` for independent samples `a` and `b`: se² = w_a² s_a²/n_a +
 * w_b² s_b²/n_b, CI from a percentile bootstrap that resamples each side on its own.
 * When a term is infinite the value is that infinity, without se or interval. The
 * bootstrap replicates stay attached to the result (non-enumerable `replicates`, as on a
 * `BootstrapEstimate`).
 *
 * References: Efron & Tibshirani 1993, An Introduction to the Bootstrap, ch. 6 and 13.
 *
 * @example The difference of two means
 * ```ts
 * import { twoSampleSum } from "./two_sample.ts";
 * import assert from "node:assert/strict";
 * const a = Float64Array.from([1, 2, 3, 4]), b = Float64Array.from([0, 1, 0, 1]);
 * const e = twoSampleSum(a, b, { weights: [1, -1], seed: 1, replicates: 200 });
 * assert.equal(e.value, 2);
 * assert.ok(Math.abs(e.se! - Math.sqrt((5 / 3) / 4 + (1 / 3) / 4)) < 1e-12); // unbiased variances
 * ```
 */
export function twoSampleSum(
  a: Float64Array,
  b: Float64Array,
  options: TwoSampleSumOptions = {},
): Estimate {
  const [wa, wb] = options.weights ?? [1, 1];
  const level = options.level ?? 0.95;
  const notes = [...(options.notes ?? [])];
  const unit = options.unit ? { unit: options.unit } : {};
  const ma = meanVariance(a), mb = meanVariance(b);
  const value = wa * ma.mean + wb * mb.mean;
  const n = a.length + b.length;
  if (!Number.isFinite(value)) {
    notes.push(
      "a per-sample term is infinite (a saturated output on the wrong side): no standard error",
    );
    return makeEstimate({ value, level, method: "two-sample mean", n, notes, ...unit });
  }
  let se = Math.sqrt(wa * wa * ma.variance / a.length + wb * wb * mb.variance / b.length);
  if (a.length < 2 || b.length < 2) {
    notes.push("a side has a single point: no standard error");
    se = NaN;
  }
  const boot = bootstrap([a.length, b.length], (ia, ib) => {
    let sa = 0, sb = 0;
    for (let i = 0; i < ia.length; i++) sa += a[ia[i]];
    for (let i = 0; i < ib.length; i++) sb += b[ib[i]];
    return wa * sa / ia.length + wb * sb / ib.length;
  }, { level, seed: options.seed ?? 0, replicates: options.replicates ?? 1000 });
  // The replicates stay attached (non-enumerable) so plotBootstrap can draw them.
  return withHidden(
    makeEstimate({
      value,
      se,
      ...(boot.ci ? { ci: boot.ci } : {}),
      level,
      method: "two-sample mean, bootstrap-percentile CI",
      n,
      notes: [...notes, ...boot.notes],
      ...unit,
    }),
    { replicates: boot.replicates },
  );
}
