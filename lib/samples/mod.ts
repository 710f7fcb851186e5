/**
 * Samples: the row-major point sets every estimator takes, their constructors, helpers
 * and file readers (CSV/TSV, JSON, NPY, NPZ).
 *
 * @module
 */
export * from "./samples.ts";
export * from "./transform.ts";
