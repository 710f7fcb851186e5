/**
 * Linear algebra on row-major `Float64Array` matrices: Cholesky, triangular solves,
 * log-determinants, symmetric eigendecomposition and square roots, sample moments.
 *
 * @module
 */
export * from "./cholesky.ts";
export * from "./eigen.ts";
export * from "./moments.ts";
export * from "./matrix_input.ts";
