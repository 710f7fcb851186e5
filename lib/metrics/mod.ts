/**
 * Sample-based metrics of generated data.
 *
 * @module
 */
export * from "./mode_coverage.ts";
