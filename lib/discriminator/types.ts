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

/** One setting the tuning tried, with its cross-validated log-loss (nats, equal priors). */
export interface TuningCandidate {
  /** RBF bandwidth in standardised units (undefined for linear/quadratic features). */
  readonly bandwidth?: number;
  /** Random Fourier features (undefined for linear/quadratic features). */
  readonly randomFeatures?: number;
  /** Ridge penalty at the tuning sample's size. */
  readonly regularization: number;
  /** Mean validation log-loss over the tuning folds. */
  readonly logLoss: number;
}

/** What the tuning chose and how. */
export interface ClassifierTuning {
  /** Every setting tried, in order. */
  readonly candidates: readonly TuningCandidate[];
  /** The best candidate (its penalty at the tuning sample's size). */
  readonly best: TuningCandidate;
  /** Points per side used (a seeded subsample when the inputs are larger). */
  readonly points: readonly [number, number];
  /** Folds of the tuning cross-validation. */
  readonly folds: number;
  /** Median-heuristic bandwidth the bandwidth candidates are multiples of. */
  readonly medianBandwidth?: number;
}
