/**
 * The low-level kernels a linear-algebra backend provides. Row-major `Float64Array`s, no
 * validation (the public functions validate first, identically for every backend).
 *
 * @module
 */

/** Arguments of {@linkcode Kernels.gemm}: `C = alpha op(A) op(B) + beta C`, row-major. */
export interface GemmArgs {
  m: number;
  n: number;
  k: number;
  transposeA: boolean;
  transposeB: boolean;
  alpha: number;
  beta: number;
  a: Float64Array;
  b: Float64Array;
  /** `m x n`, updated in place. */
  c: Float64Array;
}

/** Arguments of {@linkcode Kernels.syrk}. */
export interface SyrkArgs {
  a: Float64Array;
  n: number;
  d: number;
  outer: boolean;
  alpha: number;
  /** Scale of the incoming `c` (0: `c` is overwritten, its contents ignored). */
  beta: number;
  /**
   * `d x d` (or `n x n` with `outer`), updated in place: `alpha AᵀA + beta C`. Only the
   * lower triangle of the incoming `c` is read; both triangles are written.
   */
  c: Float64Array;
}

/**
 * Arguments of {@linkcode Kernels.trsm}: solve `op(L) X = B` (`right` false, `L` is
 * `m x m`) or `X op(L) = B` (`right` true, `L` is `n x n`) for lower-triangular `L`, with
 * `op(L)` = `Lᵀ` when `transposed`. `b` is row-major `m x n` and is overwritten by `X`.
 */
export interface TrsmArgs {
  L: Float64Array;
  b: Float64Array;
  m: number;
  n: number;
  right: boolean;
  transposed: boolean;
}

/** One backend's kernels. */
export interface Kernels {
  /** "native" or "typescript". */
  readonly name: "native" | "typescript";
  /** `C = alpha op(A) op(B) + beta C` (row-major, in place). */
  gemm(args: GemmArgs): void;
  /**
   * Full symmetric `alpha AᵀA + beta C` (`d x d`, `outer` false) or `alpha AAᵀ + beta C`
   * (`n x n`, `outer` true) of the row-major `n x d` matrix `a`, into `c` (both triangles).
   */
  syrk(args: SyrkArgs): void;
  /**
   * In-place lower Cholesky factor of the symmetric `d x d` matrix in `a` (upper triangle
   * zeroed on success). Returns 0, or `j + 1` when pivot `j` is not positive.
   */
  potrf(a: Float64Array, d: number): number;
  /** Triangular solve with a block of right-hand sides, in place (see {@linkcode TrsmArgs}). */
  trsm(args: TrsmArgs): void;
  /** `A⁻¹` (full, row-major) from the lower Cholesky factor `L` of `A`. */
  potri(L: Float64Array, d: number): Float64Array;
  /**
   * Eigenvalues ascending of the symmetric matrix whose lower triangle is in `a` (`a` is
   * destroyed); with `vectors`, the row-major `d x d` matrix whose column `k` is the unit
   * eigenvector of value `k`. Returns null when the iteration does not converge.
   */
  syev(
    a: Float64Array,
    d: number,
    vectors: boolean,
  ): { values: Float64Array; vectors: Float64Array | null } | null;
}

/**
 * Copy the lower triangle of the row-major `d x d` matrix `c` onto its upper triangle, in
 * 64 x 64 tiles so that the strided side stays in cache.
 */
export function mirrorLower(c: Float64Array, d: number): void {
  const B = 64;
  for (let i0 = 0; i0 < d; i0 += B) {
    for (let j0 = i0; j0 < d; j0 += B) {
      const i1 = Math.min(d, i0 + B), j1 = Math.min(d, j0 + B);
      for (let i = i0; i < i1; i++) {
        for (let j = Math.max(j0, i + 1); j < j1; j++) c[i * d + j] = c[j * d + i];
      }
    }
  }
}
