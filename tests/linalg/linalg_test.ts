import assert from "node:assert/strict";
import {
  cholesky,
  choleskyInverse,
  choleskySolve,
  logDetCholesky,
} from "../../lib/linalg/cholesky.ts";
import { sqrtSymmetric, symmetricEigen } from "../../lib/linalg/eigen.ts";
import { columnMeans, covariance } from "../../lib/linalg/moments.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";
import { Rng } from "../../lib/random/rng.ts";
import { assertAllClose, assertClose } from "../_assert.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";

/** A random SPD matrix B Bᵀ + d I. */
function spd(d: number, r: Rng): Float64Array {
  const B = r.fillNormal(new Float64Array(d * d));
  const A = new Float64Array(d * d);
  for (let i = 0; i < d; i++) {
    for (let j = 0; j < d; j++) {
      let s = i === j ? d : 0;
      for (let k = 0; k < d; k++) s += B[i * d + k] * B[j * d + k];
      A[i * d + j] = s;
    }
  }
  return A;
}

for (const d of [1, 3, 7]) {
  Deno.test({
    name:
      `linalg d = ${d}: Cholesky, log-det, solve, inverse, eigenvalues, sqrt, covariance vs numpy/scipy`,
    ignore: ignoreWithoutPython(["numpy", "scipy"]),
    async fn() {
      const r = new Rng(100 + d);
      const a = spd(d, r);
      const b = r.fillNormal(new Float64Array(d));
      const n = 50;
      const data = r.fillNormal(new Float64Array(n * d));
      const weights = Float64Array.from({ length: n }, () => r.uniform(0.2, 3));
      const ref = await runReference<Record<string, number[] | number>>("linalg_check.py", {
        a,
        d,
        b,
        data,
        n,
        weights,
      });
      const L = cholesky(a, d);
      const tol = { rel: 1e-11, abs: 1e-13 };
      assertAllClose(L, ref.cholesky as number[], tol, "cholesky");
      assertClose(logDetCholesky(L, d), ref.logdet as number, { rel: 1e-12, abs: 1e-14 });
      assertAllClose(choleskySolve(L, d, b), ref.solve as number[], tol, "solve");
      assertAllClose(choleskyInverse(L, d), ref.inverse as number[], tol, "inverse");
      assertAllClose(symmetricEigen(a, d).values, ref.eigenvalues as number[], tol, "eig");
      assertAllClose(
        sqrtSymmetric(a, d),
        ref.sqrtm as number[],
        { rel: 1e-9, abs: 1e-12 },
        "sqrtm",
      );
      assertAllClose(covariance(data, n, d), ref.cov as number[], tol, "cov");
      assertAllClose(covariance(data, n, d, { weights }), ref.cov_w as number[], tol, "cov_w");
      assertAllClose(columnMeans(data, n, d, weights), ref.mean as number[], tol, "mean");
    },
  });
}

Deno.test("linalg: eigenvectors are orthonormal and reconstruct A (V Λ Vᵀ = A)", () => {
  const d = 6, a = spd(d, new Rng(5));
  const { values, vectors } = symmetricEigen(a, d);
  for (let i = 0; i < d; i++) {
    for (let j = 0; j < d; j++) {
      let s = 0, g = 0;
      for (let k = 0; k < d; k++) {
        s += vectors[i * d + k] * values[k] * vectors[j * d + k];
        g += vectors[k * d + i] * vectors[k * d + j];
      }
      assertClose(s, a[i * d + j], { rel: 1e-12, abs: 1e-12 });
      assertClose(g, i === j ? 1 : 0, { abs: 1e-13 });
    }
  }
});

Deno.test("linalg: singular and malformed inputs throw SaddleErrors", () => {
  const code = (f: () => unknown, c: string) =>
    assert.throws(f, (e: unknown) => e instanceof SaddleError && e.code === c);
  code(() => cholesky([1, 2, 2, 4], 2), "singular"); // rank 1
  code(() => cholesky([1, 0, 0, NaN], 2), "singular");
  code(() => cholesky([1, 0, 0], 2), "dimension-mismatch");
  code(() => sqrtSymmetric([1, 0, 0, -1], 2), "singular");
  code(() => covariance([1, 2], 1, 2), "too-few-samples");
  code(() => columnMeans([], 0, 1), "empty");
  // Rounding-level negative eigenvalues of a PSD matrix are clipped, not rejected.
  const s = sqrtSymmetric([1, 1, 1, 1], 2);
  assertAllClose(s, [Math.SQRT1_2, Math.SQRT1_2, Math.SQRT1_2, Math.SQRT1_2], { rel: 1e-12 });
});

Deno.test("cholesky: a NaN entry is reported as non-finite, not as a collinear column", () => {
  // Same code as before ("singular": the factorisation fails), but the message must point
  // at the NaN rather than suggest a ridge.
  assert.throws(() => cholesky([1, 0, 0, NaN], 2, { name: "cov" }), /cov has a non-finite entry/);
  assert.throws(
    () => cholesky([1, Infinity, Infinity, 1], 2),
    /non-finite entry \(row 0, column 1/,
  );
});
