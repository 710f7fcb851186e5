/**
 * KL and Jensen–Shannon divergences between discrete probability vectors.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { logBase } from "../estimate/units.ts";

function normalise(p: ArrayLike<number>, name: string): Float64Array {
  if (p.length === 0) throw new SaddleError("empty", `${name} is empty`, { parameter: name });
  let s = 0;
  for (let i = 0; i < p.length; i++) {
    const v = p[i];
    if (!(v >= 0) || v === Infinity) {
      throw new SaddleError(
        "invalid-argument",
        `${name}[${i}] = ${v}; entries must be finite and >= 0`,
        {
          parameter: name,
          row: i,
        },
      );
    }
    s += v;
  }
  if (s === 0) throw new SaddleError("invalid-argument", `${name} sums to 0`, { parameter: name });
  return Float64Array.from(p, (v) => v / s);
}

function pairOf(p: ArrayLike<number>, q: ArrayLike<number>): [Float64Array, Float64Array] {
  if (p.length !== q.length) {
    throw new SaddleError(
      "dimension-mismatch",
      `p has ${p.length} entries but q has ${q.length}; give both on the same outcomes`,
      { parameter: "q" },
    );
  }
  return [normalise(p, "p"), normalise(q, "q")];
}

/**
 * `KL(p || q) = Σ p_i ln(p_i / q_i)` of two probability vectors (normalised to sum 1 first),
 * with 0 ln 0 = 0 and Infinity where q_i = 0 < p_i. Nats by default; `base: 2` for bits.
 *
 * References: Kullback & Leibler 1951 (Ann. Math. Stat.).
 *
 * @example
 * ```ts
 * import { klDiscrete } from "./discrete.ts";
 * import assert from "node:assert/strict";
 * assert.equal(klDiscrete([1, 0], [0.5, 0.5], { base: 2 }), 1);
 * assert.equal(klDiscrete([0.5, 0.5], [1, 0]), Infinity);
 * ```
 */
export function klDiscrete(
  p: ArrayLike<number>,
  q: ArrayLike<number>,
  options: { base?: number } = {},
): number {
  const [a, b] = pairOf(p, q);
  let s = 0;
  for (let i = 0; i < a.length; i++) {
    if (a[i] === 0) continue;
    if (b[i] === 0) return Infinity;
    s += a[i] * Math.log(a[i] / b[i]);
  }
  return Math.max(0, s) / logBase(options.base);
}

/**
 * Jensen–Shannon divergence `½ KL(p || m) + ½ KL(q || m)`, m = (p + q)/2, of two
 * probability vectors (normalised first): in [0, ln 2], ln 2 for disjoint supports (Lin
 * 1991). This is the square of scipy's `spatial.distance.jensenshannon`.
 *
 * References: Lin 1991, Divergence measures based on the Shannon entropy (IEEE T-IT).
 *
 * @example
 * ```ts
 * import { jsdDiscrete } from "./discrete.ts";
 * import assert from "node:assert/strict";
 * assert.equal(jsdDiscrete([1, 0], [0, 1]), Math.LN2);
 * assert.equal(jsdDiscrete([1, 0], [0, 1], { base: 2 }), 1);
 * ```
 */
export function jsdDiscrete(
  p: ArrayLike<number>,
  q: ArrayLike<number>,
  options: { base?: number } = {},
): number {
  const [a, b] = pairOf(p, q);
  let s = 0;
  for (let i = 0; i < a.length; i++) {
    const m = 0.5 * (a[i] + b[i]);
    if (a[i] > 0) s += 0.5 * a[i] * Math.log(a[i] / m);
    if (b[i] > 0) s += 0.5 * b[i] * Math.log(b[i] / m);
  }
  return Math.min(Math.LN2, Math.max(0, s)) / logBase(options.base);
}
