import assert from "node:assert/strict";
import normalLogpdf from "@stdlib/stats-base-dists-normal-logpdf";
import fc from "fast-check";
import { gaussian } from "../../lib/density/gaussian.ts";
import { gaussianMixture } from "../../lib/density/gaussian_mixture.ts";
import { uniformBox } from "../../lib/density/uniform_box.ts";
import { displayBundle } from "../../lib/display/display.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";
import { Rng } from "../../lib/random/rng.ts";
import { fromBuffer, samples } from "../../lib/samples/samples.ts";
import { assertClose, assertWithinSe } from "../_assert.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";

Deno.test("gaussian 1-D: logPdf equals @stdlib normal logpdf (property, fixed seed)", () => {
  fc.assert(
    fc.property(
      fc.double({ min: -50, max: 50, noNaN: true }),
      fc.double({ min: -5, max: 5, noNaN: true }),
      fc.double({ min: 0.01, max: 20, noNaN: true }),
      (x, mu, sd) => {
        const g = gaussian(mu, sd * sd);
        assertClose(g.logPdf(samples([x]))[0], normalLogpdf(x, mu, sd), { rel: 1e-12, abs: 1e-12 });
      },
    ),
    { seed: 20260101, numRuns: 300 },
  );
});

Deno.test("gaussian d-D: logPdf equals the closed form with an explicit 2x2 inverse", () => {
  // log N = -log(2π) - ½ log det Σ - ½ (x-μ)ᵀ Σ⁻¹ (x-μ), Σ⁻¹ = adj(Σ) / det Σ for 2 x 2.
  const [a, b, c] = [2, 0.7, 1.5];
  const g = gaussian([1, -1], [[a, b], [b, c]]);
  const det = a * c - b * b;
  const r = new Rng(4);
  for (let t = 0; t < 50; t++) {
    const x = [r.normal(0, 3), r.normal(0, 3)];
    const u = x[0] - 1, v = x[1] + 1;
    const quad = (c * u * u - 2 * b * u * v + a * v * v) / det;
    const want = -Math.log(2 * Math.PI) - 0.5 * Math.log(det) - 0.5 * quad;
    assertClose(g.logPdf(samples([x]))[0], want, { rel: 1e-13 });
  }
  assert.deepEqual(Array.from(g.mean), [1, -1]);
  assert.deepEqual(Array.from(g.cov), [a, b, b, c]);
});

Deno.test("gaussian: sample mean and covariance within 5 se of the parameters", () => {
  const cov = [[4, 1.2, 0], [1.2, 1, -0.3], [0, -0.3, 2]];
  const g = gaussian([1, 2, 3], cov);
  const n = 20000;
  const s = g.sample(n, "moments");
  for (let j = 0; j < 3; j++) {
    let m = 0;
    for (let i = 0; i < n; i++) m += s.data[i * 3 + j] / n;
    assertWithinSe(m, j + 1, Math.sqrt(cov[j][j] / n));
  }
  // Cross-covariance (0, 1): Var of the product term is Σ00 Σ11 + Σ01² for a normal.
  let c01 = 0;
  for (let i = 0; i < n; i++) c01 += (s.data[i * 3] - 1) * (s.data[i * 3 + 1] - 2) / n;
  assertWithinSe(c01, 1.2, Math.sqrt((4 * 1 + 1.2 * 1.2) / n));
  assert.deepEqual(g.sample(5, 9).data, g.sample(5, 9).data, "same seed, same bits");
});

Deno.test("gaussian: bad input is rejected with a clear SaddleError", () => {
  const code = (f: () => unknown, c: string) =>
    assert.throws(f, (e: unknown) => e instanceof SaddleError && e.code === c);
  code(() => gaussian([0, 0], [[1, 1], [1, 1]]), "singular");
  code(() => gaussian(0, -1), "singular");
  code(() => gaussian([0, 0], [1, 0, 0]), "dimension-mismatch");
  code(() => gaussian([0, 0], [[1, 0.5], [0.2, 1]]), "invalid-argument");
  code(() => gaussian([0, NaN], 1), "non-finite");
  const g = gaussian([0, 0], 1);
  code(() => g.logPdf(samples([1, 2, 3])), "dimension-mismatch");
  code(() => g.logPdf({ n: 1, d: 2, data: new Float64Array([0, NaN]) }), "non-finite");
  code(() => g.sample(0, 1), "invalid-argument");
});

Deno.test("gaussian: describe() has a rich notebook display", () => {
  const desc = gaussian([0, 1], [[1, 0], [0, 2]]).describe();
  assert.equal(desc.kind, "gaussian");
  const b = displayBundle(desc)!;
  assert.match(b["text/html"], /<table/);
  assert.match(b["text/plain"], /logDet/);
});

Deno.test({
  name: "mixture: logPdf vs direct summation in 50-digit decimal arithmetic, incl. far tails",
  ignore: ignoreWithoutPython([]),
  async fn() {
    const params = {
      weights: [0.2, 0.5, 0.3],
      means: [[-3, 0], [2, 1], [0, 6]],
      covariances: [[1, 0.3, 0.3, 0.5], [2, -0.5, -0.5, 1], [0.2, 0, 0, 0.2]],
    };
    const m = gaussianMixture(params);
    const r = new Rng(2);
    const queries = Array.from({ length: 40 }, () => [r.normal(0, 4), r.normal(2, 4)]);
    queries.push([40, -40], [200, 300]);
    const ref = await runReference<{ logpdf: number[] }>("density_mixture_hp.py", {
      ...params,
      queries,
    });
    const lp = m.logPdf(samples(queries));
    for (let i = 0; i < lp.length; i++) {
      assertClose(lp[i], ref.logpdf[i], { rel: 1e-13 }, `query ${i}`);
    }
  },
});

Deno.test("mixture: sampling matches the mixture mean and variance within 5 se (1-D)", () => {
  const w = [0.25, 0.75], mu = [-2, 3], v = [0.5, 2];
  const m = gaussianMixture({ weights: w, means: mu, covariances: v });
  const mean = w[0] * mu[0] + w[1] * mu[1];
  const second = w[0] * (v[0] + mu[0] ** 2) + w[1] * (v[1] + mu[1] ** 2);
  const variance = second - mean * mean;
  const n = 40000;
  const s = m.sample(n, 3);
  let sm = 0;
  for (let i = 0; i < n; i++) sm += s.data[i] / n;
  let sv = 0, m4 = 0;
  for (let i = 0; i < n; i++) {
    const t = (s.data[i] - sm) ** 2;
    sv += t / (n - 1);
    m4 += (t * t) / n;
  }
  assertWithinSe(sm, mean, Math.sqrt(variance / n));
  assertWithinSe(sv, variance, Math.sqrt((m4 - variance * variance) / n));
  assert.equal(m.components.length, 2);
  assert.deepEqual(Array.from(m.weights), w);
});

Deno.test("mixture: weights are normalised; bad input rejected", () => {
  const m = gaussianMixture({ weights: [1, 3], means: [0, 1], covariances: [1, 1] });
  assert.deepEqual(Array.from(m.weights), [0.25, 0.75]);
  const code = (f: () => unknown, c: string) =>
    assert.throws(f, (e: unknown) => e instanceof SaddleError && e.code === c);
  code(
    () => gaussianMixture({ weights: [1], means: [0, 1], covariances: [1, 1] }),
    "dimension-mismatch",
  );
  code(
    () => gaussianMixture({ weights: [-1, 2], means: [0, 1], covariances: [1, 1] }),
    "invalid-argument",
  );
  code(() => gaussianMixture({ weights: [1, 1], means: [0, 1], covariances: [1, 0] }), "singular");
  code(
    () => gaussianMixture({ weights: [1, 1], means: [0, [1, 2]], covariances: [1, 1] }),
    "dimension-mismatch",
  );
});

Deno.test("uniformBox: log-density, boundaries and exact sampling", () => {
  const u = uniformBox([-1, 0], [1, 5]);
  const lp = u.logPdf(samples([[0, 2], [-1, 0], [1, 5], [1.0001, 2], [0, -1e-9]]));
  for (let i = 0; i < 3; i++) assertClose(lp[i], -Math.log(10), { rel: 1e-15 });
  assert.deepEqual(Array.from(lp.subarray(3)), [-Infinity, -Infinity]);
  const s = u.sample(20000, 1);
  let m0 = 0, m1 = 0;
  for (let i = 0; i < s.n; i++) {
    m0 += s.data[2 * i] / s.n;
    m1 += s.data[2 * i + 1] / s.n;
    assert.ok(
      s.data[2 * i] >= -1 && s.data[2 * i] < 1 && s.data[2 * i + 1] >= 0 && s.data[2 * i + 1] < 5,
    );
  }
  // Var of U(a, b) is (b - a)² / 12.
  assertWithinSe(m0, 0, Math.sqrt(4 / 12 / s.n));
  assertWithinSe(m1, 2.5, Math.sqrt(25 / 12 / s.n));
  assert.throws(() => uniformBox([0, 1], [1, 1]), /must exceed/);
  assert.equal(uniformBox(0, 2).logPdf(fromBuffer(new Float64Array([1]), 1))[0], -Math.log(2));
});
