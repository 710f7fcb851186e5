/**
 * Numerically stable log-space helpers shared by the density, discriminator, value and
 * divergence code: no `log(0)` for saturated outputs, no overflow of `exp` for large
 * logits, sums of exponentials relative to their largest term.
 *
 * @module
 */

/** `log(2π)`, the constant of Gaussian log-densities. */
export const LOG_2PI: number = Math.log(2 * Math.PI);

/**
 * `log(1 + e^x)` without overflow for large x or loss of precision for very negative x.
 *
 * @example
 * ```ts
 * import { softplus } from "./log_space.ts";
 * import assert from "node:assert/strict";
 * assert.equal(softplus(0), Math.LN2);
 * assert.equal(softplus(1000), 1000);
 * ```
 */
export function softplus(x: number): number {
  return x > 0 ? x + Math.log1p(Math.exp(-x)) : Math.log1p(Math.exp(x));
}

/**
 * The logistic `1 / (1 + e^-x)`, evaluated on the side where `exp` cannot overflow.
 *
 * @example
 * ```ts
 * import { sigmoid } from "./log_space.ts";
 * import assert from "node:assert/strict";
 * assert.equal(sigmoid(0), 0.5);
 * assert.equal(sigmoid(-1000), 0);
 * ```
 */
export function sigmoid(x: number): number {
  if (x >= 0) return 1 / (1 + Math.exp(-x));
  const e = Math.exp(x);
  return e / (1 + e);
}

/**
 * `log sigmoid(x) = -softplus(-x)`: finite for every finite x, `-Infinity` at `-Infinity`.
 *
 * @example
 * ```ts
 * import { logSigmoid } from "./log_space.ts";
 * import assert from "node:assert/strict";
 * assert.equal(logSigmoid(0), -Math.LN2);
 * assert.equal(logSigmoid(-1000), -1000);
 * ```
 */
export function logSigmoid(x: number): number {
  return -softplus(-x);
}

/**
 * `log(e^a + e^b)` relative to the larger term; `-Infinity` when both are `-Infinity`.
 *
 * @example
 * ```ts
 * import { logAddExp } from "./log_space.ts";
 * import assert from "node:assert/strict";
 * assert.equal(logAddExp(0, 0), Math.LN2);
 * assert.equal(logAddExp(-Infinity, -Infinity), -Infinity);
 * ```
 */
export function logAddExp(a: number, b: number): number {
  if (a === -Infinity) return b;
  if (b === -Infinity) return a;
  return a > b ? a + Math.log1p(Math.exp(b - a)) : b + Math.log1p(Math.exp(a - b));
}

/**
 * The logit `log(p / (1 - p))` of a probability.
 *
 * @example
 * ```ts
 * import { logitOf } from "./log_space.ts";
 * import assert from "node:assert/strict";
 * assert.equal(logitOf(0.5), 0);
 * ```
 */
export function logitOf(p: number): number {
  return Math.log(p) - Math.log1p(-p);
}

/**
 * `log Σ exp(v_i)` over `v[from..to)` relative to the largest term; `-Infinity` for an
 * empty or all `-∞` input.
 *
 * @example
 * ```ts
 * import { logSumExp } from "./log_space.ts";
 * import assert from "node:assert/strict";
 * assert.equal(logSumExp([-1000, -1000]), -1000 + Math.LN2);
 * assert.equal(logSumExp([]), -Infinity);
 * ```
 */
export function logSumExp(v: ArrayLike<number>, from = 0, to: number = v.length): number {
  let m = -Infinity;
  for (let i = from; i < to; i++) if (v[i] > m) m = v[i];
  if (m === -Infinity) return -Infinity;
  if (m === Infinity) return Infinity;
  let s = 0;
  for (let i = from; i < to; i++) s += Math.exp(v[i] - m);
  return m + Math.log(s);
}
