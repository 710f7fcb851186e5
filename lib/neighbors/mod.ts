/**
 * Exact k-nearest neighbours: a k-d tree for low dimensions, blocked brute force through
 * dense products for high ones.
 *
 * @module
 */
export * from "./knn.ts";
export * from "./ball_counts.ts";
export * from "./pairwise.ts";
// Types of other folders that this folder's API mentions, re-exported so the module documents alone.
export type { SampleRecord, Samples, SamplesInput } from "../samples/samples.ts";
