/**
 * Estimates with standard errors and intervals, the bootstrap, and their formatting.
 *
 * @module
 */
export * from "./types.ts";
export * from "./estimate.ts";
export * from "./bootstrap.ts";
export * from "./bootstrap_interval.ts";
export * from "./format.ts";
export * from "./two_sample.ts";
export * from "./wilson.ts";
// Types of other folders that this folder's API mentions, re-exported so the module documents alone.
export type { RandomSource, Rng } from "../random/rng.ts";
