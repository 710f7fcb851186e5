/**
 * Finite mixtures of normal densities: log-density by log-sum-exp over the components,
 * exact sampling (component by weight, then the component's draw).
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { type RandomSource, toRng } from "../random/rng.ts";
import { fromBuffer, type Samples } from "../samples/samples.ts";
import {
  checkQuery,
  checkSampleSize,
  densityBundle,
  description,
  type MatrixInput,
  matrixRows,
  toVector,
} from "./_common.ts";
import { drawGaussianInto, gaussian, type GaussianDensity } from "./gaussian.ts";
import type { Density, DensityDescription } from "./types.ts";
import { JUPYTER_DISPLAY, type MimeBundle } from "../display/display.ts";

/** Parameters of {@linkcode gaussianMixture}. */
export interface GaussianMixtureParameters {
  /** Component weights, non-negative; normalised to sum 1. */
  readonly weights: ArrayLike<number>;
  /** Component means: numbers in 1-D, vectors in d-D. */
  readonly means: readonly (number | ArrayLike<number>)[];
  /** Component covariances: variances (numbers) in 1-D, matrices in d-D. */
  readonly covariances: readonly MatrixInput[];
}

/** A Gaussian mixture, exposing its weights and components. */
export interface GaussianMixtureDensity extends Density {
  /** Normalised weights (sum 1). */
  readonly weights: Float64Array;
  /** The components, in order. */
  readonly components: readonly GaussianDensity[];
  /** Extra description entries (set by fits), shown by describe(). */
  readonly fitInfo?: Readonly<Record<string, unknown>>;
}

class Mixture implements GaussianMixtureDensity {
  readonly d: number;
  readonly weights: Float64Array;
  readonly components: readonly GaussianDensity[];
  readonly fitInfo?: Readonly<Record<string, unknown>>;
  readonly #notes: readonly string[];
  readonly #logW: Float64Array;

  constructor(
    weights: Float64Array,
    components: GaussianDensity[],
    fitInfo?: Record<string, unknown>,
    notes: readonly string[] = [],
  ) {
    this.d = components[0].d;
    this.weights = weights;
    this.components = components;
    this.#logW = weights.map(Math.log);
    if (fitInfo) this.fitInfo = fitInfo;
    this.#notes = notes;
  }

  logPdf(x: Samples): Float64Array {
    checkQuery(x, this.d, "gaussian mixture");
    const k = this.components.length;
    const per = this.components.map((c) => c.logPdf(x));
    const out = new Float64Array(x.n);
    const lw = this.#logW;
    for (let r = 0; r < x.n; r++) {
      let m = -Infinity;
      for (let j = 0; j < k; j++) {
        const v = lw[j] + per[j][r];
        if (v > m) m = v;
      }
      if (m === -Infinity) {
        out[r] = -Infinity;
        continue;
      }
      let s = 0;
      for (let j = 0; j < k; j++) s += Math.exp(lw[j] + per[j][r] - m);
      out[r] = m + Math.log(s);
    }
    return out;
  }

  sample(n: number, seed: RandomSource): Samples {
    checkSampleSize(n);
    const rng = toRng(seed);
    const pick = rng.categoricalSampler(this.weights);
    const out = new Float64Array(n * this.d);
    for (let r = 0; r < n; r++) drawGaussianInto(this.components[pick()], rng, out, r * this.d);
    return fromBuffer(out, this.d);
  }

  /** Rich notebook display: the description's parameter table. */
  [JUPYTER_DISPLAY](): MimeBundle {
    return densityBundle(this);
  }

  describe(): DensityDescription {
    const d = this.d;
    return description("gaussian-mixture", d, {
      components: this.components.length,
      weights: Array.from(this.weights),
      means: this.components.map((c) => (d === 1 ? c.mean[0] : Array.from(c.mean))),
      covariances: this.components.map((c) => (d === 1 ? c.cov[0] : matrixRows(c.cov, d))),
      ...(this.fitInfo ?? {}),
    }, this.#notes);
  }
}

/**
 * A mixture `Σ_j w_j N(means[j], covariances[j])`. Weights must be non-negative and not
 * all zero; they are normalised. Components of zero weight are kept (they never sample and
 * add nothing to the density).
 *
 * @example Two well-separated 1-D components
 * ```ts
 * import { gaussianMixture } from "./gaussian_mixture.ts";
 * import { samples } from "../samples/samples.ts";
 * import assert from "node:assert/strict";
 * const m = gaussianMixture({ weights: [0.3, 0.7], means: [-5, 5], covariances: [1, 1] });
 * const lp = m.logPdf(samples([5]))[0];
 * assert.ok(Math.abs(lp - (Math.log(0.7) - 0.5 * Math.log(2 * Math.PI))) < 1e-9);
 * // far in the tail the log-density stays finite
 * assert.ok(Number.isFinite(m.logPdf(samples([1e6]))[0]));
 * ```
 */
export function gaussianMixture(params: GaussianMixtureParameters): GaussianMixtureDensity {
  const { means, covariances } = params;
  const k = means.length;
  if (k === 0) throw new SaddleError("empty", "a mixture needs at least one component");
  if (params.weights.length !== k || covariances.length !== k) {
    throw new SaddleError(
      "dimension-mismatch",
      `weights (${params.weights.length}), means (${k}) and covariances ` +
        `(${covariances.length}) must have one entry per component`,
      { parameter: "weights" },
    );
  }
  const components = means.map((m, j) => {
    try {
      return gaussian(m, covariances[j]);
    } catch (e) {
      if (e instanceof SaddleError) {
        throw new SaddleError(e.code, `component ${j}: ${e.message}`, {
          parameter: "covariances",
        });
      }
      throw e;
    }
  });
  return mixtureFromComponents(toVector(params.weights, "weights"), components);
}

/**
 * A mixture from ready {@linkcode GaussianDensity} components (EM fits use it); the
 * weights are validated and normalised, `fitInfo` and `notes` show in `describe()`.
 *
 * @example
 * ```ts
 * import { mixtureFromComponents } from "./gaussian_mixture.ts";
 * import { gaussian } from "./gaussian.ts";
 * import assert from "node:assert/strict";
 * const m = mixtureFromComponents(new Float64Array([1, 1]), [gaussian(0, 1), gaussian(3, 1)]);
 * assert.deepEqual(Array.from(m.weights), [0.5, 0.5]);
 * ```
 */
export function mixtureFromComponents(
  weights: Float64Array,
  components: GaussianDensity[],
  fitInfo?: Record<string, unknown>,
  notes: readonly string[] = [],
): GaussianMixtureDensity {
  const d = components[0].d;
  components.forEach((c, j) => {
    if (c.d !== d) {
      throw new SaddleError(
        "dimension-mismatch",
        `component ${j} has d = ${c.d} but component 0 has d = ${d}`,
        { parameter: "means" },
      );
    }
  });
  let total = 0;
  for (let j = 0; j < weights.length; j++) {
    if (!(weights[j] >= 0) || weights[j] === Infinity) {
      throw new SaddleError(
        "invalid-argument",
        `weight ${j} is ${weights[j]}; weights must be >= 0`,
        {
          parameter: "weights",
        },
      );
    }
    total += weights[j];
  }
  if (!(total > 0)) {
    throw new SaddleError("invalid-argument", "all mixture weights are 0", {
      parameter: "weights",
    });
  }
  const w = weights.map((v) => v / total);
  return new Mixture(w, components, fitInfo, notes);
}
