/**
 * Intervals from bootstrap replicates: percentile, basic (reflected about the estimate, so
 * that the bootstrap's bias estimate is subtracted), bias-corrected percentile (BC) and
 * BCa (Efron 1987).
 *
 * @module
 */
import quantile from "@stdlib/stats-base-dists-normal-quantile";
import { SaddleError } from "../errors/saddle_error.ts";
import { quantileSorted } from "./bootstrap.ts";

/** How replicates become an interval. */
export type BootstrapIntervalMethod = "percentile" | "basic" | "bc" | "bca";

/** The interval methods, for validation and documentation. */
export const BOOTSTRAP_INTERVAL_METHODS: readonly BootstrapIntervalMethod[] = Object.freeze([
  "percentile",
  "basic",
  "bc",
  "bca",
]);

/** Options of {@linkcode bootstrapInterval}. */
export interface BootstrapIntervalOptions {
  /** The estimate on the original data (the plug-in). */
  value: number;
  /** Confidence level (default 0.95). */
  level?: number;
  /** Interval method (default "percentile"). */
  method?: BootstrapIntervalMethod;
  /** BCa acceleration `a` (default 0, which makes "bca" equal to "bc"). */
  acceleration?: number;
}

/**
 * Standard normal CDF by the complementary error function (Chebyshev fit, fractional
 * error below 1.2e-7; Press et al. 1992, Numerical Recipes, sec. 6.2).
 */
function normalCdf(x: number): number {
  const z = Math.abs(x) / Math.SQRT2;
  const t = 1 / (1 + 0.5 * z);
  const erfc = t * Math.exp(
    -z * z - 1.26551223 +
      t * (1.00002368 + t * (0.37409196 + t * (0.09678418 + t * (-0.18628806 +
                      t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 +
                                  t * (-0.82215223 + t * 0.17087277)))))))),
  );
  return x >= 0 ? 1 - 0.5 * erfc : 0.5 * erfc;
}

/**
 * An interval from bootstrap replicates of an estimate.
 *
 * - `"percentile"`: the (1 - level)/2 and (1 + level)/2 quantiles of the replicates.
 * - `"basic"`: the percentile interval reflected about the estimate,
 *   `[2 θ̂ - q_hi, 2 θ̂ - q_lo]`: centred on the bias-corrected estimate `θ̂ - bias` where
 *   bias = mean(θ*) - θ̂ to first order (Davison & Hinkley 1997, eq. 5.6).
 * - `"bc"`: percentiles at `Φ(2 z0 + z_α)` with `z0 = Φ⁻¹(#{θ* < θ̂} / B)`, the median
 *   bias of the replicates (Efron 1987).
 * - `"bca"`: BC with the acceleration `a`: `Φ(z0 + (z0 + z_α) / (1 - a (z0 + z_α)))`
 *   (Efron 1987; a from a jackknife).
 *
 * Non-finite replicates must be removed first. Fewer than 2 replicates give [NaN, NaN].
 *
 * References: Efron 1987, Better bootstrap confidence intervals (JASA 82:171-185);
 * Efron & Tibshirani 1993, An Introduction to the Bootstrap, ch. 13-14; Davison & Hinkley
 * 1997, Bootstrap Methods and their Application, sec. 5.2-5.3.
 *
 * @example A replicate cloud shifted above the estimate: basic and BC move the interval down
 * ```ts
 * import { bootstrapInterval } from "./bootstrap_interval.ts";
 * import assert from "node:assert/strict";
 * const reps = Array.from({ length: 999 }, (_, i) => 1.1 + (i - 499) / 1000);
 * const pct = bootstrapInterval(reps, { value: 1, method: "percentile" });
 * const basic = bootstrapInterval(reps, { value: 1, method: "basic" });
 * const bc = bootstrapInterval(reps, { value: 1, method: "bc" });
 * assert.ok(basic[0] < pct[0] && bc[0] < pct[0]);
 * assert.ok(Math.abs(basic[0] + basic[1] - 2 * 0.9) < 0.01); // centred on 1 - 0.1
 * ```
 */
export function bootstrapInterval(
  replicates: ArrayLike<number>,
  options: BootstrapIntervalOptions,
): [number, number] {
  const level = options.level ?? 0.95;
  const method = options.method ?? "percentile";
  if (!BOOTSTRAP_INTERVAL_METHODS.includes(method)) {
    throw new SaddleError(
      "invalid-argument",
      `interval must be one of ${BOOTSTRAP_INTERVAL_METHODS.join(", ")}, got ${method}`,
      { parameter: "interval" },
    );
  }
  if (!(level > 0 && level < 1)) {
    throw new SaddleError("invalid-argument", `level must be in (0, 1), got ${level}`, {
      parameter: "level",
    });
  }
  const B = replicates.length;
  if (B < 2) return [NaN, NaN];
  const sorted = Float64Array.from(replicates).sort();
  const alpha = (1 - level) / 2;
  const v = options.value;
  if (method === "percentile" || !Number.isFinite(v)) {
    return [quantileSorted(sorted, alpha), quantileSorted(sorted, 1 - alpha)];
  }
  if (method === "basic") {
    return [2 * v - quantileSorted(sorted, 1 - alpha), 2 * v - quantileSorted(sorted, alpha)];
  }
  let below = 0;
  for (let i = 0; i < B; i++) {
    if (sorted[i] < v) below++;
    else if (sorted[i] === v) below += 0.5;
  }
  // Keep z0 finite when the estimate lies outside the replicates.
  const frac = Math.min(Math.max(below / B, 0.5 / B), 1 - 0.5 / B);
  const z0 = quantile(frac, 0, 1);
  const a = method === "bca" ? (options.acceleration ?? 0) : 0;
  const adj = (za: number) => {
    const s = z0 + za;
    return normalCdf(z0 + s / (1 - a * s));
  };
  const zl = quantile(alpha, 0, 1), zh = quantile(1 - alpha, 0, 1);
  return [quantileSorted(sorted, adj(zl)), quantileSorted(sorted, adj(zh))];
}

/**
 * The BCa acceleration from jackknife values of the estimate (Efron 1987, eq. 6.6; for
 * several independent samples, the jackknife values of all samples together, each
 * deleted group's influence `mean - θ_(i)`): `a = Σ U³ / (6 (Σ U²)^(3/2))`.
 *
 * @example A symmetric jackknife gives no acceleration
 * ```ts
 * import { jackknifeAcceleration } from "./bootstrap_interval.ts";
 * import assert from "node:assert/strict";
 * assert.equal(jackknifeAcceleration([[1, 2, 3]]), 0);
 * ```
 */
export function jackknifeAcceleration(groups: readonly ArrayLike<number>[]): number {
  let num = 0, den = 0;
  for (const g of groups) {
    let mean = 0;
    for (let i = 0; i < g.length; i++) mean += g[i] / g.length;
    for (let i = 0; i < g.length; i++) {
      const u = mean - g[i];
      num += u * u * u;
      den += u * u;
    }
  }
  return den > 0 ? num / (6 * Math.pow(den, 1.5)) : 0;
}
