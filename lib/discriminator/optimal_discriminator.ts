/**
 * The optimal discriminator `D*(x) = p_data(x) / (p_data(x) + p_g(x))` of two densities.
 *
 * @module
 */
import type { Density } from "../density/types.ts";
import type { GaussianDensity } from "../density/gaussian.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { withDisplay } from "../display/display.ts";
import { escapeHtml } from "../display/table.ts";
import { assertSameDimension, type Samples } from "../samples/samples.ts";
import { sigmoid } from "../math/log_space.ts";
import type { Discriminator } from "./types.ts";

/**
 * Where both log-densities are `-Infinity` the logit is set to this value (D* = 1/2).
 *
 * @example
 * ```ts
 * import { UNDEFINED_LOGIT } from "./optimal_discriminator.ts";
 * import assert from "node:assert/strict";
 * assert.equal(1 / (1 + Math.exp(-UNDEFINED_LOGIT)), 0.5);
 * ```
 */
export const UNDEFINED_LOGIT = 0;

/** D* on a batch, with the count of points where neither density has mass. */
export interface OptimalDiscriminatorEvaluation {
  /** `D*(x_i)`. */
  readonly prob: Float64Array;
  /** `log p_data(x_i) - log p_g(x_i)`, the log-odds of D*. */
  readonly logit: Float64Array;
  /** Rows where both log-densities are `-Infinity` (set to logit 0, D* = 1/2). */
  readonly undefinedCount: number;
  /** Caveats, e.g. the count above. */
  readonly notes: readonly string[];
}

/** The optimal discriminator of two densities, see {@linkcode optimalDiscriminator}. */
export interface OptimalDiscriminator extends Discriminator {
  /** The data density `p_data`. */
  readonly pData: Density;
  /** The model (generator) density `p_g`. */
  readonly pModel: Density;
  /** Probability, logit and the count of points outside both supports in one pass. */
  evaluate(x: Samples): OptimalDiscriminatorEvaluation;
}

/**
 * The optimal discriminator `D*(x) = p_data(x) / (p_data(x) + p_g(x))` for a fixed
 * generator (Goodfellow et al. 2014, Prop. 1), computed as the logistic of the log-density
 * difference `logit D*(x) = log p_data(x) - log p_g(x)`, so it never divides 0 by 0 and
 * keeps its precision where both densities underflow.
 *
 * Edge cases, on purpose: where only `p_g` vanishes, the logit is `+Infinity` and D* = 1;
 * where only `p_data` vanishes, `-Infinity` and D* = 0; where both log-densities are
 * `-Infinity` (outside both supports) D* is undefined and set to 1/2 (logit
 * {@linkcode UNDEFINED_LOGIT} = 0: no evidence either way); `evaluate` counts such points.
 * Two Gaussians have full support, so there both -Infinity means underflow far out (|x|
 * beyond about 1e154): their log-ratio is then taken from the quadratic forms scaled by
 * |x|, which gives D* = 0 or 1 as the tails decide (1/2 only for identical Gaussians).
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Prop. 1.
 *
 * @example D* = 1/2 where the densities agree
 * ```ts
 * import { optimalDiscriminator } from "./optimal_discriminator.ts";
 * import type { Density } from "../density/types.ts";
import type { GaussianDensity } from "../density/gaussian.ts";
 * import { samples } from "../samples/samples.ts";
 * import assert from "node:assert/strict";
 * // Two unit-variance 1-D normals with means 0 and 2 (written inline for the example).
 * const normal = (mu: number): Density => ({
 *   d: 1,
 *   logPdf: (x) => x.data.map((v) => -0.5 * (v - mu) ** 2 - 0.5 * Math.log(2 * Math.PI)),
 *   sample: () => { throw new Error("not needed"); },
 *   describe: () => ({ kind: "normal", d: 1, parameters: { mu }, notes: [] }),
 * });
 * const dStar = optimalDiscriminator(normal(0), normal(2));
 * const x = samples([-1, 1, 3]);
 * assert.equal(dStar.prob(x)[1], 0.5);
 * const l = dStar.logit(x); // log-ratio = 2 - 2x
 * [4, 0, -4].forEach((v, i) => assert.ok(Math.abs(l[i] - v) < 1e-12));
 * ```
 */
export function optimalDiscriminator(pData: Density, pModel: Density): OptimalDiscriminator {
  assertSameDimension(pData, pModel, "pData", "pModel");
  const far = isGaussian(pData) && isGaussian(pModel)
    ? farGaussianLogRatio(pData, pModel)
    : undefined;
  const evaluate = (x: Samples): OptimalDiscriminatorEvaluation => {
    if (x.d !== pData.d) {
      throw new SaddleError(
        "dimension-mismatch",
        `points have d = ${x.d} but the densities have d = ${pData.d}`,
        { parameter: "x" },
      );
    }
    const lp = pData.logPdf(x);
    const lq = pModel.logPdf(x);
    const logit = new Float64Array(x.n);
    const prob = new Float64Array(x.n);
    let undefinedCount = 0;
    for (let i = 0; i < x.n; i++) {
      const a = lp[i], b = lq[i];
      if (Number.isNaN(a) || Number.isNaN(b)) {
        throw new SaddleError(
          "non-finite",
          `a density returned a NaN log-density at row ${i}; check its parameters`,
          { row: i, parameter: Number.isNaN(a) ? "pData" : "pModel" },
        );
      }
      let l: number;
      if (a === -Infinity && b === -Infinity && far) {
        // Two Gaussians far out: both log-densities underflow, but their ratio is known.
        l = far(x.data.subarray(i * x.d, (i + 1) * x.d));
      } else if (a === b) {
        // Equal values, including both -Infinity (no mass) and both +Infinity (atoms).
        if (a === -Infinity) undefinedCount++;
        l = UNDEFINED_LOGIT;
      } else l = a - b;
      logit[i] = l;
      prob[i] = sigmoid(l);
    }
    const notes = undefinedCount > 0
      ? [
        `${undefinedCount} of ${x.n} points lie outside both supports: D* set to 1/2 there`,
      ]
      : [];
    return { prob, logit, undefinedCount, notes };
  };
  return withDisplay({
    d: pData.d,
    pData,
    pModel,
    evaluate,
    prob: (x) => evaluate(x).prob,
    logit: (x) => evaluate(x).logit,
  }, (o: OptimalDiscriminator) => {
    const text = `D*(x) = p_data(x) / (p_data(x) + p_g(x)) in d = ${o.d}, from a ` +
      `${o.pData.describe().kind} density (data) and a ${o.pModel.describe().kind} density ` +
      "(model); evaluate it with .prob(x) or .logit(x), or draw it with plotDensities / " +
      "plotDiscriminatorMap";
    return { "text/plain": text, "text/html": `<p>${escapeHtml(text)}</p>` };
  });
}

function isGaussian(p: Density): p is GaussianDensity {
  const g = p as Partial<GaussianDensity>;
  return g.mean instanceof Float64Array && g.choleskyFactor instanceof Float64Array &&
    typeof g.logDet === "number" && p.describe().kind === "gaussian";
}

/**
 * The log-ratio of two Gaussians at a point so far out that both log-densities underflow
 * to -Infinity (|x| near 1e154 or beyond). With s = max |x_i| and u = x / s,
 * `ln p - ln q = -s² A / 2 + s B + C` where A = |L_p⁻¹u|² - |L_q⁻¹u|²,
 * B = (L_p⁻¹u)·(L_p⁻¹μ_p) - (L_q⁻¹u)·(L_q⁻¹μ_q) and C collects the constants: for such s
 * the first non-zero of -A, B decides the sign and the ratio is infinite (D* = 1 or 0);
 * equal precisions and means leave C, a finite ratio.
 */
function farGaussianLogRatio(p: GaussianDensity, q: GaussianDensity) {
  const d = p.d;
  const solve = (L: Float64Array, v: Float64Array) => {
    const z = new Float64Array(d);
    for (let i = 0; i < d; i++) {
      let t = v[i];
      for (let k = 0; k < i; k++) t -= L[i * d + k] * z[k];
      z[i] = t / L[i * d + i];
    }
    return z;
  };
  const bp = solve(p.choleskyFactor, p.mean), bq = solve(q.choleskyFactor, q.mean);
  const dot = (a: Float64Array, b: Float64Array) => a.reduce((t, v, i) => t + v * b[i], 0);
  const C = -0.5 * (p.logDet - q.logDet) - 0.5 * (dot(bp, bp) - dot(bq, bq));
  return (x: Float64Array): number => {
    let s = 0;
    for (let i = 0; i < d; i++) s = Math.max(s, Math.abs(x[i]));
    if (!(s > 0 && s < Infinity)) return UNDEFINED_LOGIT;
    const u = x.map((v) => v / s);
    const ap = solve(p.choleskyFactor, u), aq = solve(q.choleskyFactor, u);
    const A = dot(ap, ap) - dot(aq, aq), B = dot(ap, bp) - dot(aq, bq);
    if (A !== 0) return A > 0 ? -Infinity : Infinity;
    if (B !== 0) return B > 0 ? Infinity : -Infinity;
    return C;
  };
}
