/**
 * The code moved onto lib/linalg (EM's pass and initial M-step, the Gaussian log-density,
 * the KDE's whitening, the sample covariance, the Gaussian closed forms) against the
 * straightforward per-point TypeScript it replaced, written out here as it was: numbers
 * within 1e-12 relative (to the scale of the quantity), on random and ill-conditioned
 * inputs, on whichever backend is active (CI runs this file again with SADDLEKIT_BLAS=off).
 * The same quantities are checked against scipy / scikit-learn in the other density and
 * divergence tests.
 */
import assert from "node:assert/strict";
import { emPass, prepare } from "../../lib/density/_em_pass.ts";
import { fitGaussianMixture, gaussian } from "../../lib/density/mod.ts";
import { gaussianFrechet, gaussianKl } from "../../lib/divergence/mod.ts";
import { cholesky, covariance, linalgBackend, sqrtSymmetric, trsm } from "../../lib/linalg/mod.ts";
import { Rng } from "../../lib/random/rng.ts";
import { fromBuffer } from "../../lib/samples/samples.ts";
import { assertAllClose, assertClose } from "../_assert.ts";

const backend = linalgBackend().name;

/**
 * `L Lᵀ` for a random lower `L` whose rows scale from 1 down to `10^-spread` (κ about
 * `10^(2 spread)`).
 */
function randomCovariance(d: number, spread: number, r: Rng): Float64Array {
  const L = new Float64Array(d * d);
  for (let i = 0; i < d; i++) {
    const lii = 10 ** (-spread * i / Math.max(1, d - 1));
    for (let j = 0; j < i; j++) L[i * d + j] = r.normal() * 0.3 * lii;
    L[i * d + i] = lii;
  }
  const c = new Float64Array(d * d);
  for (let i = 0; i < d; i++) {
    for (let j = 0; j <= i; j++) {
      let s = 0;
      for (let k = 0; k <= j; k++) s += L[i * d + k] * L[j * d + k];
      c[i * d + j] = c[j * d + i] = s;
    }
  }
  return c;
}

const maxAbs = (x: ArrayLike<number>) =>
  Array.from(x).reduce((m, v) => Math.max(m, Math.abs(v)), 0);

/** Element-wise within `rel` of the scale (largest entry) of `expected`. */
function assertScaled(actual: ArrayLike<number>, expected: ArrayLike<number>, what: string) {
  assertAllClose(actual, expected, { abs: 1e-12 * maxAbs(expected) }, what);
}

/** Forward substitution row by row: `L⁻¹ (x - mean)` (the old Gaussian and KDE loops). */
function oldWhiten(x: Float64Array, d: number, L: Float64Array, mean?: Float64Array) {
  const z = new Float64Array(x.length);
  for (let r = 0; r < x.length / d; r++) {
    const o = r * d;
    for (let i = 0; i < d; i++) {
      let s = x[o + i] - (mean ? mean[i] : 0);
      for (let k = 0; k < i; k++) s -= L[i * d + k] * z[o + k];
      z[o + i] = s / L[i * d + i];
    }
  }
  return z;
}

/** The old EM pass: inverse factors, per-point quadratic forms and moments. */
function oldEmPass(
  { data, n, d, k, w, mu, cov }: {
    data: Float64Array;
    n: number;
    d: number;
    k: number;
    w: Float64Array;
    mu: Float64Array;
    cov: Float64Array;
  },
) {
  const U = new Float64Array(k * d * d), base = new Float64Array(k);
  for (let j = 0; j < k; j++) {
    const L = cholesky(cov.subarray(j * d * d, (j + 1) * d * d), d);
    let logDet = 0;
    for (let c = 0; c < d; c++) {
      logDet += 2 * Math.log(L[c * d + c]);
      U[j * d * d + c * d + c] = 1 / L[c * d + c];
      for (let r = c + 1; r < d; r++) {
        let t = 0;
        for (let m = c; m < r; m++) t -= L[r * d + m] * U[j * d * d + m * d + c];
        U[j * d * d + r * d + c] = t / L[r * d + r];
      }
    }
    base[j] = Math.log(w[j]) - 0.5 * (d * Math.log(2 * Math.PI) + logDet);
  }
  const ll = new Float64Array(n), nk = new Float64Array(k);
  const s1 = new Float64Array(k * d), s2 = new Float64Array(k * d * d);
  const dev = new Float64Array(k * d), v = new Float64Array(k);
  for (let i = 0; i < n; i++) {
    let m = -Infinity;
    for (let j = 0; j < k; j++) {
      for (let a = 0; a < d; a++) dev[j * d + a] = data[i * d + a] - mu[j * d + a];
      let q = 0;
      for (let a = 0; a < d; a++) {
        let t = 0;
        for (let b = 0; b <= a; b++) t += U[j * d * d + a * d + b] * dev[j * d + b];
        q += t * t;
      }
      v[j] = base[j] - 0.5 * q;
      m = Math.max(m, v[j]);
    }
    let sum = 0;
    for (let j = 0; j < k; j++) sum += v[j] = Math.exp(v[j] - m);
    ll[i] = m + Math.log(sum);
    for (let j = 0; j < k; j++) {
      const r = v[j] / sum;
      if (r < 1e-14) continue;
      nk[j] += r;
      for (let a = 0; a < d; a++) {
        s1[j * d + a] += r * dev[j * d + a];
        for (let b = 0; b < d; b++) {
          s2[j * d * d + a * d + b] += r * dev[j * d + a] * dev[j * d + b];
        }
      }
    }
  }
  return { ll, nk, s1, s2 };
}

for (
  const [label, spread, d] of [
    ["random", 0.5, 12],
    ["random", 0.5, 20],
    ["ill-conditioned (κ ~ 1e10)", 5, 12],
    ["ill-conditioned (κ ~ 1e10)", 5, 20],
  ] as const
) {
  Deno.test(`linalg paths (${backend}), ${label}, d = ${d}: EM pass, Gaussian logPdf, whitening, covariance as before`, () => {
    const r = new Rng(`paths-${spread}-${d}`);
    // d = 12 takes EM's fused small-d loop, d = 20 the block solves.
    const n = 700, k = 3;
    const cov = new Float64Array(k * d * d), mu = new Float64Array(k * d);
    for (let j = 0; j < k; j++) cov.set(randomCovariance(d, spread, r), j * d * d);
    const data = new Float64Array(n * d);
    for (let i = 0; i < n * d; i++) data[i] = r.normal() * 0.5;
    for (let i = 0; i < k * d; i++) mu[i] = data[(i * 37) % (n * d)];
    const w = Float64Array.from([0.2, 0.5, 0.3]);

    const old = oldEmPass({ data, n, d, k, w, mu, cov });
    const ll = new Float64Array(n);
    const stats = {
      nk: new Float64Array(k),
      s1: new Float64Array(k * d),
      s2: new Float64Array(k * d * d),
    };
    const prep = prepare(w, cov, k, d);
    const total = emPass({ data, from: 0, to: n, d, k, mu, prep, full: true, ll, stats });
    assertAllClose(ll, old.ll, { rel: 1e-12 }, "EM log-likelihood per point");
    assertClose(total, old.ll.reduce((a, b) => a + b, 0), { rel: 1e-12 }, "EM total");
    assertAllClose(stats.nk, old.nk, { rel: 1e-12 }, "EM nk");
    for (let j = 0; j < k; j++) {
      const s1 = (x: Float64Array) => x.subarray(j * d, (j + 1) * d);
      const s2 = (x: Float64Array) => x.subarray(j * d * d, (j + 1) * d * d);
      assertScaled(s1(stats.s1), s1(old.s1), `EM s1 of component ${j}`);
      assertScaled(s2(stats.s2), s2(old.s2), `EM s2 of component ${j}`);
    }

    // Gaussian log-density: the old per-row forward substitution.
    const c0 = cov.subarray(0, d * d), m0 = mu.subarray(0, d);
    const g = gaussian(m0, c0);
    const z = oldWhiten(data, d, g.choleskyFactor, m0);
    const expected = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      let q = 0;
      for (let a = 0; a < d; a++) q += z[i * d + a] ** 2;
      expected[i] = -0.5 * (d * Math.log(2 * Math.PI) + g.logDet) - 0.5 * q;
    }
    assertAllClose(g.logPdf(fromBuffer(data, d)), expected, { rel: 1e-12 }, "gaussian logPdf");

    // Whitening of the KDE (rows L⁻¹ x in one trsm).
    const L = cholesky(c0, d);
    assertScaled(
      trsm(L, data, { m: n, n: d, side: "right", transpose: true }),
      oldWhiten(data, d, L),
      "whitening",
    );

    // Two-pass covariance, weighted and not, about the mean (the old accumulation).
    const scaled = Float64Array.from(data, (v, i) => v * (1 + (i % d)) + 1e3);
    const wts = Float64Array.from({ length: n }, (_, i) => 0.5 + (i % 5));
    for (const weights of [undefined, wts]) {
      const mean = new Float64Array(d);
      let sw = 0, sw2 = 0;
      for (let i = 0; i < n; i++) {
        const wi = weights ? weights[i] : 1;
        sw += wi;
        for (let a = 0; a < d; a++) mean[a] += wi * scaled[i * d + a];
      }
      for (let a = 0; a < d; a++) mean[a] /= sw;
      const ref = new Float64Array(d * d);
      for (let i = 0; i < n; i++) {
        const wi = weights ? weights[i] : 1;
        sw2 += wi * wi;
        for (let a = 0; a < d; a++) {
          for (let b = 0; b < d; b++) {
            ref[a * d + b] += wi * (scaled[i * d + a] - mean[a]) * (scaled[i * d + b] - mean[b]);
          }
        }
      }
      for (let a = 0; a < d * d; a++) ref[a] /= sw - sw2 / sw;
      assertScaled(
        covariance(scaled, n, d, { weights }),
        ref,
        `covariance (weights: ${!!weights})`,
      );
    }
  });
}

Deno.test(`linalg paths (${backend}): Gaussian KL and Fréchet as the per-column solves and sqrtm products they replaced`, () => {
  const r = new Rng("paths-closed");
  for (const [d, spread] of [[3, 0.3], [9, 0.5], [9, 4]]) {
    const a = {
      mean: Array.from({ length: d }, () => r.normal()),
      cov: randomCovariance(d, spread, r),
    };
    const b = {
      mean: Array.from({ length: d }, () => r.normal()),
      cov: randomCovariance(d, spread, r),
    };
    // KL: tr(Σ_b⁻¹Σ_a) column by column, the rest as before.
    const La = cholesky(a.cov, d), Lb = cholesky(b.cov, d);
    const cols = new Float64Array(d * d);
    for (let i = 0; i < d; i++) for (let j = 0; j < d; j++) cols[j * d + i] = La[i * d + j];
    const y = oldWhiten(cols, d, Lb);
    let trace = 0;
    for (const v of y) trace += v * v;
    const diff = Float64Array.from(b.mean, (v, i) => v - a.mean[i]);
    let maha = 0;
    for (const v of oldWhiten(diff, d, Lb)) maha += v * v;
    let logDets = 0;
    for (let i = 0; i < d; i++) logDets += 2 * Math.log(Lb[i * d + i] / La[i * d + i]);
    const kl = 0.5 * (trace + maha - d + logDets);
    assertClose(gaussianKl(a, b), kl, { rel: 1e-12 }, `KL d=${d}`);
    // Fréchet: sqrtm(Σ_a) Σ_b sqrtm(Σ_a), its square root, as nested loops.
    const ra = sqrtSymmetric(a.cov, d);
    const m = new Float64Array(d * d);
    for (let i = 0; i < d; i++) {
      for (let j = 0; j < d; j++) {
        for (let p = 0; p < d; p++) {
          for (let q = 0; q < d; q++) {
            m[i * d + j] += ra[i * d + p] * b.cov[p * d + q] * ra[q * d + j];
          }
        }
      }
    }
    const root = sqrtSymmetric(m, d);
    let f = 0;
    for (let i = 0; i < d; i++) {
      f += (a.mean[i] - b.mean[i]) ** 2 + a.cov[i * d + i] + b.cov[i * d + i] - 2 * root[i * d + i];
    }
    // At κ ~ 1e8 the two routes differ by ~1e-10: the problem's own conditioning. Measured
    // once against a 50-digit mpmath sqrtm computation (not run here): the new route is
    // 7.6e-10 from it, the old one 8.5e-10.
    assertClose(gaussianFrechet(a, b), f, { rel: spread > 1 ? 1e-8 : 1e-12 }, `Fréchet d=${d}`);
  }
});

Deno.test(`linalg paths (${backend}): EM fits on d = 16 give the same bits with and without a worker`, () => {
  // d = 16 sends the blocks to the native kernels (above the small-problem cut-off).
  const r = new Rng("paths-workers");
  const n = 3000, d = 16;
  const x = new Float64Array(n * d);
  for (let i = 0; i < n * d; i++) x[i] = r.normal() + (Math.floor(i / d) % 3) * 4;
  const s = fromBuffer(x, d);
  const one = fitGaussianMixture(s, { components: 3, seed: 4, maxIter: 15, workers: 0 });
  const two = fitGaussianMixture(s, { components: 3, seed: 4, maxIter: 15, workers: 1 });
  assert.equal(two.logLikelihood, one.logLikelihood);
  assert.deepEqual(two.weights, one.weights);
  assert.deepEqual(
    two.components.map((c) => Array.from(c.cov)),
    one.components.map((c) => Array.from(c.cov)),
  );
});
