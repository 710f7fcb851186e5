/**
 * Linear algebra on row-major `Float64Array` matrices: products (gemm, syrk), Cholesky,
 * triangular solves, log-determinants, symmetric eigendecomposition, square roots and the
 * trace of a square-root product, sample moments. Native BLAS/LAPACK through Deno's FFI when
 * available (see {@linkcode linalgBackend}), pure TypeScript otherwise.
 *
 * @module
 */
export * from "./backend.ts";
export * from "./products.ts";
export * from "./cholesky.ts";
export * from "./eigen.ts";
export * from "./moments.ts";
export * from "./matrix_input.ts";
export * from "./general_eigen.ts";
export * from "./lu_solve.ts";
export * from "./mahalanobis.ts";
