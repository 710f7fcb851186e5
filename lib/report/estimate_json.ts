/**
 * Estimates as summary.json writes them, and the bias-corrected refit-bootstrap estimate
 * the report leads with.
 *
 * @module
 */
import type { Estimate } from "../estimate/mod.ts";
import { makeEstimate } from "../estimate/mod.ts";
import { meanVariance } from "../estimate/mod.ts";
import { percentileInterval } from "../estimate/mod.ts";
import { type Json, numberJson } from "./json.ts";

/**
 * An Estimate as summary.json holds it: `{ value, se, ci, level, method, n, unit, notes }`
 * with `se` and `ci` null when there are none (exact values) and non-finite numbers as
 * strings.
 *
 * @example
 * ```ts
 * import { estimateJson } from "./estimate_json.ts";
 * import { makeEstimate } from "../estimate/mod.ts";
 * import assert from "node:assert/strict";
 * const e = makeEstimate({ value: Infinity, method: "grid", n: 0 });
 * assert.deepEqual(estimateJson(e), { value: "Infinity", se: null, ci: null, level: 0.95,
 *   method: "grid", n: 0, unit: "none", notes: [] });
 * ```
 */
export function estimateJson(e: Estimate): Json {
  return {
    value: numberJson(e.value),
    se: e.se === undefined ? null : numberJson(e.se),
    ci: e.ci ? [numberJson(e.ci[0]), numberJson(e.ci[1])] : null,
    level: e.level,
    method: e.method,
    n: e.n,
    unit: e.unit ?? "none",
    notes: [...e.notes],
  };
}

/**
 * The bootstrap bias-corrected estimate `2θ̂ − mean(θ*)` with the basic bootstrap interval
 * `[2θ̂ − q(1 − α/2), 2θ̂ − q(α/2)]`, both clipped to the quantity's known range. Plug-in
 * divergences between fitted densities are biased upward on small samples (two fits to
 * samples of one distribution still differ); the basic interval reflects the replicates
 * about the plug-in value and so corrects for that bias where the percentile interval
 * cannot (for equal distributions every replicate of the JSD is positive). The interval is
 * widened to contain the plug-in value: when the estimated bias exceeds the spread of the
 * replicates, the basic interval alone would exclude the plug-in and claim more than the
 * bootstrap knows (the bias estimate has its own error).
 *
 * References: Efron & Tibshirani 1993, An Introduction to the Bootstrap, ch. 10 (bias
 * correction); Davison & Hinkley 1997, Bootstrap Methods and their Application, §5.2
 * (basic interval).
 *
 * @example
 * ```ts
 * import { biasCorrected } from "./estimate_json.ts";
 * import assert from "node:assert/strict";
 * const reps = Float64Array.from({ length: 101 }, (_, i) => 0.03 + i * 0.0002); // mean 0.04
 * const e = biasCorrected({ value: 0.05, replicates: reps, n: 400, level: 0.9, range: [0, Math.LN2] });
 * assert.ok(Math.abs(e.value - 0.06) < 1e-12); // 2 × 0.05 − 0.04
 * const f = biasCorrected({ value: 0.01, replicates: reps, n: 400, level: 0.9, range: [0, Math.LN2] });
 * assert.deepEqual([f.value, f.ci![0]], [0, 0]); // clipped to the range
 * ```
 */
export function biasCorrected(input: {
  value: number;
  replicates: ArrayLike<number>;
  n: number;
  level: number;
  range: readonly [number, number];
  unit?: Estimate["unit"];
  notes?: readonly string[];
}): Estimate {
  const { value, replicates, level, range } = input;
  const clip = (x: number) => Math.min(range[1], Math.max(range[0], x));
  const { mean, variance } = meanVariance(replicates);
  const [qLo, qHi] = percentileInterval(replicates, level);
  const bc = clip(2 * value - mean);
  return makeEstimate({
    value: bc,
    se: Math.sqrt(variance),
    ci: [clip(Math.min(2 * value - qHi, value)), clip(Math.max(2 * value - qLo, value))],
    level,
    method: "bootstrap-basic (refit, bias-corrected)",
    n: input.n,
    ...(input.unit ? { unit: input.unit } : {}),
    notes: [
      `plug-in ${round(value)}, bootstrap bias estimate ${round(mean - value)} removed; ` +
      `${replicates.length} refit replicates`,
      ...(input.notes ?? []),
    ],
  });
}

function round(x: number): string {
  return Number(x.toPrecision(4)).toString();
}

/**
 * An estimate in a sentence: the value and its interval to 3 significant digits.
 *
 * @example
 * ```ts
 * import { formatShort } from "./estimate_json.ts";
 * import { makeEstimate } from "../estimate/mod.ts";
 * import assert from "node:assert/strict";
 * assert.equal(formatShort(makeEstimate({ value: 0.12345, ci: [0.1, 0.15], method: "x", n: 9 })),
 *   "0.123 [0.1, 0.15]");
 * ```
 */
export function formatShort(e: Estimate): string {
  const r = (x: number) => Number(x.toPrecision(3)).toString();
  return e.ci ? `${r(e.value)} [${r(e.ci[0])}, ${r(e.ci[1])}]` : r(e.value);
}
