import assert from "node:assert/strict";
import { fitHistogram } from "../../lib/density/histogram.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";
import { Rng } from "../../lib/random/rng.ts";
import { fromBuffer, samples } from "../../lib/samples/samples.ts";
import { assertClose, assertWithinSe } from "../_assert.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";

function normalData(n: number, d: number, seed: number): Float64Array {
  return new Rng(seed).fillNormal(new Float64Array(n * d));
}

for (const d of [1, 2]) {
  Deno.test({
    name: `histogram ${d}-D: counts equal numpy.histogram${d === 2 ? "2d" : ""}`,
    ignore: ignoreWithoutPython(["numpy"]),
    async fn() {
      const x = normalData(2000, d, d);
      const bins = d === 1 ? [37] : [13, 9];
      const lower = d === 1 ? [-5] : [-5, -4.5];
      const upper = d === 1 ? [5] : [5, 4.5];
      const h = fitHistogram(fromBuffer(x, d), { bins, lower, upper, pseudoCount: 0 });
      const ref = await runReference<{ counts: number[] }>("density_histogram.py", {
        data: x,
        d,
        bins,
        lower,
        upper,
      });
      assert.deepEqual(Array.from(h.counts), ref.counts);
    },
  });
}

Deno.test("histogram: pseudo-count formula (count + α) / (N + α B) / volume and integration to 1", () => {
  const h = fitHistogram([0.1, 0.2, 0.3, 0.9], { bins: 4, lower: 0, upper: 1, pseudoCount: 1 });
  // Laplace's rule: cells [2, 1, 0, 1] (0.3 falls in [0.25, 0.5)) → (c + 1) / (4 + 4).
  assert.deepEqual(Array.from(h.probabilities), [3 / 8, 2 / 8, 1 / 8, 2 / 8]);
  assertClose(h.logPdf(samples([0.6]))[0], Math.log((1 / 8) / 0.25), { rel: 1e-15 });
  const h2 = fitHistogram(fromBuffer(normalData(500, 2, 3), 2), { bins: [10, 12] });
  const m = 240; // a multiple of both bin counts: the midpoint rule is then exact
  const [lx, ly] = h2.lower, [ux, uy] = h2.upper;
  const dx = (ux - lx) / m, dy = (uy - ly) / m;
  const pts = new Float64Array(m * m * 2);
  for (let i = 0; i < m; i++) {
    for (let j = 0; j < m; j++) {
      pts[(i * m + j) * 2] = lx + (i + 0.5) * dx;
      pts[(i * m + j) * 2 + 1] = ly + (j + 0.5) * dy;
    }
  }
  const lp = h2.logPdf(fromBuffer(pts, 2));
  let s = 0;
  for (const v of lp) s += Math.exp(v) * dx * dy;
  assertClose(s, 1, { abs: 1e-12 });
});

Deno.test("histogram: samples reproduce the histogram's mean within 5 se", () => {
  const h = fitHistogram([0, 0, 1, 3, 3, 3, 4], { bins: 4, lower: 0, upper: 4, pseudoCount: 0 });
  // Piecewise-uniform mean: Σ p_c × cell centre; variance Σ p_c (centre² + 1/12) - mean².
  const p = h.probabilities;
  const mean = p.reduce((a, v, c) => a + v * (c + 0.5), 0);
  const second = p.reduce((a, v, c) => a + v * ((c + 0.5) ** 2 + 1 / 12), 0);
  const s = h.sample(20000, 2);
  let sm = 0;
  for (const v of s.data) sm += v / s.n;
  assertWithinSe(sm, mean, Math.sqrt((second - mean * mean) / s.n));
});

Deno.test("histogram: bad input rejected; outside the grid is -Infinity", () => {
  const code = (f: () => unknown, c: string) =>
    assert.throws(f, (e: unknown) => e instanceof SaddleError && e.code === c);
  code(() => fitHistogram([1]), "too-few-samples");
  code(() => fitHistogram([1, 1, 1]), "invalid-argument"); // zero width
  code(() => fitHistogram([1, 5], { lower: 0, upper: 2 }), "invalid-argument");
  code(() => fitHistogram([[1, 2, 3], [2, 3, 4]]), "invalid-argument");
  const h = fitHistogram([0, 1, 2]);
  code(() => h.logPdf(samples([[1, 2]])), "dimension-mismatch");
  assert.equal(h.logPdf(samples([-1]))[0], -Infinity);
  assert.ok(Number.isFinite(h.logPdf(samples([2]))[0]), "upper edge belongs to the last bin");
});

Deno.test({
  name:
    "histogram default bins: the Freedman–Diaconis count numpy.histogram_bin_edges(x, 'fd') picks",
  ignore: ignoreWithoutPython(["numpy"]),
  async fn() {
    // Freedman & Diaconis 1981: width 2 IQR n^(-1/3), the IQR from interpolated quartiles
    // (numpy.percentile's default, Hyndman & Fan type 7); small n is where floor-index
    // quartiles pick another count.
    const r = new Rng(11);
    const cases = [7, 10, 12, 20, 33, 50, 301].map((n) =>
      Array.from({ length: n }, () => Math.round(1000 * r.normal()) / 1000)
    );
    const ref = await runReference<{ bins: number[] }>("density_fd_bins.py", { cases });
    cases.forEach((x, i) => assert.equal(fitHistogram(x).bins[0], ref.bins[i], `case ${i}`));
  },
});
