/**
 * Numerically stable logistic helpers shared by the discriminator, value and divergence
 * code: no `log(0)` for saturated outputs, no overflow of `exp` for large logits.
 *
 * @module
 */

/** `log(1 + e^x)` without overflow for large x or loss of precision for very negative x. */
export function softplus(x: number): number {
  return x > 0 ? x + Math.log1p(Math.exp(-x)) : Math.log1p(Math.exp(x));
}

/** The logistic `1 / (1 + e^-x)`, evaluated on the side where `exp` cannot overflow. */
export function sigmoid(x: number): number {
  if (x >= 0) return 1 / (1 + Math.exp(-x));
  const e = Math.exp(x);
  return e / (1 + e);
}

/** `log sigmoid(x) = -softplus(-x)`: finite for every finite x, `-Infinity` at `-Infinity`. */
export function logSigmoid(x: number): number {
  return -softplus(-x);
}

/** `log(e^a + e^b)` relative to the larger term; `-Infinity` when both are `-Infinity`. */
export function logAddExp(a: number, b: number): number {
  if (a === -Infinity) return b;
  if (b === -Infinity) return a;
  return a > b ? a + Math.log1p(Math.exp(b - a)) : b + Math.log1p(Math.exp(a - b));
}

/** The logit `log(p / (1 - p))` of a probability. */
export function logitOf(p: number): number {
  return Math.log(p) - Math.log1p(-p);
}
