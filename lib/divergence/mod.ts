/**
 * Divergences: the f-divergence table, f-divergences between densities by quadrature or
 * Monte Carlo, variational bounds, Gaussian closed forms and discrete KL / JSD.
 *
 * @module
 */
export * from "./f_divergence_table.ts";
export * from "./f_divergence.ts";
export * from "./gaussian_closed_forms.ts";
export * from "./discrete.ts";
export * from "./integration_options.ts";
export * from "./divergence_from_samples.ts";
export * from "./refit_quantities.ts";
export {
  DEFAULT_REFIT_INTERVAL,
  type RefitBootstrap,
  refitBootstrap,
  type RefitBootstrapOptions,
} from "./refit_bootstrap.ts";
export type { BootstrapIntervalMethod } from "../estimate/bootstrap_interval.ts";
export type { MixtureWeight } from "./integration.ts";
export * from "./knn_estimators.ts";
export * from "./wasserstein.ts";
export * from "./energy_distance.ts";
export * from "./mmd.ts";
export * from "./mmd_permutations.ts";
export * from "./median_bandwidth.ts";
export * from "./feature_statistics.ts";
export * from "./frechet.ts";
// Types of other folders that this folder's API mentions, re-exported so the module documents alone.
export type { RandomSource, Rng } from "../random/rng.ts";
export type { SampleRecord, Samples, SamplesInput } from "../samples/samples.ts";
export type { Density, DensityDescription } from "../density/types.ts";
export type { BootstrapEstimate } from "../estimate/bootstrap.ts";
export type { Estimate, EstimateUnit } from "../estimate/estimate.ts";
