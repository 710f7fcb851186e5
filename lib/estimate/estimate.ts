/**
 * The `Estimate` type: every number saddlekit estimates carries its error.
 *
 * @module
 */
import quantile from "@stdlib/stats-base-dists-normal-quantile";
import { SaddleError } from "../errors/saddle_error.ts";
import { estimateHtml, formatEstimate } from "./format.ts";

export type { Estimate, EstimateFields, EstimateUnit } from "./types.ts";
import type { Estimate, EstimateFields, EstimateUnit } from "./types.ts";
import { JUPYTER_DISPLAY as DISPLAY } from "../display/display.ts";

/**
 * Make an {@linkcode Estimate}. The result is a plain frozen object (JSON-serialisable)
 * with a non-enumerable rich display for notebook cells.
 *
 * @example
 * ```ts
 * import { makeEstimate } from "./estimate.ts";
 * import assert from "node:assert/strict";
 * const e = makeEstimate({ value: 0.5, se: 0.1, method: "monte-carlo", n: 100 });
 * assert.equal(e.level, 0.95);
 * assert.deepEqual(Object.keys(JSON.parse(JSON.stringify(e))).sort(),
 *   ["level", "method", "n", "notes", "se", "value"]);
 * ```
 */
export function makeEstimate(fields: EstimateFields): Estimate {
  const level = fields.level ?? 0.95;
  if (!(level > 0 && level < 1)) {
    throw new SaddleError("invalid-argument", `level must be in (0, 1), got ${level}`, {
      parameter: "level",
    });
  }
  const e: Estimate = {
    value: fields.value,
    ...(fields.se !== undefined ? { se: fields.se } : {}),
    ...(fields.ci !== undefined ? { ci: [fields.ci[0], fields.ci[1]] as const } : {}),
    level,
    method: fields.method,
    n: fields.n,
    ...(fields.unit !== undefined ? { unit: fields.unit } : {}),
    notes: [...(fields.notes ?? [])],
  };
  Object.defineProperty(e, DISPLAY, {
    enumerable: false,
    value: () => ({ "text/plain": formatEstimate(e), "text/html": estimateHtml(e) }),
  });
  return Object.freeze(e);
}

/**
 * An exact value (no sampling error).
 *
 * @example
 * ```ts
 * import { exact } from "./estimate.ts";
 * import assert from "node:assert/strict";
 * assert.equal(exact(-Math.log(4), "nats").method, "exact");
 * ```
 */
export function exact(value: number, unit?: EstimateUnit, notes: readonly string[] = []): Estimate {
  return makeEstimate({
    value,
    method: "exact",
    n: 0,
    level: 0.95,
    notes,
    ...(unit ? { unit } : {}),
  });
}

/**
 * The two-sided standard normal critical value for a confidence level, e.g. 1.959964 for
 * 0.95.
 *
 * @example
 * ```ts
 * import { normalCritical } from "./estimate.ts";
 * import assert from "node:assert/strict";
 * assert.ok(Math.abs(normalCritical(0.95) - 1.959963984540054) < 1e-12);
 * ```
 */
export function normalCritical(level: number): number {
  return quantile(0.5 + level / 2, 0, 1);
}

/** Options of {@linkcode meanEstimate}. */
export interface MeanEstimateOptions {
  /** Confidence level (default 0.95). */
  level?: number;
  /** Method name recorded in the estimate (default "monte-carlo"). */
  method?: string;
  /** Unit of the terms. */
  unit?: EstimateUnit;
  /** Notes to attach. */
  notes?: readonly string[];
}

/**
 * The mean of per-sample terms with its standard error `s / sqrt(n)` and a normal
 * interval: the estimate behind every Monte Carlo expectation.
 *
 * @example
 * ```ts
 * import { meanEstimate } from "./estimate.ts";
 * import assert from "node:assert/strict";
 * const e = meanEstimate(new Float64Array([1, 2, 3, 4]));
 * assert.equal(e.value, 2.5);
 * assert.ok(Math.abs(e.se! - Math.sqrt(5 / 3 / 4)) < 1e-15);
 * ```
 */
export function meanEstimate(
  terms: ArrayLike<number>,
  options: MeanEstimateOptions = {},
): Estimate {
  const n = terms.length;
  if (n === 0) throw new SaddleError("empty", "no terms to average", { parameter: "terms" });
  for (let i = 0; i < n; i++) {
    if (Number.isNaN(terms[i])) {
      throw new SaddleError(
        "non-finite",
        `term ${i} is NaN; drop it or fix what produced it before averaging`,
        { parameter: "terms", row: i },
      );
    }
  }
  const { mean, variance } = meanVariance(terms);
  const level = options.level ?? 0.95;
  const se = n > 1 ? Math.sqrt(variance / n) : NaN;
  const z = normalCritical(level);
  const notes = [...(options.notes ?? [])];
  if (n === 1) notes.push("one term only: no standard error");
  else if (!Number.isFinite(mean)) notes.push("a term is infinite: no standard error");
  return makeEstimate({
    value: mean,
    se,
    ci: [mean - z * se, mean + z * se],
    level,
    method: options.method ?? "monte-carlo",
    n,
    notes,
    ...(options.unit ? { unit: options.unit } : {}),
  });
}

/**
 * Mean and unbiased variance in one pass (Welford), stable for large offsets. A non-finite
 * term (Welford would give NaN) makes the plain sum decide the mean (±Infinity, or NaN for
 * +Infinity with -Infinity) and the variance NaN.
 *
 * @example
 * ```ts
 * import { meanVariance } from "./estimate.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual(meanVariance([1e9 + 1, 1e9 + 2, 1e9 + 3]), { mean: 1e9 + 2, variance: 1 });
 * ```
 */
export function meanVariance(x: ArrayLike<number>): { mean: number; variance: number } {
  let mean = 0, m2 = 0;
  for (let i = 0; i < x.length; i++) {
    if (!Number.isFinite(x[i])) {
      let sum = 0;
      for (let j = 0; j < x.length; j++) sum += x[j];
      return { mean: sum / x.length, variance: NaN };
    }
    const delta = x[i] - mean;
    mean += delta / (i + 1);
    m2 += delta * (x[i] - mean);
  }
  return { mean, variance: x.length > 1 ? m2 / (x.length - 1) : NaN };
}
