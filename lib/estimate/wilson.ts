/**
 * The Wilson score interval of a proportion.
 *
 * @module
 */
import { normalCritical } from "./estimate.ts";

/**
 * Wilson score interval of a proportion `p` observed on `n` trials.
 *
 * References: Wilson 1927, Probable inference, the law of succession, and statistical
 * inference (JASA).
 *
 * @example
 * ```ts
 * import { wilsonInterval } from "./wilson.ts";
 * import assert from "node:assert/strict";
 * const [lo, hi] = wilsonInterval(0.5, 100, 0.95);
 * assert.ok(Math.abs(lo - 0.4038) < 1e-4 && Math.abs(hi - 0.5962) < 1e-4);
 * ```
 */
export function wilsonInterval(p: number, n: number, level = 0.95): [number, number] {
  if (!(n > 0) || !(p >= 0 && p <= 1)) return [NaN, NaN];
  const z = normalCritical(level), z2 = z * z;
  const centre = (p + z2 / (2 * n)) / (1 + z2 / n);
  const half = (z / (1 + z2 / n)) * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n));
  return [Math.max(0, centre - half), Math.min(1, centre + half)];
}
