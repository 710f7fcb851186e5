/**
 * Feature maps for the classifier estimate of D*: standardised linear, quadratic and
 * random Fourier (RBF) features, fitted on training points only.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { type RandomSource, toRng } from "../random/rng.ts";
import type { Samples } from "../samples/samples.ts";
import { standardize } from "../samples/transform.ts";

import type { FeatureKind } from "./types.ts";

export type { FeatureKind };

/** A fitted feature map. */
export interface FeatureMap {
  /** Number of features (without the intercept). */
  readonly dim: number;
  /** Bandwidth of the RBF features (standardised units), when used. */
  readonly bandwidth?: number;
  /** Features of a batch, row-major n x dim. */
  map(x: Samples): Float64Array;
}

/** Options of the feature map. */
export interface FeatureOptions {
  features?: FeatureKind;
  randomFeatures?: number;
  bandwidth?: number;
  seed?: RandomSource;
}

/** Median pairwise distance of up to 400 points (the median heuristic). */
export function medianDistance(z: Samples): number {
  const m = Math.min(z.n, 400), d = z.d;
  const dists: number[] = [];
  for (let i = 0; i < m; i++) {
    for (let j = i + 1; j < m; j++) {
      let s = 0;
      for (let k = 0; k < d; k++) s += (z.data[i * d + k] - z.data[j * d + k]) ** 2;
      dists.push(Math.sqrt(s));
    }
  }
  dists.sort((a, b) => a - b);
  const med = dists.length ? dists[dists.length >> 1] : 1;
  return med > 0 ? med : 1;
}

/** The median-heuristic RBF bandwidth of `train` in standardised units. */
export function medianBandwidth(train: Samples): number {
  return medianDistance(standardize(train).samples);
}

/** Fit the feature map on `train` (standardisation, bandwidth, random frequencies). */
export function fitFeatures(train: Samples, options: FeatureOptions): FeatureMap {
  const kind = options.features ?? "linear";
  const { transform } = standardize(train);
  const d = train.d;
  if (kind === "linear") {
    return { dim: d, map: (x) => transform.apply(x).data };
  }
  if (kind === "quadratic") {
    const dim = d + (d * (d + 1)) / 2;
    return {
      dim,
      map: (x) => {
        const z = transform.apply(x).data, n = x.n;
        const out = new Float64Array(n * dim);
        for (let i = 0; i < n; i++) {
          let c = i * dim;
          for (let a = 0; a < d; a++) out[c++] = z[i * d + a];
          for (let a = 0; a < d; a++) {
            for (let b = a; b < d; b++) out[c++] = z[i * d + a] * z[i * d + b];
          }
        }
        return out;
      },
    };
  }
  if (kind !== "rff") {
    throw new SaddleError(
      "invalid-argument",
      `features must be "linear", "quadratic" or "rff", got ${kind}`,
      { parameter: "features" },
    );
  }
  const D = options.randomFeatures ?? 64;
  if (!Number.isInteger(D) || D < 1) {
    throw new SaddleError(
      "invalid-argument",
      `randomFeatures must be a positive integer, got ${D}`,
      {
        parameter: "randomFeatures",
      },
    );
  }
  const ell = options.bandwidth ?? medianDistance(transform.apply(train));
  if (!(ell > 0)) {
    throw new SaddleError("invalid-argument", `bandwidth must be > 0, got ${ell}`, {
      parameter: "bandwidth",
    });
  }
  const rng = toRng(options.seed ?? 0);
  const W = new Float64Array(D * d), b = new Float64Array(D);
  for (let k = 0; k < D * d; k++) W[k] = rng.normal() / ell;
  for (let k = 0; k < D; k++) b[k] = rng.uniform(0, 2 * Math.PI);
  const amp = Math.sqrt(2 / D);
  const dim = d + D;
  return {
    dim,
    bandwidth: ell,
    map: (x) => {
      const z = transform.apply(x).data, n = x.n;
      const out = new Float64Array(n * dim);
      for (let i = 0; i < n; i++) {
        const o = i * dim;
        for (let a = 0; a < d; a++) out[o + a] = z[i * d + a];
        for (let k = 0; k < D; k++) {
          let s = b[k];
          for (let a = 0; a < d; a++) s += W[k * d + a] * z[i * d + a];
          out[o + d + k] = amp * Math.cos(s);
        }
      }
      return out;
    },
  };
}
