/**
 * Seeded synthetic data sets of the GAN literature for the neural lab: a ring of 8
 * Gaussians, a 5 x 5 grid of Gaussians, and two moons.
 *
 * @module
 */
import { gaussianMixture } from "../density/gaussian_mixture.ts";
import type { Density } from "../density/types.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import type { KnownModes } from "../metrics/mode_coverage.ts";
import { type RandomSource, toRng } from "../random/rng.ts";
import { fromBuffer, type Samples } from "../samples/samples.ts";

/** A synthetic data set: a sampler, and its density and modes where they are known. */
export interface SyntheticSet {
  /** Its name. */
  readonly name: string;
  /** Dimension. */
  readonly d: number;
  /** `n` seeded draws. */
  sample(n: number, seed: RandomSource): Samples;
  /** The density, for the mixtures. */
  readonly density?: Density;
  /** The modes (means, isotropic sd, weights), for the mixtures. */
  readonly modes?: KnownModes & { readonly sd: number; readonly means: readonly number[][] };
}

function mixtureSet(
  name: string,
  means: number[][],
  sd: number,
  weights?: ArrayLike<number>,
): SyntheticSet {
  if (!(sd > 0) || !Number.isFinite(sd)) {
    throw new SaddleError("invalid-argument", `sd must be > 0, got ${sd}`, { parameter: "sd" });
  }
  const w = weights ? Array.from(weights) : means.map(() => 1);
  const density = gaussianMixture({
    weights: w,
    means,
    covariances: means.map(() => [[sd * sd, 0], [0, sd * sd]]),
  });
  return {
    name,
    d: 2,
    density,
    modes: { means, sd, weights: w },
    sample: (n, seed) => density.sample(n, seed),
  };
}

/**
 * A ring of `modes` (8) Gaussians of sd `sd` (0.05) at radius `radius` (2): the standard
 * test of mode collapse. `weights` reweights the modes (0 drops one).
 *
 * References: Metz et al. 2017, Unrolled GANs (ICLR); Srivastava et al. 2017, VEEGAN (NeurIPS).
 *
 * @example
 * ```ts
 * import { ringOfGaussians } from "./synthetic_sets.ts";
 * import assert from "node:assert/strict";
 * const ring = ringOfGaussians();
 * assert.equal(ring.modes!.means.length, 8);
 * assert.equal(ring.sample(10, 1).n, 10);
 * ```
 */
export function ringOfGaussians(
  options: { modes?: number; radius?: number; sd?: number; weights?: ArrayLike<number> } = {},
): SyntheticSet {
  const K = options.modes ?? 8, r = options.radius ?? 2;
  const means = Array.from({ length: K }, (_, k) => [
    r * Math.cos((2 * Math.PI * k) / K),
    r * Math.sin((2 * Math.PI * k) / K),
  ]);
  return mixtureSet(`ring of ${K} Gaussians`, means, options.sd ?? 0.05, options.weights);
}

/**
 * A `size` x `size` (5 x 5) grid of Gaussians of sd `sd` (0.05), spacing `spacing` (2),
 * centred at 0.
 *
 * References: Srivastava et al. 2017, VEEGAN (NeurIPS).
 *
 * @example
 * ```ts
 * import { gridOfGaussians } from "./synthetic_sets.ts";
 * import assert from "node:assert/strict";
 * assert.equal(gridOfGaussians().modes!.means.length, 25);
 * ```
 */
export function gridOfGaussians(
  options: { size?: number; spacing?: number; sd?: number } = {},
): SyntheticSet {
  const s = options.size ?? 5, h = options.spacing ?? 2;
  const means: number[][] = [];
  for (let i = 0; i < s; i++) {
    for (let j = 0; j < s; j++) means.push([(i - (s - 1) / 2) * h, (j - (s - 1) / 2) * h]);
  }
  return mixtureSet(`${s} x ${s} grid of Gaussians`, means, options.sd ?? 0.05);
}

/**
 * Two interleaved half circles with Gaussian noise `noise` (0.1): the upper arc (cos t,
 * sin t) and the lower (1 − cos t, 0.5 − sin t), t uniform on [0, π], half the points each.
 *
 * @example
 * ```ts
 * import { twoMoons } from "./synthetic_sets.ts";
 * import assert from "node:assert/strict";
 * const s = twoMoons().sample(100, 1);
 * assert.equal(s.d, 2);
 * ```
 */
export function twoMoons(options: { noise?: number } = {}): SyntheticSet {
  const noise = options.noise ?? 0.1;
  if (!(noise >= 0) || !Number.isFinite(noise)) {
    throw new SaddleError("invalid-argument", `noise must be >= 0, got ${noise}`, {
      parameter: "noise",
    });
  }
  return {
    name: "two moons",
    d: 2,
    sample: (n, seed) => {
      const r = toRng(seed), out = new Float64Array(2 * n);
      for (let i = 0; i < n; i++) {
        const t = Math.PI * r.uniform();
        const upper = i % 2 === 0;
        out[2 * i] = (upper ? Math.cos(t) : 1 - Math.cos(t)) + noise * r.normal();
        out[2 * i + 1] = (upper ? Math.sin(t) : 0.5 - Math.sin(t)) + noise * r.normal();
      }
      return fromBuffer(out, 2);
    },
  };
}
