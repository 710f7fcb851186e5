import assert from "node:assert/strict";
import { fitKde } from "../../lib/density/kde.ts";
import { makeEvaluator } from "../../lib/density/_kde_eval.ts";
import { FGT_RELATIVE_ERROR, type FgtEvaluator, fgtEvaluator } from "../../lib/density/_kde_fgt.ts";
import { kdeGrid } from "../../lib/density/kde_grid.ts";
import { silvermanFactor } from "../../lib/density/bandwidth.ts";
import { Rng } from "../../lib/random/rng.ts";
import { fromBuffer, samples } from "../../lib/samples/samples.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";
import { displayBundle } from "../../lib/display/display.ts";
import { assertClose, assertWithinSe, maxRelError } from "../_assert.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";
import { shiftedNormalData as data } from "../_data.ts";

interface ScipyKde {
  logpdf: number[];
  factor: number;
  scott_factor: number;
  silverman_factor: number;
  covariance: number[];
  neff: number;
  silverman_rot?: number;
}

function queries(m: number, d: number, seed: number): Float64Array {
  const q = new Rng(seed).fillNormal(new Float64Array(m * d)).map((v) => 3 * v);
  // Far tail: every kernel term underflows in double precision without log-sum-exp.
  q[0] = 60;
  return q;
}

for (const [d, n, m] of [[1, 800, 300], [2, 600, 300], [5, 400, 200]]) {
  Deno.test({
    name: `kde: Scott logPdf vs scipy gaussian_kde.logpdf, d = ${d} (rel err <= 1e-10)`,
    ignore: ignoreWithoutPython(["numpy", "scipy"]),
    async fn() {
      const x = data(n, d, 10 + d), q = queries(m, d, 20 + d);
      const kde = fitKde(fromBuffer(x, d));
      const ref = await runReference<ScipyKde>("density_kde.py", { data: x, d, queries: q });
      assertClose(kde.factor!, ref.scott_factor, { rel: 1e-14 });
      assert.ok(Number.isFinite(ref.logpdf[0]), "scipy finite in the tail too");
      const lp = kde.logPdf(fromBuffer(q, d));
      assert.ok(maxRelError(lp, ref.logpdf) <= 1e-10, `max rel err ${maxRelError(lp, ref.logpdf)}`);
      // Every evaluator gives the same values.
      for (const method of ["blocked", "tree"] as const) {
        const other = fitKde(fromBuffer(x, d), { method }).logPdf(fromBuffer(q, d));
        assert.ok(maxRelError(other, lp) <= 1e-12, `${method}: ${maxRelError(other, lp)}`);
      }
    },
  });
}

Deno.test({
  name: "kde: weighted Scott and Silverman factors, covariance vs scipy gaussian_kde",
  ignore: ignoreWithoutPython(["numpy", "scipy"]),
  async fn() {
    const d = 2, n = 300;
    const x = data(n, d, 3), q = queries(100, d, 4);
    const r = new Rng(5);
    const w = Float64Array.from({ length: n }, () => r.uniform(0.1, 2));
    const ref = await runReference<ScipyKde>("density_kde.py", {
      data: x,
      d,
      queries: q,
      weights: w,
      bw_method: "silverman",
    });
    const kde = fitKde(fromBuffer(x, d), { weights: w, bandwidth: "silverman" });
    assertClose(kde.neff, ref.neff, { rel: 1e-13 });
    assertClose(kde.factor!, ref.silverman_factor, { rel: 1e-13 });
    assertClose(silvermanFactor(ref.neff, d), ref.silverman_factor, { rel: 1e-14 });
    const f2 = ref.factor * ref.factor;
    for (let i = 0; i < 4; i++) assertClose(kde.bandwidth[i], ref.covariance[i], { rel: 1e-12 });
    assert.ok(f2 > 0);
    const lp = kde.logPdf(fromBuffer(q, d));
    assert.ok(maxRelError(lp, ref.logpdf) <= 1e-10);
  },
});

Deno.test({
  name: "kde: 1-D Silverman rule of thumb (Silverman 1986 eq. 3.31) vs numpy percentiles",
  ignore: ignoreWithoutPython(["numpy", "scipy"]),
  async fn() {
    const x = data(500, 1, 8);
    const ref = await runReference<ScipyKde>("density_kde.py", { data: x, d: 1, queries: [0] });
    const kde = fitKde(fromBuffer(x, 1), { bandwidth: "silverman" });
    assertClose(Math.sqrt(kde.bandwidth[0]), ref.silverman_rot!, { rel: 1e-12 });
  },
});

Deno.test("kde: far-tail log-density is finite and matches the nearest kernel (closed form)", () => {
  // Two points; at x = 1000 the kernel at 1 dominates: log p = log(1/2 N(1000; 1, h²)) + tiny.
  const kde = fitKde([0, 1], { bandwidth: [0.25] });
  const lp = kde.logPdf(samples([1000]))[0];
  const h2 = 0.25;
  const near = Math.log(0.5) - 0.5 * Math.log(2 * Math.PI * h2) - (999 * 999) / (2 * h2);
  assertClose(lp, near, { rel: 1e-15 });
});

Deno.test("kde: integrates to 1 on a fine grid, 1-D and 2-D (trapezoid, 1e-4)", () => {
  const k1 = fitKde(fromBuffer(data(200, 1, 1), 1));
  const g = 4001, lo = -15, hi = 20, dx = (hi - lo) / (g - 1);
  const xs = Float64Array.from({ length: g }, (_, i) => lo + i * dx);
  const p = k1.logPdf(fromBuffer(xs, 1));
  let s = 0;
  for (let i = 0; i < g; i++) s += (i === 0 || i === g - 1 ? 0.5 : 1) * Math.exp(p[i]);
  assertClose(s * dx, 1, { abs: 1e-4 });
  const k2 = fitKde(fromBuffer(data(150, 2, 2), 2));
  const m = 241, a = -16, b = 22, h = (b - a) / (m - 1);
  const pts = new Float64Array(m * m * 2);
  for (let i = 0; i < m; i++) {
    for (let j = 0; j < m; j++) {
      pts[(i * m + j) * 2] = a + i * h;
      pts[(i * m + j) * 2 + 1] = a + j * h;
    }
  }
  const p2 = k2.logPdf(fromBuffer(pts, 2));
  let s2 = 0;
  for (let i = 0; i < p2.length; i++) s2 += Math.exp(p2[i]);
  assertClose(s2 * h * h, 1, { abs: 1e-4 });
});

Deno.test("kde: sample moments match the KDE's mean and covariance within 5 se", () => {
  // A Gaussian KDE is a mixture: mean = Σ w x_i, cov = weighted data cov (ddof 0) + H.
  const x = data(300, 2, 6);
  const kde = fitKde(fromBuffer(x, 2));
  const n = 20000;
  const s = kde.sample(n, 11);
  const mean = [0, 0];
  for (let i = 0; i < 300; i++) for (let c = 0; c < 2; c++) mean[c] += x[i * 2 + c] / 300;
  const cov00 = (() => {
    let v = 0;
    for (let i = 0; i < 300; i++) v += (x[i * 2] - mean[0]) ** 2 / 300;
    return v + kde.bandwidth[0];
  })();
  let sm = 0, sv = 0, m4 = 0;
  for (let i = 0; i < n; i++) sm += s.data[i * 2] / n;
  for (let i = 0; i < n; i++) {
    const t = (s.data[i * 2] - sm) ** 2;
    sv += t / (n - 1);
    m4 += t * t / n;
  }
  assertWithinSe(sm, mean[0], Math.sqrt(cov00 / n));
  assertWithinSe(sv, cov00, Math.sqrt((m4 - cov00 * cov00) / n));
});

Deno.test("kde: cv picks a small factor for well-separated clusters, diffusion near normal reference", () => {
  const r = new Rng(3);
  const x = Float64Array.from({ length: 400 }, (_, i) => r.normal(i % 2 ? -10 : 10, 1));
  const cv = fitKde(fromBuffer(x, 1), { bandwidth: "cv" });
  const scott = fitKde(fromBuffer(x, 1));
  // The clusters have sd 1 but the pooled sd is ~10: a good factor is far below Scott's.
  assert.ok(cv.factor! < 0.5 * scott.factor!, `cv ${cv.factor} vs scott ${scott.factor}`);
  // Within-cluster normal reference (Silverman 1986 eq. 3.28): h = 1.06 n_c^(-1/5), n_c = 200.
  const hRef = 1.06 * Math.pow(200, -0.2);
  const hDiff = Math.sqrt(fitKde(fromBuffer(x, 1), { bandwidth: "diffusion" }).bandwidth[0]);
  assert.ok(hDiff > 0.6 * hRef && hDiff < 1.5 * hRef, `diffusion h ${hDiff} vs ${hRef}`);
  const hCv = Math.sqrt(cv.bandwidth[0]);
  assert.ok(hCv > 0.4 * hRef && hCv < 2 * hRef, `cv h ${hCv} vs ${hRef}`);
  assert.ok(Array.isArray((cv.describe().parameters.cv as { factors: number[] }).factors));
});

Deno.test("kde: parallel evaluation (async and synchronous) equals logPdf, leaves no worker behind", async () => {
  const x = data(2000, 2, 9), q = queries(2100, 2, 1);
  const kde = fitKde(fromBuffer(x, 2));
  const a = kde.logPdf(fromBuffer(q, 2));
  const b = await kde.logPdfParallel(fromBuffer(q, 2), { workers: 2, minPairs: 0 });
  assert.deepEqual(b, a);
  // The synchronous logPdf waits on shared memory for its workers: same values again.
  const sync = fitKde(fromBuffer(x, 2), { parallelMinPairs: 0 }).logPdf(fromBuffer(q, 2));
  assert.deepEqual(sync, a);
});

Deno.test("kde: binned grid evaluator error is small and reported honestly", () => {
  const kde = fitKde(fromBuffer(data(3000, 1, 12), 1));
  const g = kdeGrid(kde, { size: 2048 });
  assert.ok(g.error.maxRelError < 1e-3, `${g.error.maxRelError}`);
  // Independent recomputation of the reported error at a node.
  const i = 1000;
  const exact = Math.exp(kde.logPdf(samples([g.axes[0][i]]))[0]);
  assert.ok(Math.abs(g.density[i] - exact) / exact < 1e-3);
  const k2 = fitKde(fromBuffer(data(500, 2, 13), 2));
  const g2 = kdeGrid(k2, { size: [128, 96] });
  assert.equal(g2.density.length, 128 * 96);
  const j = 64 * 96 + 40;
  const e2 = Math.exp(k2.logPdf(samples([[g2.axes[0][64], g2.axes[1][40]]]))[0]);
  assert.ok(Math.abs(g2.density[j] - e2) / e2 < 1e-2);
  assert.ok(g2.error.checked > 0 && g2.error.maxAbsErrorOverMax < 1e-2);
});

Deno.test("kde: bad input — n < 2, d mismatch, zero-variance column, singular matrix, NaN", () => {
  const code = (f: () => unknown, c: string) =>
    assert.throws(f, (e: unknown) => e instanceof SaddleError && e.code === c);
  code(() => fitKde([1]), "too-few-samples");
  const kde = fitKde([[0, 1], [1, 3], [2, 2]]);
  code(() => kde.logPdf(samples([1, 2])), "dimension-mismatch");
  code(() => fitKde([[0, 1], [1, 1], [2, 1]]), "singular");
  assert.throws(() => fitKde([[0, 1], [1, 1], [2, 1]]), /column 1 has zero variance/);
  code(() => fitKde([[0, 0], [1, 2], [2, 4]]), "singular"); // collinear columns
  code(() => fitKde([1, 2, 3], { bandwidth: [[0]] }), "singular");
  code(() => kde.logPdf({ n: 1, d: 2, data: new Float64Array([NaN, 0]) }), "non-finite");
  code(() => fitKde([1, 2, 3], { bandwidth: -1 }), "invalid-argument");
  code(() => fitKde([[1, 2], [2, 1], [0, 0]], { bandwidth: "diffusion" }), "invalid-argument");
  code(() => fitKde([1, 2, 3], { weights: [1, 2] }), "dimension-mismatch");
  // A constant column is fine with an explicit bandwidth matrix (documented way out).
  const ok = fitKde([[0, 1], [1, 1], [2, 1]], { bandwidth: [[0.5, 0], [0, 0.5]] });
  assert.ok(Number.isFinite(ok.logPdf(samples([[1, 1]]))[0]));
});

Deno.test("kde: zero weights drop points; weights equal to counts match duplicated data", () => {
  const a = fitKde([0, 1, 1, 3], { bandwidth: [0.3] });
  const b = fitKde([0, 1, 3, 7], { bandwidth: [0.3], weights: [1, 2, 1, 0] });
  assert.equal(b.points.n, 3);
  const q = samples([-1, 0.5, 2, 10]);
  const la = a.logPdf(q), lb = b.logPdf(q);
  for (let i = 0; i < 4; i++) assertClose(lb[i], la[i], { rel: 1e-14 });
});

Deno.test({
  name:
    "kde: diffusion bandwidth vs an independent numpy/scipy implementation of Botev et al. 2010",
  ignore: ignoreWithoutPython(["numpy", "scipy"]),
  async fn() {
    const r = new Rng(21);
    const x = Float64Array.from(
      { length: 1000 },
      (_, i) => r.normal(i % 4 ? 0 : 5, i % 4 ? 1 : 0.5),
    );
    const ref = await runReference<{ bandwidth: number; t_star: number }>("density_botev.py", {
      x,
    });
    const kde = fitKde(fromBuffer(x, 1), { bandwidth: "diffusion" });
    assertClose(Math.sqrt(kde.bandwidth[0]), ref.bandwidth, { rel: 1e-8 });
  },
});

Deno.test("kde 1-D: boxed Taylor evaluator equals brute force to 1e-12 (weighted, tails, ties)", () => {
  const r = new Rng(31);
  const n = 5000;
  const x = Float64Array.from(
    { length: n },
    (_, i) => (i % 7 === 0 ? 2.5 : r.normal(0, 1 + (i % 3))),
  );
  const w = Float64Array.from({ length: n }, () => r.uniform(0.01, 1));
  const q = Float64Array.from(
    { length: 400 },
    (_, i) => (i < 390 ? r.normal(0, 4) : 20 * (i - 394)),
  );
  for (const weights of [undefined, w]) {
    const fast = fitKde(fromBuffer(x, 1), { weights }).logPdf(fromBuffer(q, 1));
    const slow = fitKde(fromBuffer(x, 1), { weights, method: "blocked" }).logPdf(fromBuffer(q, 1));
    assert.ok(fast.every(Number.isFinite));
    assert.ok(maxRelError(fast, slow) <= 1e-12, `${maxRelError(fast, slow)}`);
  }
});

Deno.test("kde: diagonal bandwidth equals the product of 1-D kernels; describe() shows the choice", () => {
  const pts = [[0, 0], [1, 2], [-1, 1]];
  const kde = fitKde(pts, { bandwidth: [0.5, 2] });
  assert.equal(kde.rule, "diagonal");
  assert.deepEqual(Array.from(kde.bandwidth), [0.5, 0, 0, 2]);
  // Closed form: (1/3) Σ_i N(x; p_i1, 0.5) N(y; p_i2, 2).
  const x = 0.3, y = -0.7;
  const n1 = (v: number, m: number, s2: number) =>
    Math.exp(-((v - m) ** 2) / (2 * s2)) / Math.sqrt(2 * Math.PI * s2);
  const want = pts.reduce((a, p) => a + n1(x, p[0], 0.5) * n1(y, p[1], 2), 0) / 3;
  assertClose(kde.logPdf(samples([[x, y]]))[0], Math.log(want), { rel: 1e-14 });
  const desc = fitKde(fromBuffer(data(100, 1, 4), 1), { bandwidth: "diffusion" }).describe();
  assert.equal(desc.kind, "kde");
  assert.equal(desc.parameters.rule, "diffusion");
  assert.ok((desc.parameters.bandwidth as number) > 0);
  const html = displayBundle(desc)!["text/html"];
  assert.match(html, /diffusion/);
  assert.match(html, /tStar/);
});

Deno.test("kde: a query so far out that (x - z)² overflows gives -Infinity, never NaN, in every evaluator", () => {
  // log N(x; z, h²) = -(x - z)²/(2h²) - ...: at |x| = 1e200 the square overflows and the
  // log-density is -Infinity (below every double), as gaussian().logPdf reports; NaN would
  // poison every sum it enters. Common practice, no source.
  const one = samples([0, 1, 2, 3, 0.5, 1.5, 2.5, 3.5, 0.2, 0.7]);
  const two = samples([[0, 1], [1, 0], [2, 2], [3, 1], [0.5, 0.5], [1, 1]]);
  const far1 = samples([1e200, -1e200, 1e155, 1.5]);
  const far2 = samples([[1e200, 0], [0, -1e160], [1, 1]]);
  for (const method of ["sorted", "tree", "blocked"] as const) {
    const v = fitKde(one, { method }).logPdf(far1);
    assert.deepEqual(Array.from(v.subarray(0, 3)), [-Infinity, -Infinity, -Infinity], method);
    assert.ok(Number.isFinite(v[3]), method);
    if (method === "sorted") continue;
    const w = fitKde(two, { method }).logPdf(far2);
    assert.deepEqual(Array.from(w.subarray(0, 2)), [-Infinity, -Infinity], method);
    assert.ok(Number.isFinite(w[2]), method);
  }
});

Deno.test("kde 2-D fast Gauss transform: relative error <= 1e-10 against exact sums, weighted, far tails", () => {
  // The bound is the transform's (Greengard & Strain 1991 series, Cramér's inequality):
  // checked here against two exact evaluators, on the core, in thin regions and far out.
  const r = new Rng(41);
  const n = 3000, m = 3000;
  const z = new Float64Array(n * 2);
  for (let i = 0; i < n; i++) {
    const mode = i % 3;
    z[2 * i] = r.normal(mode === 2 ? 9 : 0, 4);
    z[2 * i + 1] = r.normal(mode === 1 ? -6 : 0, 3);
  }
  const lw = Float64Array.from({ length: n }, () => Math.log(r.uniform(0.01, 1)));
  let total = -Infinity;
  for (const v of lw) total = Math.max(total, v) + Math.log1p(Math.exp(-Math.abs(total - v)));
  for (let i = 0; i < n; i++) lw[i] -= total;
  const q = new Float64Array(m * 2);
  for (let i = 0; i < m; i++) {
    const far = i % 50 === 0 ? 6 : 1;
    q[2 * i] = far * r.normal(3, 6);
    q[2 * i + 1] = far * r.normal(-2, 5);
  }
  for (const weights of [null, lw]) {
    const tree = makeEvaluator(z, 2, weights, "tree");
    const fgt = fgtEvaluator(z, weights, tree) as FgtEvaluator;
    assert.equal(fgt.method, "fgt");
    const a = new Float64Array(m), b = new Float64Array(m), c = new Float64Array(m);
    fgt.evaluate(q, a, 0, m);
    tree.evaluate(q, b, 0, m);
    makeEvaluator(z, 2, weights, "blocked").evaluate(q, c, 0, m);
    let worst = 0;
    for (let i = 0; i < m; i++) {
      assert.ok(Number.isFinite(a[i]), `query ${i}`);
      worst = Math.max(worst, Math.abs(Math.expm1(a[i] - b[i])), Math.abs(Math.expm1(a[i] - c[i])));
    }
    assert.ok(worst <= FGT_RELATIVE_ERROR, `density rel err ${worst}`);
    // The transform did the bulk of the work; the far queries went to the exact evaluator.
    assert.ok(fgt.accepted > 0.8 * m && fgt.accepted < m, `accepted ${fgt.accepted}`);
  }
});

Deno.test({
  name:
    "kde 2-D: a large job takes the transform, matches scipy's logpdf, same bits for any worker count",
  ignore: ignoreWithoutPython(["numpy", "scipy"]),
  async fn() {
    const n = 8000, m = 8000;
    const x = data(n, 2, 51), q = queries(m, 2, 52);
    const kde = fitKde(fromBuffer(x, 2));
    assert.equal(kde.method, "fgt");
    const lp = kde.logPdf(fromBuffer(q, 2));
    const ref = await runReference<ScipyKde>("density_kde.py", { data: x, d: 2, queries: q });
    // 1e-10 relative on the density is at most ~1e-10 absolute on its log.
    let worst = 0;
    for (let i = 0; i < m; i++) worst = Math.max(worst, Math.abs(lp[i] - ref.logpdf[i]));
    assert.ok(worst <= 2e-10, `log-density abs err ${worst}`);
    const par = await kde.logPdfParallel(fromBuffer(q, 2), { workers: 2, minPairs: 0 });
    assert.deepEqual(Array.from(par), Array.from(lp));
    const sync = fitKde(fromBuffer(x, 2), { parallelMinPairs: 0 }).logPdf(fromBuffer(q, 2));
    assert.deepEqual(Array.from(sync), Array.from(lp));
    assert.throws(() => fitKde(fromBuffer(x, 2).data.subarray(0, 100), { method: "fgt" }), /2-D/);
  },
});
