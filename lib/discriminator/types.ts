/**
 * The interface every discriminator in saddlekit implements: a probability of "real" and
 * its logit for a batch of points.
 *
 * @module
 */
import type { Samples } from "../samples/samples.ts";

/**
 * A discriminator evaluated on a batch: `prob(x)[i]` is the probability that row `i` of `x`
 * is real, `logit(x)[i]` its log-odds. Work with `logit` where you can: it keeps the
 * evidence of saturated outputs that `prob` rounds to exactly 0 or 1.
 */
export interface Discriminator {
  /** Dimension of the points it takes. */
  readonly d: number;
  /** Probability that each row is real, in [0, 1]. */
  prob(x: Samples): Float64Array;
  /** Log-odds `log(D / (1 - D))` of each row, in [-Infinity, Infinity]. */
  logit(x: Samples): Float64Array;
}

/**
 * Feature expansions of the classifier estimate of D*: the standardised inputs ("linear"),
 * plus their pairwise products ("quadratic"), or plus random Fourier features of an RBF
 * kernel ("rff", Rahimi & Recht 2007).
 */
export type FeatureKind = "linear" | "quadratic" | "rff";
