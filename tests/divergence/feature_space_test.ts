import assert from "node:assert/strict";
import {
  energyDistance,
  FeatureAccumulator,
  featureStatistics,
  frechetDistance,
  frechetExtrapolated,
  knnEntropy,
  knnKlDivergence,
  mmd,
  readFeatureStatistics,
  slicedWasserstein,
  wasserstein1,
  wassersteinP,
} from "../../lib/divergence/mod.ts";
import type { SaddleError } from "../../lib/errors/mod.ts";
import { rng } from "../../lib/random/mod.ts";
import { fromBuffer, type Samples, writeNpy } from "../../lib/samples/mod.ts";
import { assertAllClose, assertClose, maxRelError } from "../_assert.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";

function normal(n: number, d: number, seed: number, shift = 0, scale = 1): Samples {
  const x = rng(seed).fillNormal(new Float64Array(n * d));
  for (let i = 0; i < x.length; i++) x[i] = shift * (i % d === 0 ? 1 : 0) + scale * x[i];
  return fromBuffer(x, d);
}

// Closed form: KL(N(0, I) ‖ N(e1, 2I)) in d = 2 is ½[tr(Σq⁻¹Σp) + μᵀΣq⁻¹μ − d + ln(|Σq|/|Σp|)]
// = ½[1 + 1/2 − 2 + 2 ln 2] (Kullback 1959, the Gaussian case). Wang, Kulkarni & Verdú 2009
// prove consistency: the error must shrink with n.
Deno.test("knnKlDivergence converges to the Gaussian closed form, error shrinking in n", () => {
  const truth = 0.5 * (1 + 0.5 - 2 + 2 * Math.log(2));
  const err = (n: number) => {
    let s = 0;
    for (const seed of [1, 2, 3]) {
      const kl = knnKlDivergence(normal(n, 2, seed), normal(n, 2, 50 + seed, 1, Math.SQRT2), {
        k: 5,
      });
      s += Math.abs(kl.value - truth) / 3;
    }
    return s;
  };
  const small = err(200), large = err(4000);
  assert.ok(large < small, `error ${large} at n = 4000 not below ${small} at n = 200`);
  assert.ok(large < 0.03, `error ${large} at n = 4000`);
});

// Closed form: the entropy of N(0, I_3) is (3/2) ln(2πe) (Cover & Thomas 2006, Thm. 8.4.1).
Deno.test("knnEntropy converges to the Gaussian entropy, error shrinking in n", () => {
  const truth = 1.5 * Math.log(2 * Math.PI * Math.E);
  const err = (n: number) => {
    let s = 0;
    for (const seed of [4, 5, 6]) {
      s += Math.abs(knnEntropy(normal(n, 3, seed), { k: 3 }).value - truth) / 3;
    }
    return s;
  };
  const small = err(200), large = err(5000);
  assert.ok(large < small && large < 0.03, `errors ${small} then ${large}`);
  const bits = knnEntropy(normal(500, 3, 7), { k: 3, base: 2 });
  assert.equal(bits.unit, "bits");
});

Deno.test("k-NN estimators: repeated rows throw and name the fix; dedupe and jitter work", () => {
  const x = fromBuffer(Float64Array.from({ length: 200 }, (_, i) => Math.round(i / 3)), 1);
  assert.throws(
    () => knnEntropy(x, { k: 1 }),
    (e: SaddleError) => /dedupe.*jitter/.test(e.message),
  );
  assert.ok(Number.isFinite(knnEntropy(x, { k: 1, dedupe: true }).value));
  assert.ok(Number.isFinite(knnEntropy(x, { k: 1, jitter: 1e-3, seed: 1 }).value));
  assert.throws(
    () => knnEntropy([[0], [1]], { k: 2 }),
    (e: SaddleError) => e.code === "too-few-samples",
  );
  assert.throws(
    () => knnKlDivergence([[0], [1]], [[0, 1]]),
    (e: SaddleError) => e.code === "dimension-mismatch",
  );
});

// Reference: Debian scipy.stats.wasserstein_distance and scipy.stats.energy_distance.
Deno.test({
  name: "wasserstein1 and energyDistance agree with scipy.stats",
  ignore: ignoreWithoutPython(["numpy", "scipy"]),
  fn: async () => {
    const a = normal(301, 1, 8), b = normal(157, 1, 9, 0.7, 1.5);
    const want = await runReference<{ w1: number; energy: number }>("feature_space.py", {
      task: "w1_energy",
      a: a.data,
      b: b.data,
    });
    assertClose(wasserstein1(a, b, { replicates: 20 }).value, want.w1, { rel: 1e-12 });
    assertClose(energyDistance(a, b).value, want.energy, { rel: 1e-10 });
  },
});

// Reference: W_p between equal-size samples is the sorted matching (Villani 2009, Rem. 2.19);
// energy distance in d > 1 by its definition, a direct double sum (Székely & Rizzo 2013).
Deno.test("wassersteinP, slicedWasserstein and multivariate energy distance by definition", () => {
  const a = [3, 1, 2, 7], b = [0, 5, 4, 4];
  const direct = ([0, 1, 2, 3].map((i) => Math.abs([1, 2, 3, 7][i] - [0, 4, 4, 5][i]) ** 3)
    .reduce((s, v) => s + v, 0) / 4) ** (1 / 3);
  assertClose(wassersteinP(a, b, { p: 3, replicates: 10 }).value, direct);
  const x = normal(60, 3, 10), y = normal(40, 3, 11, 1);
  let xy = 0, xx = 0, yy = 0;
  const dist = (p: Samples, i: number, q: Samples, j: number) =>
    Math.hypot(...[0, 1, 2].map((t) => p.data[i * 3 + t] - q.data[j * 3 + t]));
  for (let i = 0; i < 60; i++) for (let j = 0; j < 40; j++) xy += dist(x, i, y, j) / 2400;
  for (let i = 0; i < 60; i++) for (let j = 0; j < 60; j++) xx += dist(x, i, x, j) / 3600;
  for (let i = 0; i < 40; i++) for (let j = 0; j < 40; j++) yy += dist(y, i, y, j) / 1600;
  assertClose(energyDistance(x, y).value, Math.sqrt(2 * xy - xx - yy), { rel: 1e-12 });
  // A shift of 1 along e1 between equal Gaussians: SW2² = E(θ₁²) = 1/d (Bonneel et al. 2015).
  const sw = slicedWasserstein(normal(3000, 3, 12), normal(3000, 3, 13, 1), {
    projections: 200,
    seed: 1,
  });
  assert.ok(Math.abs(sw.value - Math.sqrt(1 / 3)) < 0.06, `SW ${sw.value}`);
});

// Reference: numpy double sums over all pairs (Gretton et al. 2012, Eq. 3 and Lemma 6).
Deno.test({
  name: "mmd (unbiased, biased, cubic) equals numpy double sums",
  ignore: ignoreWithoutPython(["numpy"]),
  fn: async () => {
    const a = normal(700, 5, 14), b = normal(550, 5, 15, 0.3);
    const want = await runReference<{ unbiased: number; biased: number; cubic: number }>(
      "feature_space.py",
      { task: "mmd", a: a.data, b: b.data, d: 5, sigma: 1.7 },
    );
    assertClose(mmd(a, b, { bandwidth: 1.7 }).value, want.unbiased, { rel: 1e-10 });
    assertClose(mmd(a, b, { bandwidth: 1.7, estimator: "biased" }).value, want.biased, {
      rel: 1e-10,
    });
    assertClose(mmd(a, b, { kernel: "cubic" }).value, want.cubic, { rel: 1e-10 });
    const sub = mmd(a, b, { kernel: "cubic", subsetSize: 300, subsets: 10, seed: 1 });
    assert.equal(sub.method, "subset-mean");
    assert.ok(Math.abs(sub.value - want.cubic) < 4 * sub.se! + 0.05 * Math.abs(want.cubic));
  },
});

// Reference: numpy cov + scipy.linalg.sqrtm, the usual Fréchet-distance computation.
Deno.test({
  name: "frechetDistance agrees with numpy cov + scipy sqrtm at d = 64 (<= 1e-8 relative)",
  ignore: ignoreWithoutPython(["numpy", "scipy"]),
  fn: async () => {
    const a = normal(400, 64, 16), b = normal(300, 64, 17, 0.5, 1.2);
    const want = await runReference<{ fd: number; mean_a: number[]; cov_a: number[] }>(
      "feature_space.py",
      { task: "frechet", a: a.data, b: b.data, d: 64 },
    );
    const got = frechetDistance(a, b);
    assert.ok(maxRelError([got.value], [want.fd]) <= 1e-8, `${got.value} vs ${want.fd}`);
    const s = featureStatistics(a, { rows: 37 });
    assertAllClose(s.mean, want.mean_a, { rel: 1e-12, abs: 1e-15 });
    assertAllClose(s.covariance, want.cov_a, { rel: 1e-12, abs: 1e-15 });
  },
});

Deno.test("featureStatistics: streamed from .npy, merged and one-shot agree to 1e-12", async () => {
  const x = normal(1000, 6, 18, 1e3);
  const f32 = fromBuffer(Float64Array.from(new Float32Array(x.data)), 6);
  const path = await Deno.makeTempFile({ suffix: ".npy" });
  try {
    await writeNpy(path, f32, { dtype: "<f4" });
    const oneShot = featureStatistics(f32, { rows: 1000 });
    const seen: number[] = [];
    const streamed = await readFeatureStatistics(path, {
      rows: 97,
      onProgress: (d) => seen.push(d),
    });
    assert.equal(seen.at(-1), 1000);
    const part = (from: number, to: number) =>
      new FeatureAccumulator(6).add(f32.data.slice(from * 6, to * 6));
    const acc = part(0, 333).merge(part(333, 334)).merge(part(334, 1000));
    const merged = featureStatistics([acc.statistics()]);
    for (const s of [streamed, merged]) {
      assert.equal(s.n, 1000);
      assertAllClose(s.mean, oneShot.mean, { rel: 1e-12 });
      assertAllClose(s.covariance, oneShot.covariance, { rel: 1e-12, abs: 1e-12 });
    }
    // The same statistics as precomputed input give the same distance.
    const pre = featureStatistics({ mean: oneShot.mean, covariance: oneShot.covariance, n: 1000 });
    assert.equal(frechetDistance(pre, f32).value, frechetDistance(f32, f32).value);
  } finally {
    await Deno.remove(path);
  }
});

Deno.test("bad input: block of the wrong width, NaN, mismatched d, too few rows", async () => {
  const acc = new FeatureAccumulator(3);
  assert.throws(
    () => acc.add(new Float64Array(4)),
    (e: SaddleError) => e.code === "dimension-mismatch",
  );
  assert.throws(
    () => acc.add(new Float64Array([0, NaN, 0])),
    (e: SaddleError) => e.code === "non-finite",
  );
  assert.throws(
    () => acc.merge(featureStatistics([[0, 1], [1, 0]])),
    (e: SaddleError) => e.code === "dimension-mismatch",
  );
  assert.throws(
    () => frechetDistance([[0, 1], [1, 2]], [[0], [1]]),
    (e: SaddleError) => e.code === "dimension-mismatch",
  );
  assert.throws(
    () => frechetDistance([[0, 1]], [[0, 1], [1, 1]]),
    (e: SaddleError) => e.code === "too-few-samples",
  );
  const path = await Deno.makeTempFile({ suffix: ".npy" });
  await writeNpy(path, fromBuffer(new Float64Array([0, 1, 2, 3, 4, 5]), 2));
  const bytes = await Deno.readFile(path);
  bytes.set(new Uint8Array(new Float64Array([NaN]).buffer), bytes.length - 8);
  await Deno.writeFile(path, bytes);
  await assert.rejects(
    () => readFeatureStatistics(path),
    (e: SaddleError) => e.code === "non-finite" && e.location.row === 2,
  );
  await Deno.remove(path);
});

// Closed form (Dowson & Landau 1982) with a constant feature: Σ_a singular. For
// Σ_a = diag(s², 0), Σ_b = diag(t², 0): FD = |Δμ|² + (s − t)².
Deno.test("frechetDistance handles a constant feature (singular covariance)", () => {
  const a = normal(500, 2, 19), b = normal(400, 2, 20, 2);
  for (let i = 0; i < a.n; i++) a.data[i * 2 + 1] = 5;
  for (let i = 0; i < b.n; i++) b.data[i * 2 + 1] = 5;
  const sa = featureStatistics(a), sb = featureStatistics(b);
  const want = (sa.mean[0] - sb.mean[0]) ** 2 +
    (Math.sqrt(sa.covariance[0]) - Math.sqrt(sb.covariance[0])) ** 2;
  assertClose(frechetDistance(a, b).value, want, { rel: 1e-10 });
});

// Chong & Forsyth 2020: FD is linear in 1/n; the intercept estimates the n = ∞ value, here
// the closed form |Δμ|² = 0.25 (equal covariances).
Deno.test("frechetExtrapolated brackets the infinite-n value", () => {
  const fit = frechetExtrapolated(normal(2000, 8, 21), normal(2000, 8, 22, 0.5), { seed: 3 });
  const { ci } = fit.infinite;
  assert.ok(fit.slope > 0);
  assert.ok(ci![0] < 0.25 + 0.05 && ci![1] > 0.25 - 0.05, `interval ${ci}`);
  assert.ok(Math.abs(fit.infinite.value - 0.25) < 0.08, `${fit.infinite.value}`);
});

// Reference: numpy cov + scipy.linalg.sqrtm at d = 2048 (n just above d keeps it quick), data
// passed as .npy files.
Deno.test({
  name: "frechetDistance agrees with numpy cov + scipy sqrtm at d = 2048 (<= 1e-6 relative)",
  ignore: ignoreWithoutPython(["numpy", "scipy"]),
  fn: async () => {
    const d = 2048, n = 2100;
    const a = normal(n, d, 23), b = normal(n, d, 24, 0.3, 1.1);
    const dir = await Deno.makeTempDir();
    try {
      await writeNpy(`${dir}/a.npy`, a);
      await writeNpy(`${dir}/b.npy`, b);
      const want = await runReference<{ fd: number }>("feature_space.py", {
        task: "frechet",
        a_path: `${dir}/a.npy`,
        b_path: `${dir}/b.npy`,
        d,
      });
      const got = frechetDistance(a, b).value;
      assert.ok(maxRelError([got], [want.fd]) <= 1e-6, `${got} vs ${want.fd}`);
    } finally {
      await Deno.remove(dir, { recursive: true });
    }
  },
});
