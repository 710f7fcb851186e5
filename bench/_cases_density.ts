/**
 * Density cases of `deno task bench:compare`: KDE logPdf against scipy's gaussian_kde,
 * EM against scikit-learn's GaussianMixture, and the binned KDE against the exact
 * evaluator. Data are generated here with fixed seeds and sent to the reference scripts
 * in tests/reference/, which time only their own computation.
 *
 * @module
 */
import { fitKde } from "../lib/density/kde.ts";
import { kdeGrid } from "../lib/density/kde_grid.ts";
import { gaussianMixture } from "../lib/density/gaussian_mixture.ts";
import { fitGaussianMixture } from "../lib/density/gaussian_mixture_fit.ts";
import { Rng } from "../lib/random/rng.ts";
import { fromBuffer } from "../lib/samples/samples.ts";
import { runReference } from "../tests/_reference.ts";
import { maxRelError } from "../tests/_assert.ts";
import { registerCase, timed } from "./_compare_registry.ts";
import { shiftedNormalData as kdeData } from "../tests/_data.ts";

for (const [d, n, m, target] of [[1, 1e4, 1e4, 0.2], [2, 2e4, 2e4, 0.3], [5, 1e4, 1e4, 1.0]]) {
  registerCase({
    name: `kde-logpdf-scott-${d}d-${n}x${m}`,
    python: ["numpy", "scipy"],
    target,
    async run(reference) {
      const x = kdeData(n, d, 10 + d);
      const q = kdeData(m, d, 20 + d);
      // Fit plus evaluation; logPdf splits large jobs across workers (start-up included).
      const ours = await timed(() => fitKde(fromBuffer(x, d)).logPdf(fromBuffer(q, d)));
      if (!reference) return { saddlekit_s: ours.seconds, reference_s: null, max_rel_err: null };
      const ref = await runReference<{ logpdf: number[]; seconds: number }>("density_kde.py", {
        data: x,
        d,
        queries: q,
      });
      return {
        saddlekit_s: ours.seconds,
        reference_s: ref.seconds,
        max_rel_err: maxRelError(ours.value, ref.logpdf),
        note: "scipy.stats.gaussian_kde(...).logpdf",
      };
    },
  });
}

/** Queries from the data's law, every 50th row pushed 8 times farther out (far tails). */
function kdeTailQueries(m: number, d: number, seed: number): Float64Array {
  const q = kdeData(m, d, seed);
  for (let i = 0; i < m; i += 50) for (let c = 0; c < d; c++) q[i * d + c] *= 8;
  return q;
}

for (const [d, n, m, target] of [[1, 1e4, 1e4, 0.1], [2, 2e4, 2e4, 0.3], [5, 1e4, 1e4, 0.5]]) {
  registerCase({
    name: `kde-evaluate-${d}d-${n}x${m}`,
    python: ["numpy", "scipy"],
    target,
    async run(reference) {
      const x = kdeData(n, d, 10 + d);
      const q = kdeTailQueries(m, d, 20 + d);
      const ours = await timed(() => fitKde(fromBuffer(x, d)).logPdf(fromBuffer(q, d)));
      if (!reference) return { saddlekit_s: ours.seconds, reference_s: null, max_rel_err: null };
      const ref = await runReference<
        { seconds: number; logpdf: number[]; log_evaluate: (number | null)[] }
      >("density_kde_evaluate.py", { data: x, d, queries: q });
      // Accuracy against the tail-accurate logpdf; evaluate's own error where it is finite.
      const finite = ref.log_evaluate.flatMap((v, i) => v === null ? [] : [i]);
      const under = m - finite.length;
      const ourErr = maxRelError(ours.value, ref.logpdf);
      const evalErr = maxRelError(
        finite.map((i) => ref.log_evaluate[i]!),
        finite.map((i) => ref.logpdf[i]),
      );
      return {
        saddlekit_s: ours.seconds,
        reference_s: ref.seconds,
        max_rel_err: ourErr,
        note: `scipy gaussian_kde.evaluate timed; error on the log-density vs scipy logpdf ` +
          `(all ${m} queries); evaluate underflowed to 0 on ${under} far-tail queries and ` +
          `its log is off by ${evalErr.toExponential(1)} relative where finite`,
      };
    },
  });
}

/**
 * EM against scikit-learn's GaussianMixture from the same start: k well-separated
 * components with diagonal covariances, `iterations` full-covariance EM steps (tol 0).
 */
function emCase(
  { name, k, d, n, iterations, target }: {
    name: string;
    k: number;
    d: number;
    n: number;
    iterations: number;
    target?: number;
  },
) {
  registerCase({
    name,
    python: ["numpy", "sklearn"],
    ...(target !== undefined ? { target } : {}),
    async run(reference) {
      const r = new Rng(5);
      const means = Array.from(
        { length: k },
        () => Array.from({ length: d }, () => r.normal(0, 3)),
      );
      const covs = Array.from({ length: k }, () => {
        const c = new Float64Array(d * d);
        for (let a = 0; a < d; a++) c[a * d + a] = r.uniform(0.5, 2);
        return c;
      });
      const x = gaussianMixture({ weights: Array(k).fill(1 / k), means, covariances: covs })
        .sample(n, 1);
      // Same start for both: k data rows as means, 4 I as covariances, equal weights.
      const initMeans = Array.from(
        { length: k },
        (_, j) => Array.from(x.data.subarray(j * 997 * d, j * 997 * d + d)),
      );
      const c0 = new Float64Array(d * d);
      for (let a = 0; a < d; a++) c0[a * d + a] = 4;
      const init = {
        weights: Array(k).fill(1 / k),
        means: initMeans,
        covariances: Array(k).fill(c0),
      };
      const ours = await timed(() =>
        fitGaussianMixture(x, { components: k, init, maxIter: iterations, tol: 0 })
      );
      if (!reference) return { saddlekit_s: ours.seconds, reference_s: null, max_rel_err: null };
      const ref = await runReference<{ score: number; seconds: number }>("density_gmm.py", {
        data: x.data,
        d,
        k,
        covariance_type: "full",
        weights_init: init.weights,
        means_init: initMeans.flat(),
        covariances_init: Array.from({ length: k }, () => Array.from(c0)).flat(),
        max_iter: iterations,
        tol: 0,
        reg_covar: 1e-6,
      });
      return {
        saddlekit_s: ours.seconds,
        reference_s: ref.seconds,
        max_rel_err: Math.abs(ours.value.logLikelihood - ref.score) / Math.abs(ref.score),
        note: `sklearn GaussianMixture(max_iter=${iterations}, tol=0), same initial parameters`,
      };
    },
  });
}

emCase({ name: "em-full-k8-d8-n1e5-20iter", k: 8, d: 8, n: 1e5, iterations: 20, target: 1.0 });
// Covariance updates and Mahalanobis terms of d = 64 go through syrk and trsm (lib/linalg).
emCase({ name: "linalg-em-d64", k: 4, d: 64, n: 2e4, iterations: 10 });

registerCase({
  name: "kde-binned-1d-1e6-grid2048",
  python: [],
  async run() {
    const x = kdeData(1e6, 1, 3);
    const ours = await timed(() => {
      const kde = fitKde(fromBuffer(x, 1));
      return { kde, grid: kdeGrid(kde, { size: 2048, checkPoints: 0 }) };
    });
    const { kde, grid } = ours.value;
    // Exact evaluator at every node, against the binned values (where the density is not
    // negligible: >= 1e-8 of its maximum).
    const exact = kde.logPdf(fromBuffer(Float64Array.from(grid.axes[0]), 1));
    let top = 0;
    for (const v of grid.density) if (v > top) top = v;
    let err = 0;
    for (let i = 0; i < exact.length; i++) {
      const e = Math.exp(exact[i]);
      if (e >= 1e-8 * top) err = Math.max(err, Math.abs(grid.density[i] - e) / e);
    }
    return {
      saddlekit_s: ours.seconds,
      reference_s: null,
      max_rel_err: err,
      note: "fit + linear binning + FFT; error vs the exact evaluator at all 2048 nodes",
    };
  },
});
