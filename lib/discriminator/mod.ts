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
