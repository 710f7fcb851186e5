/**
 * Estimates with standard errors and intervals, the bootstrap, and their formatting.
 *
 * @module
 */
export * from "./estimate.ts";
export * from "./bootstrap.ts";
export * from "./format.ts";
export * from "./display.ts";
