/**
 * Samples: the row-major point sets every estimator takes, their constructors, helpers
 * and file readers (CSV/TSV, JSON, NPY, NPZ).
 *
 * @module
 */
export * from "./samples.ts";
export * from "./transform.ts";
export * from "./csv.ts";
export * from "./json.ts";
export * from "./npy.ts";
export * from "./npy_chunks.ts";
export * from "./npz.ts";
export * from "./read.ts";
export type { ColumnSelection } from "./column_selection.ts";
// Types of other folders that this folder's API mentions, re-exported so the module documents alone.
export type { RandomSource, Rng } from "../random/rng.ts";
