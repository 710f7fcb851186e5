/**
 * Sample-based metrics of generated data: precision/recall, density/coverage, mode coverage,
 * two-sample tests with p-values, and comparisons of generators.
 *
 * @module
 */
export * from "./mode_coverage.ts";
export * from "./precision_recall.ts";
export * from "./two_sample_tests.ts";
export * from "./compare_generators.ts";
// Types of other folders that this folder's API mentions, re-exported so the module documents alone.
export type { RandomSource, Rng } from "../random/rng.ts";
export type { SampleRecord, Samples, SamplesInput } from "../samples/samples.ts";
export type { Estimate, EstimateUnit } from "../estimate/estimate.ts";
export type { FeatureKind } from "../discriminator/mod.ts";
export type { MmdKernel } from "../divergence/mod.ts";
