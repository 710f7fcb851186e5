/**
 * The uniform density on an axis-aligned box `[lower, upper]`.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { type RandomSource, toRng } from "../random/rng.ts";
import { fromBuffer, type Samples } from "../samples/samples.ts";
import { checkQuery, checkSampleSize, densityBundle, description, toVector } from "./_common.ts";
import type { Density, DensityDescription } from "./types.ts";
import { JUPYTER_DISPLAY, type MimeBundle } from "../display/display.ts";

/** The uniform density on a box, exposing its corners. */
export interface UniformBoxDensity extends Density {
  /** Lower corner. */
  readonly lower: Float64Array;
  /** Upper corner. */
  readonly upper: Float64Array;
}

/**
 * Uniform on `[lower_1, upper_1] x ... x [lower_d, upper_d]` (numbers in 1-D). `logPdf` is
 * `-Σ log(upper_j - lower_j)` inside the closed box and `-Infinity` outside; sampling is
 * exact.
 *
 * @example
 * ```ts
 * import { uniformBox } from "./uniform_box.ts";
 * import { samples } from "../samples/samples.ts";
 * import assert from "node:assert/strict";
 * const u = uniformBox([0, 0], [2, 4]);
 * assert.deepEqual(Array.from(u.logPdf(samples([[1, 1], [3, 1]]))), [-Math.log(8), -Infinity]);
 * ```
 */
export function uniformBox(
  lower: number | ArrayLike<number>,
  upper: number | ArrayLike<number>,
): UniformBoxDensity {
  const lo = toVector(lower, "lower"), hi = toVector(upper, "upper");
  if (lo.length !== hi.length) {
    throw new SaddleError(
      "dimension-mismatch",
      `lower has ${lo.length} entries but upper has ${hi.length}`,
      { parameter: "upper" },
    );
  }
  for (let j = 0; j < lo.length; j++) {
    if (!(hi[j] > lo[j])) {
      throw new SaddleError(
        "invalid-argument",
        `upper[${j}] = ${hi[j]} must exceed lower[${j}] = ${lo[j]}`,
        { parameter: "upper" },
      );
    }
  }
  return new UniformBox(lo, hi);
}

class UniformBox implements UniformBoxDensity {
  readonly d: number;
  readonly lower: Float64Array;
  readonly upper: Float64Array;
  readonly #logP: number;

  constructor(lower: Float64Array, upper: Float64Array) {
    this.d = lower.length;
    this.lower = lower;
    this.upper = upper;
    let s = 0;
    for (let j = 0; j < this.d; j++) s += Math.log(upper[j] - lower[j]);
    this.#logP = -s;
  }

  logPdf(x: Samples): Float64Array {
    checkQuery(x, this.d, "uniform box");
    const { d, lower, upper } = this;
    const out = new Float64Array(x.n);
    for (let r = 0; r < x.n; r++) {
      let inside = true;
      for (let j = 0; j < d && inside; j++) {
        const v = x.data[r * d + j];
        inside = v >= lower[j] && v <= upper[j];
      }
      out[r] = inside ? this.#logP : -Infinity;
    }
    return out;
  }

  sample(n: number, seed: RandomSource): Samples {
    checkSampleSize(n);
    const rng = toRng(seed);
    const { d, lower, upper } = this;
    const out = new Float64Array(n * d);
    for (let r = 0; r < n; r++) {
      for (let j = 0; j < d; j++) out[r * d + j] = rng.uniform(lower[j], upper[j]);
    }
    return fromBuffer(out, d);
  }

  /** Rich notebook display: the description's parameter table. */
  [JUPYTER_DISPLAY](): MimeBundle {
    return densityBundle(this);
  }

  describe(): DensityDescription {
    return description("uniform-box", this.d, {
      lower: Array.from(this.lower),
      upper: Array.from(this.upper),
      logDensity: this.#logP,
    });
  }
}
