/**
 * The multivariate normal density N(mean, cov): exact log-density through the Cholesky
 * factor (the Mahalanobis terms of all query rows as blocked triangular solves, lib/linalg)
 * and exact sampling `mean + L z`.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { cholesky, logDetCholesky } from "../linalg/cholesky.ts";
import { squaredMahalanobis } from "../linalg/mahalanobis.ts";
import { type RandomSource, type Rng, toRng } from "../random/rng.ts";
import { fromBuffer, type Samples } from "../samples/samples.ts";
import {
  checkQuery,
  checkSampleSize,
  densityBundle,
  description,
  LOG_2PI,
  type MatrixInput,
  matrixRows,
  toMatrix,
  toVector,
} from "./_common.ts";
import type { Density, DensityDescription } from "./types.ts";
import { JUPYTER_DISPLAY, type MimeBundle } from "../display/display.ts";

/** A multivariate normal density with its parameters exposed for closed forms. */
export interface GaussianDensity extends Density {
  /** Mean vector (length d). */
  readonly mean: Float64Array;
  /** Covariance, row-major d x d. */
  readonly cov: Float64Array;
  /** Lower Cholesky factor of `cov` (row-major d x d). */
  readonly choleskyFactor: Float64Array;
  /** `log det cov`. */
  readonly logDet: number;
}

class Gaussian implements GaussianDensity {
  readonly d: number;
  readonly mean: Float64Array;
  readonly cov: Float64Array;
  readonly choleskyFactor: Float64Array;
  readonly logDet: number;
  readonly #norm: number;
  readonly #z: Float64Array;

  constructor(mean: Float64Array, cov: Float64Array) {
    const d = mean.length;
    this.d = d;
    this.mean = mean;
    this.cov = cov;
    this.choleskyFactor = cholesky(cov, d, { name: "cov" });
    this.logDet = logDetCholesky(this.choleskyFactor, d);
    this.#norm = -0.5 * (d * LOG_2PI + this.logDet);
    this.#z = new Float64Array(d);
  }

  logPdf(x: Samples): Float64Array {
    checkQuery(x, this.d, "gaussian");
    // All rows' Mahalanobis terms in blocks (one triangular solve each), then in place.
    const out = squaredMahalanobis(x.data, this.choleskyFactor, {
      n: x.n,
      d: this.d,
      mean: this.mean,
    });
    for (let r = 0; r < x.n; r++) out[r] = this.#norm - 0.5 * out[r];
    return out;
  }

  /** Write one draw into `out` at `offset` (used by mixtures). */
  drawInto(rng: Rng, out: Float64Array, offset: number): void {
    const { d, mean } = this;
    const L = this.choleskyFactor, z = this.#z;
    for (let i = 0; i < d; i++) z[i] = rng.normal();
    for (let i = 0; i < d; i++) {
      let s = mean[i];
      for (let k = 0; k <= i; k++) s += L[i * d + k] * z[k];
      out[offset + i] = s;
    }
  }

  sample(n: number, seed: RandomSource): Samples {
    checkSampleSize(n);
    const rng = toRng(seed);
    const out = new Float64Array(n * this.d);
    for (let r = 0; r < n; r++) this.drawInto(rng, out, r * this.d);
    return fromBuffer(out, this.d);
  }

  /** Rich notebook display: the description's parameter table. */
  [JUPYTER_DISPLAY](): MimeBundle {
    return densityBundle(this);
  }

  describe(): DensityDescription {
    return description("gaussian", this.d, {
      mean: Array.from(this.mean),
      cov: this.d === 1 ? this.cov[0] : matrixRows(this.cov, this.d),
      logDet: this.logDet,
    });
  }
}

/**
 * The normal density N(mean, cov). In 1-D, `mean` and `cov` are numbers and `cov` is the
 * VARIANCE. In d dimensions, `mean` has length d and `cov` is a row-major `d * d` array,
 * `d` rows, or a number `σ²` meaning `σ² I`. A covariance that is not positive definite
 * throws a `singular` SaddleError (add a small ridge to its diagonal).
 *
 * @example Standard normal in 1-D and a correlated 2-D normal
 * ```ts
 * import { gaussian } from "./gaussian.ts";
 * import { samples } from "../samples/samples.ts";
 * import assert from "node:assert/strict";
 * const g = gaussian(0, 1);
 * assert.ok(Math.abs(g.logPdf(samples([0]))[0] + 0.5 * Math.log(2 * Math.PI)) < 1e-15);
 * const h = gaussian([0, 0], [[2, 1], [1, 2]]);
 * assert.equal(h.d, 2);
 * assert.ok(Math.abs(h.logDet - Math.log(3)) < 1e-14);
 * assert.equal(h.sample(5, 1).n, 5);
 * ```
 */
export function gaussian(mean: number | ArrayLike<number>, cov: MatrixInput): GaussianDensity {
  const m = toVector(mean, "mean");
  const d = m.length;
  if (typeof mean === "number" && typeof cov !== "number" && cov.length !== 1) {
    throw new SaddleError(
      "dimension-mismatch",
      "a scalar mean makes a 1-D gaussian: give cov as the variance (a number)",
      { parameter: "cov" },
    );
  }
  const c = toMatrix(cov, d, "cov");
  return new Gaussian(m, c);
}

/** Draw one point of a gaussian into a buffer (internal, for mixtures). */
export function drawGaussianInto(
  g: GaussianDensity,
  rng: Rng,
  out: Float64Array,
  offset: number,
): void {
  if (g instanceof Gaussian) {
    g.drawInto(rng, out, offset);
    return;
  }
  const s = g.sample(1, rng);
  out.set(s.data, offset);
}
