/**
 * The trace term `tr((A^½ B A^½)^½)` of the Fréchet distance through the linear-algebra
 * interface: with the Cholesky factor `A = L Lᵀ`, the symmetric `Lᵀ B L` has the eigenvalues
 * of `A^½ B A^½` (both are similar to `B A`), so one Cholesky, two products and one
 * eigenvalues-only solve suffice. A singular `A` (constant or collinear features) falls back
 * to `traceSqrtProduct`, which factors `A` by its eigendecomposition.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { cholesky, gemm, symmetricEigen, traceSqrtProduct } from "../linalg/mod.ts";

/** `tr((A^½ B A^½)^½)` for covariance matrices `A`, `B` (`d x d`, row-major). */
export function traceSqrtTerm(a: Float64Array, b: Float64Array, d: number): number {
  let L: Float64Array;
  try {
    L = cholesky(a, d);
  } catch (err) {
    if (err instanceof SaddleError && err.code === "singular") return traceSqrtProduct(a, b, d);
    throw err;
  }
  const bl = gemm(b, L, { m: d, n: d, k: d });
  const m = gemm(L, bl, { m: d, n: d, k: d, transposeA: true });
  const { values } = symmetricEigen(m, d, { vectors: false });
  const top = Math.max(values[d - 1], 0);
  let s = 0;
  for (let i = 0; i < d; i++) {
    if (values[i] < -1e-10 * top) {
      throw new SaddleError(
        "singular",
        `Lᵀ B L has eigenvalue ${values[i]} < 0: a covariance is not positive semi-definite`,
        { parameter: "b" },
      );
    }
    if (values[i] > 0) s += Math.sqrt(values[i]);
  }
  return s;
}
