/**
 * Gaussian closed forms and discrete KL / JSD against scipy (sqrtm for the Fréchet
 * distance, multivariate_normal.entropy, spatial.distance.jensenshannon, stats.entropy) and
 * the published 1-D forms.
 */
import assert from "node:assert/strict";
import fc from "fast-check";
import { assertClose } from "../_assert.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";
import { gaussian } from "../../lib/density/mod.ts";
import {
  gaussianBhattacharyya,
  gaussianEntropy,
  gaussianFrechet,
  gaussianHellinger,
  gaussianKl,
  jsdDiscrete,
  klDiscrete,
} from "../../lib/divergence/mod.ts";
import { SaddleError } from "../../lib/errors/mod.ts";
import { Rng } from "../../lib/random/mod.ts";

const A = { mean: [0.3, -1, 2], cov: [2, 0.4, -0.2, 0.4, 1, 0.3, -0.2, 0.3, 1.5] };
const B = { mean: [-0.5, 0.2, 1], cov: [1, -0.1, 0, -0.1, 0.8, 0.2, 0, 0.2, 2.5] };
const rows = (c: number[], d: number) =>
  Array.from({ length: d }, (_, i) => c.slice(i * d, (i + 1) * d));

Deno.test("gaussianKl: 1-D published form, zero on itself, accepts a density object", () => {
  // KL(N(m1, s1²) || N(m2, s2²)) = ln(s2/s1) + (s1² + (m1 - m2)²)/(2 s2²) - ½ (Kullback 1959)
  const kl = gaussianKl({ mean: [1], cov: 0.25 }, { mean: [-1], cov: 9 });
  assertClose(kl, Math.log(3 / 0.5) + (0.25 + 4) / 18 - 0.5, { rel: 1e-14 });
  assert.equal(gaussianKl(A, A), 0);
  const g = gaussian(A.mean, A.cov);
  assertClose(gaussianKl(g, B), gaussianKl(A, B), { rel: 1e-14 });
  assertClose(gaussianKl(A, B, { base: 2 }), gaussianKl(A, B) / Math.LN2, { rel: 1e-14 });
  assert.throws(() => gaussianKl(A, { mean: [0], cov: 1 }), /same space/);
  assert.throws(() => gaussianKl(A, { mean: [0, 0, 0], cov: [1, 2, 3] }), SaddleError);
  assert.throws(
    () => gaussianKl(A, { mean: [0, 0, 0], cov: [1, 0, 0, 0, 0, 0, 0, 0, 1] }),
    /not positive definite/,
  );
});

Deno.test("gaussianBhattacharyya / gaussianHellinger: 1-D published form (Kailath 1967)", () => {
  // D_B = (m1 - m2)² / (4 (s1² + s2²)) + ½ ln((s1² + s2²) / (2 s1 s2))
  const d = gaussianBhattacharyya({ mean: [1], cov: 4 }, { mean: [-2], cov: 1 });
  assertClose(d, 9 / 20 + 0.5 * Math.log(5 / 4), { rel: 1e-14 });
  assertClose(
    gaussianHellinger({ mean: [1], cov: 4 }, { mean: [-2], cov: 1 }),
    Math.sqrt(1 - Math.exp(-d)),
    {
      rel: 1e-14,
    },
  );
  assert.equal(gaussianHellinger(A, A), 0);
  assert.ok(gaussianHellinger(A, B) < 1);
});

Deno.test({
  name: "gaussianFrechet and gaussianEntropy vs scipy (linalg.sqrtm, multivariate_normal.entropy)",
  ignore: ignoreWithoutPython(["scipy"]),
  async fn() {
    const ref = await runReference<{ frechet: number[]; entropy: number[] }>(
      "divergence_quad.py",
      {
        frechet: [
          { mean_a: A.mean, cov_a: rows(A.cov, 3), mean_b: B.mean, cov_b: rows(B.cov, 3) },
          { mean_a: [0], cov_a: [[1]], mean_b: [3], cov_b: [[4]] },
        ],
        entropy: [{ mean: A.mean, cov: rows(A.cov, 3) }, { mean: [0], cov: [[2]] }],
      },
    );
    assertClose(gaussianFrechet(A, B), ref.frechet[0], { rel: 1e-10 });
    assertClose(gaussianFrechet({ mean: [0], cov: 1 }, { mean: [3], cov: 4 }), ref.frechet[1], {
      rel: 1e-12,
    });
    assertClose(gaussianEntropy(A), ref.entropy[0], { rel: 1e-13 });
    assertClose(gaussianEntropy({ mean: [0], cov: 2 }), ref.entropy[1], { rel: 1e-13 });
    assert.equal(gaussianFrechet(A, A) < 1e-12, true);
  },
});

Deno.test({
  name: "jsdDiscrete = scipy jensenshannon² and klDiscrete = scipy stats.entropy on random vectors",
  ignore: ignoreWithoutPython(["scipy"]),
  async fn() {
    const r = new Rng(8);
    const cases = Array.from({ length: 12 }, (_, k) => {
      const len = 2 + (k % 6);
      const v = () => Array.from({ length: len }, () => r.uniform(0.01, 1));
      return { p: v(), q: v() };
    });
    // A case with zeros where both vanish and where only one does.
    cases.push({ p: [0.5, 0.5, 0, 0], q: [0.25, 0.25, 0.5, 0] });
    const ref = await runReference<{ discrete: { jsd: number; kl: number }[] }>(
      "divergence_quad.py",
      { discrete: cases },
    );
    cases.forEach((c, i) => {
      assertClose(
        jsdDiscrete(c.p, c.q),
        ref.discrete[i].jsd,
        { rel: 1e-12, abs: 1e-16 },
        `jsd ${i}`,
      );
      assertClose(klDiscrete(c.p, c.q), ref.discrete[i].kl, { rel: 1e-12, abs: 1e-16 }, `kl ${i}`);
    });
  },
});

Deno.test("jsdDiscrete: within [0, ln 2] (Lin 1991); symmetric; bad input", () => {
  fc.assert(
    fc.property(
      fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 2, maxLength: 8 }),
      fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 2, maxLength: 8 }),
      (a, b) => {
        const n = Math.min(a.length, b.length);
        const p = a.slice(0, n), q = b.slice(0, n);
        if (p.reduce((s, v) => s + v, 0) === 0 || q.reduce((s, v) => s + v, 0) === 0) return;
        const j = jsdDiscrete(p, q);
        assert.ok(j >= 0 && j <= Math.LN2);
        assertClose(j, jsdDiscrete(q, p), { rel: 1e-12, abs: 1e-15 });
      },
    ),
    { seed: 42, numRuns: 200 },
  );
  assert.throws(() => jsdDiscrete([1, 0], [1]), /same outcomes/);
  assert.throws(() => jsdDiscrete([1, -1], [1, 1]), />= 0/);
  assert.throws(() => klDiscrete([0, 0], [1, 1]), /sums to 0/);
  assert.throws(() => klDiscrete([], []), SaddleError);
});

Deno.test("gaussianFrechet accepts singular (PSD) covariances, as FID with n < d needs", () => {
  // Dowson & Landau 1982: the formula holds for positive semi-definite covariances. By hand
  // for diagonal covariances: ||Δμ||² + Σ_i (√a_i - √b_i)²; here 1 + (1 - 2)² + 0 = 2.
  const a = { mean: [0, 0], cov: [1, 0, 0, 0] }, b = { mean: [1, 0], cov: [4, 0, 0, 0] };
  assertClose(gaussianFrechet(a, b), 2, { rel: 1e-12 });
  assert.equal(gaussianFrechet(a, a), 0);
  // Rank one, Σ_a = vvᵀ with v = (1, 1, 1), against Σ_b = I: (Σ_a^½ Σ_b Σ_a^½)^½ = Σ_a^½ =
  // vvᵀ/|v|, of trace |v| = √3, so the distance is tr Σ_a + tr Σ_b - 2√3 = 6 - 2√3.
  const rank1 = { mean: [0, 0, 0], cov: new Array(9).fill(1) };
  const eye = { mean: [0, 0, 0], cov: [1, 0, 0, 0, 1, 0, 0, 0, 1] };
  assertClose(gaussianFrechet(rank1, eye), 6 - 2 * Math.sqrt(3), { rel: 1e-10 });
  // Not PSD, or not symmetric: a SaddleError naming the covariance.
  assert.throws(() => gaussianFrechet({ mean: [0], cov: -1 }, { mean: [0], cov: 1 }), /a\.cov/);
  assert.throws(
    () =>
      gaussianFrechet({ mean: [0, 0], cov: [1, 0.5, 0, 1] }, { mean: [0, 0], cov: [1, 0, 0, 1] }),
    /a\.cov.*symmetric/,
  );
});

Deno.test("gaussianFrechet: a b.cov with a negative eigenvalue is refused even where a.cov is singular", () => {
  // a.cov's null space would hide b's negative direction from Σ_a^½ Σ_b Σ_a^½.
  assert.throws(
    () =>
      gaussianFrechet({ mean: [0, 0], cov: [1, 0, 0, 0] }, { mean: [0, 0], cov: [1, 0, 0, -1] }),
    /b\.cov is not positive semi-definite/,
  );
});
