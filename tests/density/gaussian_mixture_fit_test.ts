import assert from "node:assert/strict";
import { gaussianMixture } from "../../lib/density/gaussian_mixture.ts";
import { fitGaussianMixture } from "../../lib/density/gaussian_mixture_fit.ts";
import { selectGaussianMixture } from "../../lib/density/gaussian_mixture_select.ts";
import { displayBundle } from "../../lib/display/display.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";
import { Rng } from "../../lib/random/rng.ts";
import { samples } from "../../lib/samples/samples.ts";
import { assertClose, assertWithinSe } from "../_assert.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";

const truth = gaussianMixture({
  weights: [0.2, 0.3, 0.5],
  means: [[-6, 0], [0, 6], [6, 0]],
  covariances: [[1, 0.3, 0.3, 1], [0.5, 0, 0, 2], [1.5, -0.4, -0.4, 0.8]],
});

Deno.test("gmm: EM recovers weights and means of a well-separated 3-component 2-D mixture (3 se)", () => {
  const n = 3000;
  const x = truth.sample(n, 1);
  const fit = fitGaussianMixture(x, { components: 3, seed: 7 });
  assert.ok(fit.converged);
  // Match components to the truth by nearest mean.
  for (let t = 0; t < 3; t++) {
    const tc = truth.components[t];
    let best = 0, bd = Infinity;
    fit.components.forEach((c, j) => {
      const dd = (c.mean[0] - tc.mean[0]) ** 2 + (c.mean[1] - tc.mean[1]) ** 2;
      if (dd < bd) {
        bd = dd;
        best = j;
      }
    });
    const w = truth.weights[t];
    // Binomial se of a proportion; se of a mean is sqrt(Σ_aa / (n w)) (common practice).
    assertWithinSe(fit.weights[best], w, Math.sqrt((w * (1 - w)) / n), 3, `weight ${t}`);
    for (let a = 0; a < 2; a++) {
      assertWithinSe(
        fit.components[best].mean[a],
        tc.mean[a],
        Math.sqrt(tc.cov[a * 2 + a] / (n * w)),
        3,
        `mean ${t}[${a}]`,
      );
    }
  }
  // Reproducible bit for bit from the seed.
  const again = fitGaussianMixture(x, { components: 3, seed: 7 });
  assert.equal(again.logLikelihood, fit.logLikelihood);
  // The reported log-likelihood is the mean logPdf of the fitted density.
  const lp = fit.logPdf(x);
  let mean = 0;
  for (const v of lp) mean += v / n;
  assertClose(fit.logLikelihood, mean, { rel: 1e-12 });
});

for (const covariance of ["full", "diag", "spherical"] as const) {
  Deno.test({
    name:
      `gmm: log-likelihood matches scikit-learn GaussianMixture from the same start (${covariance})`,
    ignore: ignoreWithoutPython(["numpy", "sklearn"]),
    async fn() {
      const x = truth.sample(1500, 2);
      const d = 2, k = 3;
      // Deliberately poor starting means, shared by both implementations.
      const means = [[-3, 1], [1, 3], [3, -1]];
      const covs = [[2, 0, 0, 2], [2, 0, 0, 2], [2, 0, 0, 2]];
      const weights = [1 / 3, 1 / 3, 1 / 3];
      const fit = fitGaussianMixture(x, {
        components: k,
        covariance,
        init: { weights, means, covariances: covs },
        maxIter: 40,
        tol: 0,
      });
      const ref = await runReference<{
        score: number;
        n_iter: number;
        n_parameters: number;
        bic: number;
        aic: number;
      }>("density_gmm.py", {
        data: x.data,
        d,
        k,
        covariance_type: covariance,
        weights_init: weights,
        means_init: means.flat(),
        covariances_init: covs.flat(),
        max_iter: 40,
        tol: 0,
        reg_covar: 1e-6,
      });
      assert.equal(fit.iterations, ref.n_iter);
      // The issue asks for 1e-3 per sample; the two agree far closer than that.
      assertClose(fit.logLikelihood, ref.score, { abs: 1e-8 });
      assert.equal(fit.nParameters, ref.n_parameters);
      assertClose(fit.bic, ref.bic, { rel: 1e-9 });
      assertClose(fit.aic, ref.aic, { rel: 1e-9 });
    },
  });
}

Deno.test("gmm: BIC selects 3 components for 3 separated clusters; the table has every count", () => {
  const x = truth.sample(900, 3);
  const sel = selectGaussianMixture(x, { components: [1, 5], criterion: "bic", seed: 1 });
  assert.equal(sel.components, 3);
  assert.deepEqual(sel.table.map((r) => r.components), [1, 2, 3, 4, 5]);
  const bics = sel.table.map((r) => r.bic);
  assert.equal(Math.min(...bics), sel.best.bic);
  // Log-likelihood never decreases much with more components (nested models, best of restarts).
  assert.ok(sel.table[2].logLikelihood > sel.table[1].logLikelihood);
  const html = displayBundle(sel)!["text/html"];
  assert.match(html, /min BIC/);
  const aic = selectGaussianMixture(x, { components: [2, 4], criterion: "aic", seed: 1 });
  assert.ok(aic.components >= 3);
});

Deno.test("gmm: a component on duplicated points collapses without a floor and fits with it", () => {
  const r = new Rng(4);
  const x = [...Array(30).fill(0), ...Array.from({ length: 200 }, () => r.normal(10, 1))];
  const init = { means: [0, 10], covariances: [1, 1] };
  assert.throws(
    () => fitGaussianMixture(x, { components: 2, init, regularization: 0 }),
    (e: unknown) =>
      e instanceof SaddleError && e.code === "numerical" && /regularization/.test(e.message),
  );
  const fit = fitGaussianMixture(x, { components: 2, init, regularization: 1e-6 });
  const spike = fit.components.find((c) => Math.abs(c.mean[0]) < 1e-9)!;
  assertClose(spike.cov[0], 1e-6, { rel: 1e-6 });
  assertClose(fit.weights[fit.components.indexOf(spike)], 30 / 230, { rel: 1e-6 });
});

Deno.test("gmm: bad input is rejected with SaddleErrors", () => {
  const code = (f: () => unknown, c: string) =>
    assert.throws(f, (e: unknown) => e instanceof SaddleError && e.code === c);
  code(() => fitGaussianMixture([1], { components: 1 }), "too-few-samples");
  code(() => fitGaussianMixture([1, 2, 3], { components: 4 }), "too-few-samples");
  code(() => fitGaussianMixture([1, 2, 3], { components: 0 }), "invalid-argument");
  code(() => fitGaussianMixture([1, 2, 3], { covariance: "tied" as "full" }), "invalid-argument");
  code(() => fitGaussianMixture([1, 2, 3], { regularization: -1 }), "invalid-argument");
  code(
    () => fitGaussianMixture([[1, 2], [2, 3], [3, 1]], { init: { means: [[0, 0, 0]] } }),
    "dimension-mismatch",
  );
  code(() => selectGaussianMixture([1, 2, 3], { components: [3, 1] }), "invalid-argument");
  const fit = fitGaussianMixture(samples([[0, 1], [1, 0], [2, 2], [0, 0], [1, 3]]));
  code(() => fit.logPdf(samples([1])), "dimension-mismatch");
});

Deno.test("gmm: describe() reports what the fit chose", () => {
  const fit = fitGaussianMixture(truth.sample(300, 5), { components: 2, covariance: "diag" });
  const p = fit.describe().parameters;
  assert.equal(p.covarianceType, "diag");
  assert.equal(p.components, 2);
  for (const key of ["logLikelihood", "iterations", "converged", "bic", "aic"]) assert.ok(key in p);
  // diag: off-diagonal covariance exactly 0.
  assert.equal(fit.components[0].cov[1], 0);
});

Deno.test("gmm: a component with no responsibility is re-seeded at the worst-explained point", () => {
  const r = new Rng(8);
  const x = Array.from(
    { length: 500 },
    (_, i) => r.normal([0, 10, 20][i % 3 === 2 ? 2 : i % 2], 1),
  );
  // The third start mean is so far away that its responsibilities underflow to 0.
  const fit = fitGaussianMixture(x, {
    components: 3,
    init: { means: [0, 10, 1e4], covariances: [1, 1, 1] },
  });
  const means = fit.components.map((c) => c.mean[0]).sort((a, b) => a - b);
  assert.ok(Math.abs(means[2] - 20) < 0.5, `re-seeded component at ${means[2]}`);
  assert.ok(fit.converged);
});

Deno.test("gmm: EM split across a Web Worker gives the same bits as one thread", () => {
  const x = truth.sample(2000, 9);
  const one = fitGaussianMixture(x, { components: 3, seed: 2, restarts: 2, workers: 0 });
  const two = fitGaussianMixture(x, { components: 3, seed: 2, restarts: 2, workers: 1 });
  assert.equal(two.logLikelihood, one.logLikelihood);
  assert.deepEqual(two.weights, one.weights);
  assert.equal(two.iterations, one.iterations);
});
