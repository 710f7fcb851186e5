/**
 * One smoke test per dense metric on whichever linear-algebra backend is active. CI runs
 * this file twice: in the main run (native OpenBLAS when it loads) and again with
 * `SADDLEKIT_BLAS=off` (the TypeScript kernels), so every metric that goes through
 * lib/linalg is checked against an outside reference on both backends.
 *
 * References: numpy cov + scipy.linalg.sqrtm for the Fréchet distance (the usual
 * computation, Heusel et al. 2017); numpy double sums for the MMD (Gretton et al. 2012,
 * Eq. 3); scipy cKDTree for exact neighbours; the Gaussian KL closed form (Kullback 1959).
 */
import assert from "node:assert/strict";
import { featureStatistics, frechetDistance, gaussianKl, mmd } from "../../lib/divergence/mod.ts";
import { fitGaussianMixture } from "../../lib/density/mod.ts";
import { linalgBackend } from "../../lib/linalg/mod.ts";
import { kNearest } from "../../lib/neighbors/mod.ts";
import { rng } from "../../lib/random/mod.ts";
import { fromBuffer, type Samples } from "../../lib/samples/mod.ts";
import { assertAllClose, assertClose } from "../_assert.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";

function normal(n: number, d: number, seed: number, shift = 0): Samples {
  const x = rng(seed).fillNormal(new Float64Array(n * d));
  for (let i = 0; i < x.length; i += d) x[i] += shift;
  return fromBuffer(x, d);
}

const backend = linalgBackend().name;

Deno.test({
  name: `smoke (${backend} backend): frechetDistance and featureStatistics vs numpy/scipy`,
  ignore: ignoreWithoutPython(["numpy", "scipy"]),
  fn: async () => {
    const a = normal(300, 48, 101), b = normal(260, 48, 102, 0.7);
    const want = await runReference<{ fd: number; mean_a: number[]; cov_a: number[] }>(
      "feature_space.py",
      { task: "frechet", a: a.data, b: b.data, d: 48 },
    );
    assertClose(frechetDistance(a, b).value, want.fd, { rel: 1e-8 });
    const s = featureStatistics(a, { rows: 41 });
    assertAllClose(s.mean, want.mean_a, { rel: 1e-12, abs: 1e-15 });
    assertAllClose(s.covariance, want.cov_a, { rel: 1e-12, abs: 1e-15 });
  },
});

Deno.test({
  name: `smoke (${backend} backend): Gaussian-kernel MMD² vs numpy double sums`,
  ignore: ignoreWithoutPython(["numpy"]),
  fn: async () => {
    const a = normal(400, 32, 103), b = normal(350, 32, 104, 0.4);
    const want = await runReference<{ unbiased: number; biased: number }>("feature_space.py", {
      task: "mmd",
      a: a.data,
      b: b.data,
      d: 32,
      sigma: 5,
    });
    assertClose(mmd(a, b, { bandwidth: 5 }).value, want.unbiased, { rel: 1e-9 });
    assertClose(mmd(a, b, { bandwidth: 5, estimator: "biased" }).value, want.biased, {
      rel: 1e-9,
    });
  },
});

Deno.test({
  name: `smoke (${backend} backend): blocked brute-force k-NN at d = 64 vs scipy cKDTree`,
  ignore: ignoreWithoutPython(["numpy", "scipy"]),
  fn: async () => {
    const ref = normal(500, 64, 105), query = normal(120, 64, 106);
    const want = await runReference<{ dist: number[]; idx: number[] }>("feature_space.py", {
      task: "ckdtree",
      ref: ref.data,
      query: query.data,
      d: 64,
      k: 4,
    });
    const got = kNearest(ref, query, { k: 4 });
    assert.equal(got.method, "brute"); // the dense-product path through lib/linalg
    assert.deepEqual(Array.from(got.indices), want.idx);
    assertAllClose(got.distances, want.dist, { rel: 1e-12 });
  },
});

// Closed form (Kullback 1959): KL(N(μ1, Σ1) ‖ N(μ2, Σ2)) for diagonal covariances is
// ½ Σ_i [σ1²/σ2² + (μ2 − μ1)²/σ2² − 1 + ln(σ2²/σ1²)].
Deno.test(`smoke (${backend} backend): gaussianKl and EM on the linear-algebra paths`, () => {
  const d = 6;
  const m1 = new Array(d).fill(0), m2 = Array.from({ length: d }, (_, i) => 0.1 * i);
  const v1 = Array.from({ length: d }, (_, i) => 1 + 0.2 * i);
  const v2 = Array.from({ length: d }, (_, i) => 2 - 0.1 * i);
  const diag = (v: number[]) => v.flatMap((x, i) => v.map((_, j) => (i === j ? x : 0)));
  let want = 0;
  for (let i = 0; i < d; i++) {
    want += 0.5 * (v1[i] / v2[i] + (m2[i] - m1[i]) ** 2 / v2[i] - 1 + Math.log(v2[i] / v1[i]));
  }
  assertClose(gaussianKl({ mean: m1, cov: diag(v1) }, { mean: m2, cov: diag(v2) }), want, {
    rel: 1e-12,
  });
  // EM on one Gaussian: the fitted covariance is the maximum-likelihood (biased) one.
  const x = normal(800, d, 107);
  const fit = fitGaussianMixture(x, { components: 1, seed: 1, regularization: 0 });
  const ml = featureStatistics(x);
  const scale = (x.n - 1) / x.n;
  const c0 = fit.components[0].cov;
  for (let i = 0; i < d * d; i++) assertClose(c0[i], ml.covariance[i] * scale, { abs: 1e-10 });
});
