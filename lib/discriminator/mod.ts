/**
 * Discriminators: the optimal D* of two densities, the pointwise objective, a classifier
 * estimate of D* from samples, and the gap and calibration of a trained discriminator.
 *
 * @module
 */
export * from "./types.ts";
export * from "./optimal_discriminator.ts";
export * from "./pointwise_objective.ts";
export * from "./classifier_discriminator.ts";
export * from "./discriminator_gap.ts";
export * from "./output_scale.ts";
// Types of other folders that this folder's API mentions, re-exported so the module documents alone.
export type { RandomSource, Rng } from "../random/rng.ts";
export type { SampleRecord, Samples, SamplesInput } from "../samples/samples.ts";
export type { Density, DensityDescription } from "../density/types.ts";
export type { Estimate, EstimateUnit } from "../estimate/estimate.ts";
