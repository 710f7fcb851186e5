/**
 * The `Density` interface that every fitted or analytic density implements.
 *
 * @module
 */
import type { RandomSource } from "../random/rng.ts";
import type { Samples } from "../samples/samples.ts";

/** What a density reports about itself: the kind, what was chosen or fitted, caveats. */
export interface DensityDescription {
  /** Kind of density: "gaussian", "gaussian-mixture", "kde", "uniform-box", "histogram"... */
  readonly kind: string;
  /** Dimension. */
  readonly d: number;
  /** Named parameters and fit results (bandwidth, components, log-likelihood...). */
  readonly parameters: Readonly<Record<string, unknown>>;
  /** Caveats about the fit. */
  readonly notes: readonly string[];
}

/**
 * A probability density on R^d. Work in log space: `logPdf` stays finite in the tails
 * wherever the true value is finite.
 */
export interface Density {
  /** Dimension of the space. */
  readonly d: number;
  /** Natural log of the density at each row of `x` (x.d must equal d). */
  logPdf(x: Samples): Float64Array;
  /** `n` exact draws, reproducible from `seed`. */
  sample(n: number, seed: RandomSource): Samples;
  /** What this density is and how it was fitted. */
  describe(): DensityDescription;
}
