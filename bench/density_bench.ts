/**
 * `deno bench -A bench/density_bench.ts`: timings of the density layer at moderate sizes
 * (the side-by-side comparison with scipy/scikit-learn is bench/compare.ts).
 *
 * @module
 */
import { fitKde } from "../lib/density/kde.ts";
import { kdeGrid } from "../lib/density/kde_grid.ts";
import { gaussian } from "../lib/density/gaussian.ts";
import { gaussianMixture } from "../lib/density/gaussian_mixture.ts";
import { fitGaussianMixture } from "../lib/density/gaussian_mixture_fit.ts";
import { Rng } from "../lib/random/rng.ts";
import { fromBuffer } from "../lib/samples/samples.ts";

const r = new Rng(1);
const normal = (n: number, d: number) => fromBuffer(r.fillNormal(new Float64Array(n * d)), d);
const x1 = normal(10000, 1), q1 = normal(10000, 1);
const x2 = normal(5000, 2), q2 = normal(5000, 2);
const x5 = normal(3000, 5), q5 = normal(3000, 5);
const kde1 = fitKde(x1), kde2 = fitKde(x2), kde5 = fitKde(x5);
const big1 = fitKde(normal(200000, 1));
const g8 = gaussian(new Float64Array(8), 1);
const q8 = normal(100000, 8);
const mix = gaussianMixture({
  weights: [0.3, 0.3, 0.4],
  means: [[-4, 0], [4, 0], [0, 4]],
  covariances: [1, 1, 1],
});
const xm = mix.sample(20000, 2);

Deno.bench("kde logPdf 1-D, 1e4 x 1e4 (boxed Taylor evaluator)", { group: "kde" }, () => {
  kde1.logPdf(q1);
});
Deno.bench("kde logPdf 2-D, 5e3 x 5e3 (k-d tree)", { group: "kde" }, () => {
  kde2.logPdf(q2);
});
Deno.bench("kde logPdf 5-D, 3e3 x 3e3 (blocked)", { group: "kde" }, () => {
  kde5.logPdf(q5);
});
Deno.bench("kde fit 1-D, 1e4, diffusion bandwidth", { group: "bandwidth" }, () => {
  fitKde(x1, { bandwidth: "diffusion" });
});
Deno.bench("kde fit 1-D, 1e4, cv bandwidth (1000 held out)", { group: "bandwidth" }, () => {
  fitKde(x1, { bandwidth: "cv" });
});
Deno.bench("kdeGrid 1-D, 2e5 points, 2048 nodes", { group: "grid" }, () => {
  kdeGrid(big1, { size: 2048, checkPoints: 0 });
});
Deno.bench("gaussian logPdf 8-D, 1e5 points", { group: "analytic" }, () => {
  g8.logPdf(q8);
});
Deno.bench("mixture sample 2-D, 2e4 points", { group: "analytic" }, () => {
  mix.sample(20000, 3);
});
Deno.bench("EM full, k = 3, d = 2, n = 2e4, 1 start", { group: "em" }, () => {
  fitGaussianMixture(xm, { components: 3, restarts: 1, seed: 1 });
});
