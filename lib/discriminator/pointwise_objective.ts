/**
 * The pointwise discriminator objective `a ln y + b ln(1 - y)` and its maximiser.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";

function checkWeights(a: number, b: number): void {
  for (const [name, v] of [["a", a], ["b", b]] as const) {
    if (!(v >= 0) || v === Infinity) {
      throw new SaddleError("invalid-argument", `${name} must be finite and >= 0, got ${v}`, {
        parameter: name,
      });
    }
  }
  if (a + b === 0) {
    throw new SaddleError("invalid-argument", "a and b are both 0: the objective is flat", {
      parameter: "a",
    });
  }
}

/**
 * `a ln y + b ln(1 - y)` for `y` in [0, 1]: the integrand of the value function at a point
 * where `a = p_data(x)` and `b = p_g(x)`. Returns `-Infinity` at y = 0 (when a > 0) and at
 * y = 1 (when b > 0); a zero weight makes its term 0, not NaN. Accepts a number or an array
 * (to plot the curve).
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Prop. 1.
 *
 * @example
 * ```ts
 * import { pointwiseObjective } from "./pointwise_objective.ts";
 * import assert from "node:assert/strict";
 * assert.equal(pointwiseObjective(1, 1, 0.5), 2 * Math.log(0.5));
 * assert.equal(pointwiseObjective(0, 1, 0), 0);
 * assert.equal(pointwiseObjective(1, 1, 1), -Infinity);
 * ```
 */
export function pointwiseObjective(a: number, b: number, y: number): number;
/**
 * The objective at each `y` of an array (to plot the curve over y).
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Prop. 1.
 *
 * @example
 * ```ts
 * import { pointwiseObjective } from "./pointwise_objective.ts";
 * import assert from "node:assert/strict";
 * const v = pointwiseObjective(1, 1, [0.25, 0.5]);
 * assert.equal(v[1], 2 * Math.log(0.5));
 * ```
 */
export function pointwiseObjective(a: number, b: number, y: ArrayLike<number>): Float64Array;
export function pointwiseObjective(
  a: number,
  b: number,
  y: number | ArrayLike<number>,
): number | Float64Array {
  checkWeights(a, b);
  const one = (v: number, i?: number): number => {
    if (!(v >= 0 && v <= 1)) {
      throw new SaddleError("invalid-argument", `y must be in [0, 1], got ${v}`, {
        parameter: "y",
        ...(i !== undefined ? { row: i } : {}),
      });
    }
    return (a === 0 ? 0 : a * Math.log(v)) + (b === 0 ? 0 : b * Math.log1p(-v));
  };
  if (typeof y === "number") return one(y);
  const out = new Float64Array(y.length);
  for (let i = 0; i < y.length; i++) out[i] = one(y[i], i);
  return out;
}

/**
 * The maximiser `a / (a + b)` of {@linkcode pointwiseObjective} over y in [0, 1], for
 * `a, b >= 0` not both 0: the optimal discriminator at a point with densities a and b.
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Prop. 1.
 *
 * @example
 * ```ts
 * import { pointwiseMaximiser } from "./pointwise_objective.ts";
 * import assert from "node:assert/strict";
 * assert.equal(pointwiseMaximiser(3, 1), 0.75);
 * assert.equal(pointwiseMaximiser(1e308, 1e308), 0.5); // no overflow of a + b
 * ```
 */
export function pointwiseMaximiser(a: number, b: number): number {
  checkWeights(a, b);
  // Divide by the larger weight first: a + b overflows for weights near 1e308.
  if (a === b) return 0.5;
  return a > b ? 1 / (1 + b / a) : (a / b) / (1 + a / b);
}
